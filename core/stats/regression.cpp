#include "core/stats/regression.h"

#include <Eigen/Cholesky>
#include <boost/math/distributions/fisher_f.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/students_t.hpp>

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Boost reports a result beyond the range of a double (a vanishingly small df, or weights that
// make one) by throwing; such a figure is undefined here, never an abort.
template <typename F>
double or_undefined(F&& f) {
    try {
        const double v = f();
        return std::isfinite(v) ? v : kNaN;
    } catch (const std::exception&) {
        return kNaN;
    }
}

double t_quantile(double df, double alpha) {
    return or_undefined([&] {
        return boost::math::quantile(boost::math::complement(boost::math::students_t(df), alpha / 2));
    });
}

double z_quantile(double alpha) {
    return boost::math::quantile(boost::math::complement(boost::math::normal(), alpha / 2));
}

bool valid_alpha(double alpha) { return alpha > 0 && alpha < 1; }

// Adjusted slope of the first column from a centred cross-product matrix with y last.
SlopeEstimate solve_adjusted(const Eigen::MatrixXd& cross, double df, double alpha) {
    const Eigen::Index d = cross.rows();
    SlopeEstimate out{kNaN, kNaN, kNaN, kNaN, df, kNaN};
    if (d < 2) return out;
    const Eigen::Index q = d - 1;  // regressors: x and the covariates
    const Eigen::MatrixXd a = cross.topLeftCorner(q, q);
    const Eigen::VectorXd b = cross.topRightCorner(q, 1);
    const Eigen::VectorXd scale = a.diagonal().cwiseMax(0.0).cwiseSqrt();
    if ((scale.array() <= 0).any() || !scale.allFinite()) return out;
    // Correlation scaling keeps the factorisation's pivots comparable whatever the units.
    const Eigen::VectorXd inv = scale.cwiseInverse();
    const Eigen::MatrixXd as = inv.asDiagonal() * a * inv.asDiagonal();
    const Eigen::VectorXd bs = inv.asDiagonal() * b;
    Eigen::LDLT<Eigen::MatrixXd> ldlt(as);
    // On the correlation scale each pivot is 1 − R² of a regressor on those pivoted before it,
    // so a tiny pivot means (near-)perfect collinearity. Eigen's rcond() does not see an
    // exactly zero pivot, hence the explicit check.
    if (ldlt.info() != Eigen::Success) return out;
    const Eigen::VectorXd piv = ldlt.vectorD();
    if (!piv.allFinite() || !(piv.minCoeff() > 1e-10 * piv.maxCoeff())) return out;
    const Eigen::VectorXd beta_s = ldlt.solve(bs);
    const double slope = beta_s(0) / scale(0);
    const double rss = std::max(0.0, cross(q, q) - beta_s.dot(bs));
    double se = kNaN;
    if (df > 0) {
        const Eigen::VectorXd e0 = Eigen::VectorXd::Unit(q, 0);
        const double c00 = ldlt.solve(e0)(0);
        se = std::sqrt(rss / df * c00) / scale(0);
    }
    return make_estimate(slope, se, df, alpha);
}

}  // namespace

SlopeEstimate make_estimate(double slope, double se, double df, double alpha) {
    SlopeEstimate e{slope, se, kNaN, kNaN, df, kNaN};
    if (std::isnan(slope) || !(se >= 0) || !std::isfinite(se) || !(df > 0) || !valid_alpha(alpha))
        return e;
    const double q = t_quantile(df, alpha);
    e.ci_low = slope - q * se;
    e.ci_high = slope + q * se;
    if (se == 0) {
        e.p = slope != 0 ? 0.0 : kNaN;
    } else {
        e.p = or_undefined([&] {
            return 2 * boost::math::cdf(boost::math::complement(boost::math::students_t(df), std::abs(slope / se)));
        });
    }
    return e;
}

