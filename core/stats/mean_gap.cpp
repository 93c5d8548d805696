#include "core/stats/mean_gap.h"

#include <boost/math/distributions/fisher_f.hpp>
#include <boost/math/distributions/students_t.hpp>

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

// Boost reports a figure beyond the range of a double (a vanishing df) by throwing; such a
// figure is undefined here, never an abort (as in core/stats/regression.cpp).
template <typename F>
double or_undefined(F&& f) {
    try {
        const double v = f();
        return std::isnan(v) ? kNaN : v;
    } catch (const std::exception&) {
        return kNaN;
    }
}

bool valid_alpha(double alpha) { return alpha > 0 && alpha < 1; }

// Student's t in double precision throughout: Boost's default promotes a double argument to long
// double, which is about ten times slower (x87) and changes the quantile and the tail by a few
// units in the last place (below 1e-14 relative over df 5 to 1,500). A scan evaluates one
// quantile per group and stratum, so this is where its analysis time goes.
using TPolicy = boost::math::policies::policy<boost::math::policies::promote_double<false>>;
using StudentT = boost::math::students_t_distribution<double, TPolicy>;

// Upper quantile t(1 − alpha/2, df); the normal one for infinite df.
double t_critical(double df, double alpha) {
    if (!(df > 0) || !valid_alpha(alpha)) return kNaN;
    if (std::isinf(df)) return z_for_alpha(alpha);
    return or_undefined([&] {
        return boost::math::quantile(boost::math::complement(StudentT(df), alpha / 2));
    });
}

// P(T_df > t); the normal tail for infinite df.
double t_sf(double t, double df) {
    if (std::isnan(t) || !(df > 0)) return kNaN;
    if (std::isinf(df)) return normal_sf(t);
    if (std::isinf(t)) return t > 0 ? 0.0 : 1.0;
    return or_undefined([&] { return boost::math::cdf(boost::math::complement(StudentT(df), t)); });
}

double f_sf(double f, double df1, double df2) {
    if (std::isnan(f) || !(df1 > 0) || !(df2 > 0)) return kNaN;
    if (f <= 0) return 1.0;
    return or_undefined(
        [&] { return boost::math::cdf(boost::math::complement(boost::math::fisher_f(df1, df2), f)); });
}

// Difference of two means with the origins apart, so large values keep the digits of the gap.
double mean_difference(const MeanMoments& a, const MeanMoments& b) {
    if (a.empty() || b.empty()) return kNaN;
    return (a.y0 - b.y0) + (a.dy - b.dy);
}

// An estimate with a t (df finite) or normal (df infinite) interval and two-sided test.
GapEstimate with_test(double estimate, double se, double df, double alpha) {
    GapEstimate e{estimate, se, kNaN, kNaN, df, kNaN, kNaN};
    if (std::isnan(estimate) || !std::isfinite(se) || !(se > 0) || !(df > 0)) return e;
    const double crit = t_critical(df, alpha);
    if (std::isfinite(crit)) {
        e.ci_low = estimate - crit * se;
        e.ci_high = estimate + crit * se;
    }
    e.stat = estimate / se;
    const double tail = t_sf(std::fabs(e.stat), df);
    e.p = std::isnan(tail) ? kNaN : std::min(1.0, 2 * tail);
    return e;
}

// Both groups pooled over the strata.
struct Pooled {
    MeanMoments focal, reference;
};

Pooled pool(const MeanCells& cells) {
    Pooled p;
    for (const auto& c : cells) {
        p.focal.merge(c.focal);
        p.reference.merge(c.reference);
    }
    return p;
}

// The additive (group + strata) OLS fit over the informative strata, from the cells alone.
struct AdditiveFit {
    double n = 0;        // N: observations
    double strata = 0;   // K
    double h = 0;        // Σ h_k, h_k = n1k n0k / nk = Σ (g − ḡ_k)² within stratum k
    double beta = kNaN;  // the group coefficient
    double css = 0;      // Σ css over the informative cells: RSS of the full cell-means model
    double lack = 0;     // Σ h_k (d_k − β)²: what the additive model adds to it
    double meat = 0;     // Σ x̃² e² for the HC sandwich
};

