#include "core/stats/exact_stratified.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>

namespace foldline::stats {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

double log_choose(double n, double k) {
    return std::lgamma(n + 1) - std::lgamma(k + 1) - std::lgamma(n - k + 1);
}

struct Margins {
    long n1, m1, m0, lo, hi;  // a ~ hypergeometric(m1 events, m0 non-events, n1 draws)
};

Margins margins(const StratumCounts& s) {
    Margins m{};
    m.n1 = std::lround(s.a + s.b);
    m.m1 = std::lround(s.a + s.c);
    m.m0 = std::lround(s.b + s.d);
    m.lo = std::max(0L, m.n1 - m.m0);
    m.hi = std::min(m.n1, m.m1);
    return m;
}

// Central hypergeometric density of a over lo..hi, normalised to sum 1.
std::vector<double> hypergeometric(const Margins& m) {
    std::vector<double> d(static_cast<std::size_t>(m.hi - m.lo + 1));
    std::vector<double> logd(d.size());
    double mx = -kInf;
    for (long a = m.lo; a <= m.hi; ++a) {
        const double l = log_choose(double(m.m1), double(a)) + log_choose(double(m.m0), double(m.n1 - a));
        logd[static_cast<std::size_t>(a - m.lo)] = l;
        mx = std::max(mx, l);
    }
    double sum = 0;
    for (std::size_t i = 0; i < d.size(); ++i) sum += d[i] = std::exp(logd[i] - mx);
    for (auto& x : d) x /= sum;
    return d;
}

// The noncentral density P_psi(S = lo + i) ∝ c_i psi^i, from log c, at t = log psi.
void noncentral(const std::vector<double>& logc, double t, std::vector<double>& out) {
    out.resize(logc.size());
    double mx = -kInf;
    for (std::size_t i = 0; i < logc.size(); ++i) {
        out[i] = logc[i] + t * static_cast<double>(i);
        mx = std::max(mx, out[i]);
    }
    double sum = 0;
    for (auto& x : out) sum += x = std::isfinite(x) ? std::exp(x - mx) : 0.0;
    for (auto& x : out) x /= sum;
}

// Root in t = log psi of an increasing function f(t) - target, by bracketing and bisection.
double solve_increasing(const std::function<double(double)>& f, double target) {
    double lo = -1, hi = 1;
    while (f(lo) > target && lo > -700) lo *= 2;
    while (f(hi) < target && hi < 700) hi *= 2;
    for (int it = 0; it < 200 && hi - lo > 1e-10; ++it) {
        const double mid = 0.5 * (lo + hi);
        (f(mid) < target ? lo : hi) = mid;
    }
    return 0.5 * (lo + hi);
}

}  // namespace

std::string_view to_string(ExactStatus s) {
    switch (s) {
        case ExactStatus::Computed: return "computed";
        case ExactStatus::NoInformation: return "no information";
        case ExactStatus::NotWholeCounts: return "counts not whole";
        case ExactStatus::TooLarge: return "too large";
    }
    return "no information";
}

bool whole_counts(const Strata& strata) {
    for (const auto& s : strata)
        for (double x : {s.a, s.b, s.c, s.d})
            if (!(x >= 0) || std::fabs(x - std::round(x)) > 1e-9) return false;
    return true;
}

ExactStatus conditional_distribution(const Strata& strata, const ExactLimits& limits, ConditionalDistribution& out) {
    out = {};
    if (!whole_counts(strata)) return ExactStatus::NotWholeCounts;
    std::vector<Margins> varying;
    long lo = 0, hi = 0;
    double width = 1, work = 0;
    for (const auto& s : strata) {
        const auto m = margins(s);
        lo += m.lo;
        hi += m.hi;
        if (m.hi > m.lo) {
            const double w = double(m.hi - m.lo + 1);
            work += width * w;
            width += w - 1;
            varying.push_back(m);
        }
    }
    out.lo = lo;
    out.hi = hi;
    out.work = work;
    if (varying.empty()) return ExactStatus::NoInformation;
    if (width > limits.max_support || work > limits.max_convolution_work) return ExactStatus::TooLarge;
    std::vector<double> c{1.0}, next;
    for (const auto& m : varying) {
        const auto h = hypergeometric(m);
        next.assign(c.size() + h.size() - 1, 0.0);
        for (std::size_t j = 0; j < h.size(); ++j)
            for (std::size_t w = 0; w < c.size(); ++w) next[w + j] += c[w] * h[j];
        double sum = 0;
        for (double x : next) sum += x;
        for (auto& x : next) x /= sum;
        c.swap(next);
    }
    out.density = std::move(c);
    return ExactStatus::Computed;
}

ExactCommonOr exact_common_odds_ratio(const Strata& strata, double alpha, const ExactLimits& limits,
                                      bool with_estimate) {
    ExactCommonOr r;
    r.p_two_sided = r.p_greater = r.p_less = r.estimate = kNaN;
    r.ci = {kNaN, kNaN};
    for (const auto& s : strata) r.s += s.a;
    ConditionalDistribution dist;
    r.status = conditional_distribution(strata, limits, dist);
    r.lo = dist.lo;
    r.hi = dist.hi;
    r.support = double(dist.hi - dist.lo + 1);
    r.work = dist.work;
    if (r.status != ExactStatus::Computed) return r;

    const auto& dc = dist.density;
    const long s = std::lround(r.s);
    const std::size_t obs = static_cast<std::size_t>(s - dist.lo);
    const std::size_t n = dc.size();

    // Two-sided p with R's relative fuzz; one-sided tails at psi = 1.
    const double cut = dc[obs] * (1 + 1e-7);
    double two = 0, greater = 0, less = 0;
    for (std::size_t i = 0; i < n; ++i) {
        if (dc[i] <= cut) two += dc[i];
        if (i >= obs) greater += dc[i];
        if (i <= obs) less += dc[i];
    }
    r.p_two_sided = std::min(1.0, two);
    r.p_greater = std::min(1.0, greater);
    r.p_less = std::min(1.0, less);
    if (!with_estimate) return r;

    std::vector<double> logc(n), d;
    for (std::size_t i = 0; i < n; ++i) logc[i] = dc[i] > 0 ? std::log(dc[i]) : -kInf;
    const double x = double(obs);
    auto mean = [&](double t) {
        noncentral(logc, t, d);
        double m = 0;
        for (std::size_t i = 0; i < n; ++i) m += double(i) * d[i];
        return m;
    };
    auto upper_tail = [&](double t) {  // P_t(S >= s), increasing in t
        noncentral(logc, t, d);
        double p = 0;
        for (std::size_t i = obs; i < n; ++i) p += d[i];
        return p;
    };
    auto minus_lower_tail = [&](double t) {  // -P_t(S <= s), increasing in t
        noncentral(logc, t, d);
        double p = 0;
        for (std::size_t i = 0; i <= obs; ++i) p += d[i];
        return -p;
    };

    if (s == dist.lo) r.estimate = 0;
    else if (s == dist.hi) r.estimate = kInf;
    else r.estimate = std::exp(solve_increasing(mean, x));

    const double half = alpha / 2;
    r.ci.lo = s == dist.lo ? 0.0 : std::exp(solve_increasing(upper_tail, half));
    r.ci.hi = s == dist.hi ? kInf : std::exp(solve_increasing(minus_lower_tail, -half));
    return r;
}

ExactCommonOr fisher_exact(const StratumCounts& s, double alpha, const ExactLimits& limits) {
    return exact_common_odds_ratio(Strata{s}, alpha, limits);
}

}  // namespace foldline::stats