double one_sided_p(double slope, double se, double df, int sign) {
    if (std::isnan(slope) || !(se >= 0) || !std::isfinite(se) || !(df > 0) || sign == 0)
        return kNaN;
    if (se == 0) return (sign > 0 ? slope > 0 : slope < 0) ? 0.0 : 1.0;
    const double t = slope / se;
    return or_undefined([&] {
        const boost::math::students_t dist(df);
        return sign > 0 ? boost::math::cdf(boost::math::complement(dist, t)) : boost::math::cdf(dist, t);
    });
}

bool no_spread_in_x(const BivariateMoments& m) {
    if (!(m.w > 0) || !(m.cxx > 0)) return true;
    // A spread below the rounding of the mean is rounding noise, not data.
    const double sd = std::sqrt(m.cxx / m.w);
    return sd <= 64 * std::numeric_limits<double>::epsilon() * std::abs(m.mean_x());
}

LineFit fit_line(const BivariateMoments& m, double alpha) {
    LineFit f;
    f.n = m.w;
    f.rows = m.rows;
    f.intercept = kNaN;
    f.slope = SlopeEstimate{kNaN, kNaN, kNaN, kNaN, m.w - 2, kNaN};
    f.r = f.r_ci_low = f.r_ci_high = kNaN;
    if (!(m.w > 0)) {
        f.reason = "no rows";
        return f;
    }
    const bool flat = no_spread_in_x(m);
    if (flat) f.reason = "no spread in x";
    else if (m.w < 3) f.reason = "fewer than 3 rows";
    f.informative = f.reason.empty();
    if (flat) return f;

    const double slope = m.cxy / m.cxx;
    f.intercept = m.mean_y() - slope * m.mean_x();
    const double df = m.w - 2;
    double se = kNaN;
    if (df > 0) {
        const double rss = std::max(0.0, m.cyy - slope * m.cxy);
        se = std::sqrt(rss / df / m.cxx);
    }
    f.slope = make_estimate(slope, se, df, alpha);
    if (m.cyy > 0) {
        f.r = std::clamp(m.cxy / std::sqrt(m.cxx * m.cyy), -1.0, 1.0);
        if (m.w > 3 && std::abs(f.r) < 1 && valid_alpha(alpha)) {
            const double z = std::atanh(f.r), h = z_quantile(alpha) / std::sqrt(m.w - 3);
            f.r_ci_low = std::tanh(z - h);
            f.r_ci_high = std::tanh(z + h);
        }
    }
    return f;
}

double hc3_slope_se(const double* x, const double* y, const double* weights,
                    const unsigned char* keep, std::size_t n, const BivariateMoments& pooled) {
    if (no_spread_in_x(pooled) || pooled.w < 3) return kNaN;
    const double b = pooled.cxy / pooled.cxx;
    const double inv_w = 1.0 / pooled.w, inv_sxx = 1.0 / pooled.cxx;
    double acc = 0;
    for (std::size_t i = 0; i < n; ++i) {
        if (keep && !keep[i]) continue;
        const double xi = x[i], yi = y[i];
        if (std::isnan(xi) || std::isnan(yi)) continue;
        const double wi = weights ? weights[i] : 1.0;
        if (!(wi > 0)) continue;
        const double xt = (xi - pooled.x0) - pooled.dx;
        const double e = ((yi - pooled.y0) - pooled.dy) - b * xt;
        const double h = inv_w + xt * xt * inv_sxx;
        const double one_minus_h = 1.0 - h;
        if (!(one_minus_h > 0)) return kNaN;
        const double u = xt * e / one_minus_h;
        acc += wi * u * u;
    }
    return std::sqrt(acc) * inv_sxx;
}