AdditiveFit additive_fit(const MeanCells& cells) {
    AdditiveFit a;
    double hd = 0;
    for (const auto& c : cells) {
        if (!c.informative()) continue;
        const double n1 = c.focal.w, n0 = c.reference.w, n = n1 + n0, h = n1 * n0 / n;
        a.n += n;
        a.strata += 1;
        a.h += h;
        hd += h * mean_difference(c.focal, c.reference);
        a.css += c.focal.css + c.reference.css;
    }
    if (!(a.h > 0)) return a;
    a.beta = hd / a.h;
    // Derivation of the residual sums (frequency weights, stratum k with n1, n0, n = n1 + n0,
    // cell means m1, m0, d = m1 − m0, pooled mean ȳ_k and ḡ_k = n1 / n):
    //   The fitted values of y = α_k + β g are α_k + β g with α_k = ȳ_k − β ḡ_k, so
    //     fitted focal     = ȳ_k + β n0/n,   m1 − fitted focal     =  (d − β) n0/n,
    //     fitted reference = ȳ_k − β n1/n,   m0 − fitted reference = −(d − β) n1/n.
    //   A residual is e = (y − m_cell) + (m_cell − fitted_cell); the cross term sums to zero
    //   within a cell (Σ w (y − m_cell) = 0), hence per cell
    //     Σ w e² = css_cell + n_cell (m_cell − fitted_cell)².
    //   Summed over the stratum the second parts give n1 (d−β)² n0²/n² + n0 (d−β)² n1²/n² =
    //   h_k (d − β)², the lack of fit of the additive model against the cell-means model.
    //   HC sandwich: by Frisch–Waugh–Lovell β's row of (X'X)⁻¹X' is x̃' / Σx̃², x̃ = g − ḡ_k the
    //   group indicator centred within its stratum: x̃ = n0/n for a focal row, −n1/n for a
    //   reference row, constant within a cell. So Var_HC0(β) = Σ x̃² e² / (Σ x̃²)² with
    //     Σ x̃² e² = Σ_k (n0/n)² [css1 + n1 ((d−β) n0/n)²] + (n1/n)² [css0 + n0 ((d−β) n1/n)²]
    //   and Σ x̃² = Σ h_k; HC1 multiplies HC0 by N / (N − K − 1).
    for (const auto& c : cells) {
        if (!c.informative()) continue;
        const double n1 = c.focal.w, n0 = c.reference.w, n = n1 + n0, h = n1 * n0 / n;
        const double r = mean_difference(c.focal, c.reference) - a.beta;
        a.lack += h * r * r;
        const double x1 = n0 / n, x0 = n1 / n;  // |x̃| of a focal and of a reference row
        const double e1 = r * x1, e0 = r * x0;  // |cell mean − fitted| of each cell
        a.meat += x1 * x1 * (c.focal.css + n1 * e1 * e1) + x0 * x0 * (c.reference.css + n0 * e0 * e0);
    }
    return a;
}

}  // namespace

double MeanMoments::mean() const { return w > 0 ? y0 + dy : kNaN; }

double MeanMoments::variance() const { return w > 1 ? css / (w - 1) : kNaN; }

void MeanMoments::add(double y, double weight) {
    if (!(weight > 0) || !std::isfinite(y) || !std::isfinite(weight)) return;
    if (!(w > 0)) {
        y0 = y;
        dy = 0;
    }
    rows += 1;
    const double total = w + weight;
    const double u = y - y0;
    const double du = u - dy;
    dy += du * (weight / total);
    css += weight * du * (u - dy);
    w = total;
}

void MeanMoments::merge(const MeanMoments& o) {
    if (!(o.w > 0)) {
        rows += o.rows;
        return;
    }
    if (!(w > 0)) {
        const double r = rows;
        *this = o;
        rows += r;
        return;
    }
    const double total = w + o.w;
    const double delta = (o.y0 - y0) + (o.dy - dy);
    dy += delta * (o.w / total);
    css += o.css + delta * delta * (w * o.w / total);
    w = total;
    rows += o.rows;
}

