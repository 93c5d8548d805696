#include "core/stats/proportions.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

double proportion(double x, double n) { return n > 0 ? x / n : kNaN; }

Interval wilson(double x, double n, double alpha) {
    if (!(n > 0) || x < 0 || x > n) return {kNaN, kNaN};
    const double z = z_for_alpha(alpha);
    const double p = x / n, z2 = z * z;
    const double centre = (x + z2 / 2.0) / (n + z2);
    const double half = z * std::sqrt(n * p * (1.0 - p) + z2 / 4.0) / (n + z2);
    Interval r{std::max(0.0, centre - half), std::min(1.0, centre + half)};
    if (x == 0) r.lo = 0.0;
    if (x == n) r.hi = 1.0;
    return r;
}

Interval newcombe_difference(double x1, double n1, double x2, double n2, double alpha) {
    if (!(n1 > 0) || !(n2 > 0)) return {kNaN, kNaN};
    const double p1 = x1 / n1, p2 = x2 / n2, d = p1 - p2;
    const Interval w1 = wilson(x1, n1, alpha), w2 = wilson(x2, n2, alpha);
    const double lo = d - std::sqrt((p1 - w1.lo) * (p1 - w1.lo) + (w2.hi - p2) * (w2.hi - p2));
    const double hi = d + std::sqrt((w1.hi - p1) * (w1.hi - p1) + (p2 - w2.lo) * (p2 - w2.lo));
    return {std::max(-1.0, lo), std::min(1.0, hi)};
}

}  // namespace foldline::stats
