#include "core/scan/mean_analysis.h"

#include <cmath>
#include <limits>

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string join_levels(const std::vector<std::string>& v) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? " | " : "") + v[i];
    return s;
}

double share(double part, double whole) { return whole > 0 ? part / whole : kNaN; }

}  // namespace

ClassInputs mean_class_inputs(const stats::CrudeMeans& crude, const stats::FixedEffectsGap& fixed_effects,
                              const stats::InteractionTest& interaction, bool strata_disagree) {
    ClassInputs in{};
    in.crude_effect = crude.difference.estimate;
    in.crude_z = stats::t_to_z(crude.difference.stat, crude.difference.df);
    in.adjusted_effect = fixed_effects.estimate;
    in.adjusted_z = stats::t_to_z(fixed_effects.robust.stat, fixed_effects.df);
    in.strata_disagree = strata_disagree;
    in.p_homogeneity = interaction.p;
    return in;
}

ClassInputs mean_class_inputs(const stats::MeanCells& cells, double alpha) {
    bool pos = false, neg = false;
    for (const auto& c : cells) {
        if (!c.informative()) continue;
        const double d = c.focal.mean() - c.reference.mean();
        pos |= d > 0;
        neg |= d < 0;
    }
    return mean_class_inputs(stats::crude_means(cells, alpha), stats::fixed_effects_difference(cells, alpha),
                             stats::interaction_f_test(cells), pos && neg);
}

MeanFinding analyse_mean_strata(const stats::MeanCells& cells, const std::vector<std::vector<std::string>>& labels,
                                const std::vector<std::string>& strata_names, const MeanNames& names,
                                double alpha) {
    MeanFinding f;
    f.strata = strata_names;
    f.outcome = names.outcome;
    f.focal = names.focal;
    f.reference = names.reference;

    f.crude = stats::crude_means(cells, alpha);
    f.fixed_effects = stats::fixed_effects_difference(cells, alpha);
    f.standardised = stats::standardised_difference(cells, alpha);
    f.interaction = stats::interaction_f_test(cells);
    f.cochran_q = stats::cochran_q(cells);
    f.decomposition = stats::decompose_crude_mean_gap(cells);

    const double n1 = f.crude.focal.n, n0 = f.crude.reference.n, n = n1 + n0;
    f.rows_used = n;
    bool pos = false, neg = false;
    for (std::size_t k = 0; k < cells.size(); ++k) {
        const auto& c = cells[k];
        if (c.focal.empty() && c.reference.empty()) continue;
        MeanStratumRow r;
        if (k < labels.size()) {
            r.levels = labels[k];
            r.level = join_levels(labels[k]);
        }
        r.focal = stats::group_mean(c.focal, alpha);
        r.reference = stats::group_mean(c.reference, alpha);
        r.focal.n = c.focal.empty() ? 0 : c.focal.w;
        r.reference.n = c.reference.empty() ? 0 : c.reference.w;
        r.difference = stats::welch_difference(c.focal, c.reference, alpha);
        r.share = share(r.focal.n + r.reference.n, n);
        r.share_focal = share(r.focal.n, n1);
        r.share_reference = share(r.reference.n, n0);
        r.informative = c.informative();
        if (!r.informative) {
            r.reason = c.focal.empty() ? "no focal rows" : "no reference rows";
            f.uninformative.push_back(r.level);
        } else {
            ++f.informative_strata;
            pos |= r.difference.estimate > 0;
            neg |= r.difference.estimate < 0;
        }
        f.strata_table.push_back(std::move(r));
    }
    f.strata_disagree = pos && neg;

    // t statistics enter the normal-scale classifier as the z with the same one-sided tail
    // (stats::t_to_z), so the reversal p and the two-sided p-values it forms are the t tests'.
    // The adjusted test uses the HC1 SE, as the crude one uses Welch's: neither assumes equal
    // variances across groups or strata.
    f.class_inputs = mean_class_inputs(f.crude, f.fixed_effects, f.interaction, f.strata_disagree);
    const auto& in = f.class_inputs;
    f.p_reversal = reversal_p(in);
    f.q_value = f.p_reversal;
    f.direction_flip = direction_flips(in);
    f.cls = classify(in, f.p_reversal, alpha);
    const double crude = f.crude.difference.estimate, adjusted = f.fixed_effects.estimate;
    f.change = std::isnan(crude) || std::isnan(adjusted) ? 0.0 : std::fabs(crude - adjusted);
    return f;
}

}  // namespace foldline