MeanMoments MeanMoments::from_mean(double rows, double w, double mean, double css) {
    MeanMoments m;
    m.rows = rows;
    if (!(w > 0) || !std::isfinite(mean)) return m;
    m.w = w;
    m.y0 = mean;
    m.css = std::max(0.0, css);
    return m;
}

void MeanCellBuilder::add(std::size_t k, bool focal, double y, double weight) {
    if (k >= cells_.size()) return;
    (focal ? cells_[k].focal : cells_[k].reference).add(y, weight);
}

GroupMean group_mean(const MeanMoments& m, double alpha) {
    GroupMean g{m.w, m.mean(), kNaN, kNaN, kNaN};
    if (!(m.w > 1)) return g;
    g.sd = std::sqrt(m.variance());
    const double crit = t_critical(m.w - 1, alpha);
    if (std::isfinite(crit)) {
        const double half = crit * g.sd / std::sqrt(m.w);
        g.ci_low = g.mean - half;
        g.ci_high = g.mean + half;
    }
    return g;
}

GapEstimate welch_difference(const MeanMoments& focal, const MeanMoments& reference, double alpha) {
    const double d = mean_difference(focal, reference);
    if (!(focal.w > 1) || !(reference.w > 1)) return {d, kNaN, kNaN, kNaN, kNaN, kNaN, kNaN};
    const double v1 = focal.variance() / focal.w, v0 = reference.variance() / reference.w;
    const double v = v1 + v0;
    if (!(v > 0)) return {d, std::sqrt(std::max(0.0, v)), kNaN, kNaN, kNaN, kNaN, kNaN};
    const double df = v * v / (v1 * v1 / (focal.w - 1) + v0 * v0 / (reference.w - 1));
    return with_test(d, std::sqrt(v), df, alpha);
}

double t_to_z(double t, double df) {
    if (std::isnan(t) || !(df > 0)) return kNaN;
    if (std::isinf(df)) return t;
    const double tail = t_sf(std::fabs(t), df);
    if (std::isnan(tail)) return kNaN;
    const double sign = t < 0 ? -1.0 : 1.0;
    if (!(tail > 0)) return sign * kInf;
    return sign * normal_upper_quantile(tail);  // tail <= 0.5, so the quantile is >= 0
}

CrudeMeans crude_means(const MeanCells& cells, double alpha) {
    const Pooled p = pool(cells);
    CrudeMeans c;
    c.focal = group_mean(p.focal, alpha);
    c.reference = group_mean(p.reference, alpha);
    c.difference = welch_difference(p.focal, p.reference, alpha);
    c.ratio = c.reference.mean != 0 && !std::isnan(c.reference.mean) ? c.focal.mean / c.reference.mean : kNaN;
    return c;
}

FixedEffectsGap fixed_effects_difference(const MeanCells& cells, double alpha) {
    const AdditiveFit a = additive_fit(cells);
    FixedEffectsGap f{};
    f.estimate = a.beta;
    f.df = a.n - a.strata - 1;
    f.rss = std::isnan(a.beta) ? kNaN : a.css + a.lack;
    f.strata = static_cast<std::size_t>(a.strata);
    f.se = f.se_hc1 = kNaN;
    if (!std::isnan(a.beta) && f.df > 0) {
        f.se = std::sqrt(f.rss / f.df / a.h);
        if (a.meat > 0) f.se_hc1 = std::sqrt(a.meat / (a.h * a.h) * (a.n / f.df));
    }
    if (!(f.df > 0)) f.df = kNaN;
    f.classical = with_test(f.estimate, f.se, f.df, alpha);
    f.robust = with_test(f.estimate, f.se_hc1, f.df, alpha);
    return f;
}

