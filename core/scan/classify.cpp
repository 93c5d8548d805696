#include "core/scan/classify.h"

#include <algorithm>
#include <cmath>

#include "core/stats/distributions.h"

namespace foldline {

double reversal_p(const ClassInputs& in) {
    if (std::isnan(in.crude_z) || std::isnan(in.adjusted_z) || std::isnan(in.crude_effect) ||
        in.crude_effect == 0)
        return 1.0;
    const double dir = in.crude_effect > 0 ? 1.0 : -1.0;
    const double p_crude = stats::normal_sf(dir * in.crude_z);        // crude in its own direction
    const bool exact = !std::isnan(in.adjusted_p_exact);
    const double p_adjusted = exact ? (dir > 0 ? in.adjusted_p_exact_less : in.adjusted_p_exact_greater)
                                     : stats::normal_sf(-dir * in.adjusted_z);  // adjusted the other way
    return std::max(p_crude, p_adjusted);
}

bool direction_flips(const ClassInputs& in) {
    return std::isfinite(in.crude_effect) && !std::isnan(in.adjusted_effect) &&
           in.crude_effect * in.adjusted_effect < 0;
}

FindingClass classify(const ClassInputs& in, double evidence, double alpha) {
    if (direction_flips(in) && evidence <= alpha) return FindingClass::Reversal;
    if (in.strata_disagree && in.p_homogeneity <= alpha) return FindingClass::Heterogeneous;
    const double p_crude = stats::normal_two_sided_p(in.crude_z);
    const double p_adj = std::isnan(in.adjusted_p_exact) ? stats::normal_two_sided_p(in.adjusted_z) : in.adjusted_p_exact;
    if (std::isnan(p_crude) || std::isnan(p_adj)) return FindingClass::Stable;
    if (p_crude <= alpha && p_adj > alpha) return FindingClass::Explained;
    if (p_crude > alpha && p_adj <= alpha) return FindingClass::Masked;
    return FindingClass::Stable;
}

}  // namespace foldline
