#include "core/stats/distributions.h"

#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <limits>

namespace foldline::stats {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

double chi_square_sf(double x, double df) {
    if (std::isnan(x) || !(df > 0)) return kNaN;
    if (x <= 0) return 1.0;
    if (std::isinf(x)) return 0.0;
    boost::math::chi_squared_distribution<double> d(df);
    return boost::math::cdf(boost::math::complement(d, x));
}

double normal_sf(double z) {
    if (std::isnan(z)) return kNaN;
    if (std::isinf(z)) return z > 0 ? 0.0 : 1.0;
    boost::math::normal_distribution<double> d;
    return boost::math::cdf(boost::math::complement(d, z));
}

double normal_two_sided_p(double z) {
    if (std::isnan(z)) return kNaN;
    return std::min(1.0, 2.0 * normal_sf(std::fabs(z)));
}

double normal_upper_quantile(double upper) {
    if (!(upper > 0 && upper < 1)) return kNaN;
    boost::math::normal_distribution<double> d;
    return boost::math::quantile(boost::math::complement(d, upper));
}

double z_for_alpha(double alpha) {
    if (!(alpha > 0 && alpha < 1)) return kNaN;
    // Every interval of a scan asks for the same alpha: remember the last one per thread.
    thread_local double last_alpha = 0.05, last_z = normal_upper_quantile(0.025);
    if (alpha != last_alpha) {
        last_alpha = alpha;
        last_z = normal_upper_quantile(alpha / 2.0);
    }
    return last_z;
}

}  // namespace foldline::stats