GapEstimate standardised_difference(const MeanCells& cells, double alpha) {
    double total = 0;
    for (const auto& c : cells)
        if (c.informative()) total += c.focal.w + c.reference.w;
    if (!(total > 0)) return {kNaN, kNaN, kNaN, kNaN, kInf, kNaN, kNaN};
    double est = 0, var = 0;
    for (const auto& c : cells) {
        if (!c.informative()) continue;
        const double s = (c.focal.w + c.reference.w) / total;
        est += s * mean_difference(c.focal, c.reference);
        var += s * s * (c.focal.variance() / c.focal.w + c.reference.variance() / c.reference.w);
    }
    return with_test(est, std::sqrt(var), kInf, alpha);
}

InteractionTest interaction_f_test(const MeanCells& cells) {
    const AdditiveFit a = additive_fit(cells);
    InteractionTest t{kNaN, a.strata - 1, a.n - 2 * a.strata, kNaN};
    if (!(t.df1 > 0)) t.df1 = kNaN;
    if (!(t.df2 > 0)) t.df2 = kNaN;
    if (std::isnan(a.beta) || std::isnan(t.df1) || std::isnan(t.df2) || !(a.css > 0)) return t;
    t.f = (a.lack / t.df1) / (a.css / t.df2);
    t.p = f_sf(t.f, t.df1, t.df2);
    return t;
}

CochranQ cochran_q(const MeanCells& cells) {
    CochranQ r{kNaN, kNaN, kNaN, kNaN, kNaN, 0};
    double sw = 0, swd = 0;
    struct Entry {
        double w, d;
    };
    std::vector<Entry> entries;
    for (const auto& c : cells) {
        if (!c.informative() || !(c.focal.w > 1) || !(c.reference.w > 1)) continue;
        const double v = c.focal.variance() / c.focal.w + c.reference.variance() / c.reference.w;
        if (!(v > 0) || !std::isfinite(v)) continue;
        const Entry e{1 / v, mean_difference(c.focal, c.reference)};
        entries.push_back(e);
        sw += e.w;
        swd += e.w * e.d;
    }
    r.strata = entries.size();
    if (entries.empty()) return r;
    r.pooled = swd / sw;
    if (entries.size() < 2) return r;
    double q = 0;
    for (const auto& e : entries) q += e.w * (e.d - r.pooled) * (e.d - r.pooled);
    r.q = q;
    r.df = static_cast<double>(entries.size() - 1);
    r.p = chi_square_sf(q, r.df);
    r.i_squared = q > 0 ? std::max(0.0, (q - r.df) / q) : kNaN;
    return r;
}

Decomposition decompose_crude_mean_gap(const MeanCells& cells) {
    double n1 = 0, n0 = 0;
    const MeanMoments* first = nullptr;
    for (const auto& c : cells) {
        n1 += c.focal.w > 0 ? c.focal.w : 0;
        n0 += c.reference.w > 0 ? c.reference.w : 0;
        if (!first) first = !c.focal.empty() ? &c.focal : !c.reference.empty() ? &c.reference : nullptr;
    }
    if (!(n1 > 0) || !(n0 > 0)) return {kNaN, kNaN, kNaN};
    // Means are taken relative to one shift (both parts are unchanged by it, since the mixes of
    // each group sum to 1) so values near 1e6 keep the digits of a gap of a few units.
    const double shift = first->y0;
    const auto centred = [&](const MeanMoments& m) { return (m.y0 - shift) + m.dy; };
    std::vector<double> c1, m1, c0, m0;
    for (const auto& c : cells) {
        if (c.focal.empty() && c.reference.empty()) continue;
        const double f = c.focal.empty() ? kNaN : centred(c.focal);
        const double r = c.reference.empty() ? f : centred(c.reference);
        c1.push_back(c.focal.empty() ? 0.0 : c.focal.w / n1);
        m1.push_back(c.focal.empty() ? r : f);
        c0.push_back(c.reference.empty() ? 0.0 : c.reference.w / n0);
        m0.push_back(r);
    }
    return kitagawa(c1, m1, c0, m0);
}

}  // namespace foldline::stats
