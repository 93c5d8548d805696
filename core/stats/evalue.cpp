#include "core/stats/evalue.h"

#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

double e_value(double rr) {
    if (!(rr > 0) || !std::isfinite(rr)) return std::numeric_limits<double>::quiet_NaN();
    if (rr < 1) rr = 1.0 / rr;
    return rr + std::sqrt(rr * (rr - 1.0));
}

EValue e_value(double rr, Interval ci) {
    EValue e{e_value(rr), std::numeric_limits<double>::quiet_NaN()};
    if (std::isnan(ci.lo) || std::isnan(ci.hi) || std::isnan(e.estimate)) return e;
    if (ci.lo <= 1.0 && ci.hi >= 1.0) e.ci_limit = 1.0;
    else e.ci_limit = e_value(rr >= 1 ? ci.lo : ci.hi);
    return e;
}

SmdEValue e_value_smd(double d, double se, double alpha) {
    constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
    SmdEValue r{kNaN, {kNaN, kNaN}, {kNaN, kNaN}};
    if (!std::isfinite(d)) return r;
    constexpr double kFactor = 0.91;  // VanderWeele & Ding 2017: ln RR ≈ 0.91 × d
    r.rr = std::exp(kFactor * d);
    const double z = z_for_alpha(alpha);
    if (std::isfinite(se) && se > 0 && std::isfinite(z))
        r.rr_ci = {std::exp(kFactor * (d - z * se)), std::exp(kFactor * (d + z * se))};
    r.e = e_value(r.rr, r.rr_ci);
    return r;
}

}  // namespace foldline::stats
