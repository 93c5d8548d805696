#include "core/stats/stratified.h"

#include <cmath>
#include <limits>

#include "core/stats/distributions.h"

namespace foldline::stats {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

Estimate log_scale(double est, double var, double alpha) {
    Estimate e{est, kNaN, {kNaN, kNaN}};
    if (!(est > 0) || !std::isfinite(est) || !(var >= 0) || !std::isfinite(var)) return e;
    const double z = z_for_alpha(alpha);
    e.se = std::sqrt(var);
    e.ci = {std::exp(std::log(est) - z * e.se), std::exp(std::log(est) + z * e.se)};
    return e;
}
}  // namespace

StratumCounts pooled(const Strata& strata) {
    StratumCounts t;
    for (const auto& s : strata) {
        t.a += s.a;
        t.b += s.b;
        t.c += s.c;
        t.d += s.d;
    }
    return t;
}

Estimate mh_odds_ratio(const Strata& strata, double alpha) {
    double R = 0, S = 0, PR = 0, PSQR = 0, QS = 0;
    for (const auto& s : strata) {
        const double N = s.total();
        if (N <= 0) continue;
        const double r = s.a * s.d / N, q = s.b * s.c / N;
        const double P = (s.a + s.d) / N, Q = (s.b + s.c) / N;
        R += r;
        S += q;
        PR += P * r;
        PSQR += P * q + Q * r;
        QS += Q * q;
    }
    if (R == 0 && S == 0) return {kNaN, kNaN, {kNaN, kNaN}};
    if (S == 0) return {std::numeric_limits<double>::infinity(), kNaN, {kNaN, kNaN}};
    if (R == 0) return {0.0, kNaN, {kNaN, kNaN}};
    const double var = PR / (2 * R * R) + PSQR / (2 * R * S) + QS / (2 * S * S);
    return log_scale(R / S, var, alpha);
}

Estimate mh_risk_ratio(const Strata& strata, double alpha) {
    double num = 0, den = 0, v = 0;
    for (const auto& s : strata) {
        const double N = s.total(), n1 = s.n_focal(), n0 = s.n_reference();
        if (n1 <= 0 || n0 <= 0) continue;
        const double m1 = s.a + s.c;
        num += s.a * n0 / N;
        den += s.c * n1 / N;
        v += (n1 * n0 * m1 - s.a * s.c * N) / (N * N);
    }
    if (num == 0 && den == 0) return {kNaN, kNaN, {kNaN, kNaN}};
    if (den == 0) return {std::numeric_limits<double>::infinity(), kNaN, {kNaN, kNaN}};
    if (num == 0) return {0.0, kNaN, {kNaN, kNaN}};
    return log_scale(num / den, v / (num * den), alpha);
}

RiskDifferenceMh mh_risk_difference(const Strata& strata, double alpha) {
    double W = 0, num = 0, gr = 0, sato_a = 0, sato_b = 0;
    for (const auto& s : strata) {
        const double N = s.total(), n1 = s.n_focal(), n0 = s.n_reference();
        if (n1 <= 0 || n0 <= 0) continue;
        const double w = n1 * n0 / N;
        W += w;
        num += w * (s.a / n1 - s.c / n0);
        gr += (s.a * s.b * n0 * n0 / n1 + s.c * s.d * n1 * n1 / n0) / (N * N);
        sato_a += (s.c * n1 * n1 - s.a * n0 * n0 + n1 * n0 * (n0 - n1) / 2.0) / (N * N);
        sato_b += (s.a * (n0 - s.c) + s.c * (n1 - s.a)) / (2.0 * N);
    }
    RiskDifferenceMh r{{kNaN, kNaN, {kNaN, kNaN}}, kNaN, {kNaN, kNaN}};
    if (W <= 0) return r;
    const double rd = num / W, z = z_for_alpha(alpha);
    r.greenland_robins.estimate = rd;
    r.greenland_robins.se = std::sqrt(gr / (W * W));
    r.greenland_robins.ci = {rd - z * r.greenland_robins.se, rd + z * r.greenland_robins.se};
    const double vs = (rd * sato_a + sato_b) / (W * W);
    if (vs >= 0) {
        r.se_sato = std::sqrt(vs);
        r.ci_sato = {rd - z * r.se_sato, rd + z * r.se_sato};
    }
    return r;
}

