#include "core/stats/power.h"

#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

double rows_per_group_for_power(double p1, double p2, double alpha, double power) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    if (!(p1 >= 0 && p1 <= 1 && p2 >= 0 && p2 <= 1) || p1 == p2) return nan;
    if (!(alpha > 0 && alpha < 1 && power > 0 && power < 1)) return nan;
    const double h = 2 * std::asin(std::sqrt(p1)) - 2 * std::asin(std::sqrt(p2));
    const double z = normal_upper_quantile(alpha / 2) + normal_upper_quantile(1 - power);
    return 2 * (z / h) * (z / h);
}

}  // namespace foldline::stats
