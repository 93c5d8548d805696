#include "core/stats/standardize.h"

#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

Standardized standardized_rd(const Strata& strata, double alpha) {
    constexpr double nan = std::numeric_limits<double>::quiet_NaN();
    Standardized r{nan, nan, nan, nan, {nan, nan}};
    double total = 0;
    for (const auto& s : strata)
        if (s.informative()) total += s.total();
    if (!(total > 0)) return r;
    double r1 = 0, r0 = 0, var = 0;
    for (const auto& s : strata) {
        if (!s.informative()) continue;
        const double w = s.total() / total, n1 = s.n_focal(), n0 = s.n_reference();
        const double p1 = s.a / n1, p0 = s.c / n0;
        r1 += w * p1;
        r0 += w * p0;
        var += w * w * (p1 * (1 - p1) / n1 + p0 * (1 - p0) / n0);
    }
    const double z = z_for_alpha(alpha);
    r.rate_focal = r1;
    r.rate_reference = r0;
    r.rd = r1 - r0;
    r.se = std::sqrt(var);
    r.rd_ci = {r.rd - z * r.se, r.rd + z * r.se};
    return r;
}

}  // namespace foldline::stats