CmhTest cmh_test(const Strata& strata) {
    double delta = 0, var = 0;
    for (const auto& s : strata) {
        const double N = s.total();
        if (N < 2) continue;
        const double n1 = s.n_focal(), n0 = s.n_reference(), m1 = s.a + s.c, m0 = s.b + s.d;
        delta += s.a - n1 * m1 / N;
        var += n1 * n0 * m1 * m0 / (N * N * (N - 1));
    }
    CmhTest t{delta, var, kNaN, kNaN, kNaN, kNaN, kNaN};
    if (!(var > 0)) return t;
    t.z = delta / std::sqrt(var);
    t.statistic = delta * delta / var;
    t.p = chi_square_sf(t.statistic, 1);
    const double cc = std::fabs(delta) >= 0.5 ? 0.5 : 0.0;
    const double adj = std::fabs(delta) - cc;
    t.statistic_corrected = adj * adj / var;
    t.p_corrected = chi_square_sf(t.statistic_corrected, 1);
    return t;
}

double common_or_fitted_a(const StratumCounts& s, double psi) {
    const double n1 = s.n_focal(), n0 = s.n_reference(), m1 = s.a + s.c, m0 = s.b + s.d;
    if (n1 <= 0 || n0 <= 0 || m1 <= 0 || m0 <= 0 || !(psi > 0) || !std::isfinite(psi))
        return std::numeric_limits<double>::quiet_NaN();
    const double N = n1 + n0;
    if (std::fabs(psi - 1.0) < 1e-12) return n1 * m1 / N;
    const double lo = std::max(0.0, m1 - n0), hi = std::min(n1, m1);
    // (1 - psi) E^2 + [psi (n1 + m1) + (N - n1 - m1)] E - psi n1 m1 = 0, root in (lo, hi).
    const double qa = 1.0 - psi, qb = psi * (n1 + m1) + (N - n1 - m1), qc = -psi * n1 * m1;
    const double disc = std::sqrt(std::max(0.0, qb * qb - 4 * qa * qc));
    // Numerically stable pair of roots.
    const double q = -0.5 * (qb + std::copysign(disc, qb));
    const double r1 = q / qa, r2 = qc / q;
    return (r1 >= lo - 1e-9 && r1 <= hi + 1e-9) ? r1 : r2;
}

BreslowDayTest breslow_day(const Strata& strata, double psi) {
    BreslowDayTest t{kNaN, kNaN, kNaN, kNaN, kNaN, 0};
    double bd = 0, sum_a = 0, sum_e = 0, sum_v = 0;
    std::size_t used = 0;
    const bool ok = psi > 0 && std::isfinite(psi);
    for (const auto& s : strata) {
        const double n1 = s.n_focal(), n0 = s.n_reference(), m1 = s.a + s.c, m0 = s.b + s.d;
        if (n1 <= 0 || n0 <= 0 || m1 <= 0 || m0 <= 0) continue;
        ++used;
        if (!ok) continue;
        const double N = n1 + n0;
        const double e = common_or_fitted_a(s, psi);
        const double inv_v = 1.0 / e + 1.0 / (n1 - e) + 1.0 / (m1 - e) + 1.0 / (N - n1 - m1 + e);
        const double v = 1.0 / inv_v;
        bd += (s.a - e) * (s.a - e) / v;
        sum_a += s.a;
        sum_e += e;
        sum_v += v;
    }
    t.strata_used = used;
    if (!ok || used < 2) return t;
    t.df = static_cast<double>(used - 1);
    t.statistic = bd;
    t.p = chi_square_sf(bd, t.df);
    t.statistic_tarone = bd - (sum_a - sum_e) * (sum_a - sum_e) / sum_v;
    t.p_tarone = chi_square_sf(t.statistic_tarone, t.df);
    return t;
}

TwoByTwo two_by_two(const StratumCounts& s, double alpha) {
    TwoByTwo r;
    const double n1 = s.n_focal(), n0 = s.n_reference();
    r.rate_focal = proportion(s.a, n1);
    r.rate_reference = proportion(s.c, n0);
    r.rate_focal_ci = wilson(s.a, n1, alpha);
    r.rate_reference_ci = wilson(s.c, n0, alpha);
    r.rd = r.rate_focal - r.rate_reference;
    r.rd_ci = newcombe_difference(s.a, n1, s.c, n0, alpha);
    r.rr = r.odds_ratio = kNaN;
    if (n1 > 0 && n0 > 0) {
        const bool zero = s.a == 0 || s.b == 0 || s.c == 0 || s.d == 0;
        const double h = zero ? 0.5 : 0.0;
        const double a = s.a + h, b = s.b + h, c = s.c + h, d = s.d + h;
        r.rr = (a / (a + b)) / (c / (c + d));
        r.odds_ratio = (a * d) / (b * c);
    }
    r.selection_ratio = r.rate_reference > 0 ? r.rate_focal / r.rate_reference : kNaN;
    r.z = cmh_test(Strata{s}).z;
    return r;
}

}  // namespace foldline::stats
