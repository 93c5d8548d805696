#include "core/stats/conditional_independence.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

CiTest g_squared_test(const StratifiedCounts& c) {
    CiTest t;
    t.partial_r = kNaN;
    std::vector<double> row(c.rows), col(c.cols);
    for (std::size_t s = 0; s < c.strata; ++s) {
        std::fill(row.begin(), row.end(), 0.0);
        std::fill(col.begin(), col.end(), 0.0);
        double total = 0;
        for (std::size_t i = 0; i < c.rows; ++i)
            for (std::size_t j = 0; j < c.cols; ++j) {
                const double o = c.at(s, i, j);
                row[i] += o;
                col[j] += o;
                total += o;
            }
        t.n += total;
        std::size_t r_used = 0, c_used = 0;
        for (double v : row) r_used += v > 0;
        for (double v : col) c_used += v > 0;
        if (r_used < 2 || c_used < 2) continue;
        t.df += static_cast<double>((r_used - 1) * (c_used - 1));
        for (std::size_t i = 0; i < c.rows; ++i)
            for (std::size_t j = 0; j < c.cols; ++j) {
                const double o = c.at(s, i, j);
                if (o > 0) t.statistic += 2.0 * o * std::log(o * total / (row[i] * col[j]));
            }
    }
    if (t.statistic < 0) t.statistic = 0;  // rounding in a perfectly independent table
    t.p = t.df > 0 ? chi_square_sf(t.statistic, t.df) : kNaN;
    return t;
}

CiTest partial_correlation_test(const WithinMoments& m) {
    CiTest t;
    t.df = kNaN;
    t.n = m.n;
    const auto p = m.sscp.rows();
    const auto k = p - 2;
    Eigen::Matrix2d r = m.sscp.bottomRightCorner(2, 2);
    Eigen::Index rank = 0;
    if (k > 0) {
        const Eigen::MatrixXd zz = m.sscp.topLeftCorner(k, k);
        const Eigen::MatrixXd zxy = m.sscp.topRightCorner(k, 2);
        Eigen::CompleteOrthogonalDecomposition<Eigen::MatrixXd> cod(zz);
        cod.setThreshold(1e-10);
        rank = cod.rank();
        r -= zxy.transpose() * cod.solve(zxy);
    }
    const double regressors = static_cast<double>(rank) + static_cast<double>(m.strata > 0 ? m.strata - 1 : 0);
    const double dof = m.n - regressors - 3.0;
    const double scale = std::max(m.sscp(p - 2, p - 2), m.sscp(p - 1, p - 1));
    if (!(r(0, 0) > 1e-12 * scale) || !(r(1, 1) > 1e-12 * scale) || !(dof > 0)) {
        t.statistic = t.p = t.partial_r = kNaN;
        return t;
    }
    t.partial_r = std::clamp(r(0, 1) / std::sqrt(r(0, 0) * r(1, 1)), -1.0, 1.0);
    t.statistic = std::atanh(std::clamp(t.partial_r, -1.0 + 1e-16, 1.0 - 1e-16)) * std::sqrt(dof);
    t.p = normal_two_sided_p(t.statistic);
    return t;
}

}  // namespace foldline::stats
