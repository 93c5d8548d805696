#include "core/stats/evalue.h"

#include <cmath>
#include <limits>

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

}  // namespace foldline::stats