WithinFit fit_within(const std::vector<BivariateMoments>& strata, double alpha) {
    WithinFit out;
    double sxx = 0, sxy = 0, syy = 0;
    for (const auto& m : strata) {
        if (!(m.w > 0)) continue;
        ++out.strata;
        out.n += m.w;
        sxx += m.cxx;
        sxy += m.cxy;
        syy += m.cyy;
    }
    const double df = out.n - static_cast<double>(out.strata) - 1;
    if (!(sxx > 0)) {
        out.slope = SlopeEstimate{kNaN, kNaN, kNaN, kNaN, df, kNaN};
        return out;
    }
    const double slope = sxy / sxx;
    double se = kNaN;
    if (df > 0) se = std::sqrt(std::max(0.0, syy - slope * sxy) / df / sxx);
    out.slope = make_estimate(slope, se, df, alpha);
    return out;
}

PrecisionWeightedSlope precision_weighted_slope(const std::vector<LineFit>& fits, double alpha) {
    PrecisionWeightedSlope out{kNaN, kNaN, kNaN, kNaN, 0};
    double sw = 0, swb = 0;
    for (const auto& f : fits) {
        const double se = f.slope.se;
        if (!f.informative || !(se > 0) || !std::isfinite(se) || std::isnan(f.slope.slope)) continue;
        const double w = 1.0 / (se * se);
        sw += w;
        swb += w * f.slope.slope;
        ++out.strata;
    }
    if (out.strata == 0) return out;
    out.slope = swb / sw;
    out.se = 1.0 / std::sqrt(sw);
    if (valid_alpha(alpha)) {
        const double q = z_quantile(alpha);
        out.ci_low = out.slope - q * out.se;
        out.ci_high = out.slope + q * out.se;
    }
    return out;
}

EqualSlopesTest equal_slopes_test(const std::vector<BivariateMoments>& strata) {
    EqualSlopesTest t{kNaN, kNaN, kNaN, kNaN};
    double w = 0, sxx = 0, sxy = 0, syy = 0, rss_sep = 0;
    double k = 0, j = 0;
    for (const auto& m : strata) {
        if (!(m.w > 0)) continue;
        k += 1;
        w += m.w;
        syy += m.cyy;
        if (no_spread_in_x(m)) {
            rss_sep += m.cyy;
            continue;
        }
        j += 1;
        sxx += m.cxx;
        sxy += m.cxy;
        rss_sep += std::max(0.0, m.cyy - m.cxy * m.cxy / m.cxx);
    }
    t.df1 = j - 1;
    t.df2 = w - k - j;
    if (j < 2 || !(t.df2 > 0) || !(rss_sep > 0) || !(sxx > 0)) return t;
    const double rss_common = std::max(rss_sep, syy - sxy * sxy / sxx);
    t.f = ((rss_common - rss_sep) / t.df1) / (rss_sep / t.df2);
    t.p = or_undefined([&] { return boost::math::cdf(boost::math::complement(boost::math::fisher_f(t.df1, t.df2), t.f)); });
    return t;
}

SlopeEstimate fit_adjusted(const MomentMatrix& m, double alpha) {
    if (!(m.w > 0)) return SlopeEstimate{kNaN, kNaN, kNaN, kNaN, 0, kNaN};
    return solve_adjusted(m.cross, m.w - static_cast<double>(m.dim()), alpha);
}

SlopeEstimate fit_adjusted_within(const std::vector<MomentMatrix>& strata, double alpha) {
    Eigen::MatrixXd cross;
    double w = 0, k = 0;
    for (const auto& m : strata) {
        if (!(m.w > 0)) continue;
        if (cross.size() == 0) cross = Eigen::MatrixXd::Zero(m.dim(), m.dim());
        cross += m.cross;
        w += m.w;
        k += 1;
    }
    if (k == 0) return SlopeEstimate{kNaN, kNaN, kNaN, kNaN, 0, kNaN};
    // Regressors: x and p covariates (d − 2 of them) plus one intercept per stratum.
    const double df = w - k - static_cast<double>(cross.rows() - 1);
    return solve_adjusted(cross, df, alpha);
}

}  // namespace foldline
