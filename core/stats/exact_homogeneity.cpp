#include "core/stats/exact_homogeneity.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include "core/stats/exact_stratified.h"

namespace foldline::stats {

namespace {

double log_choose(double n, double k) {
    return std::lgamma(n + 1) - std::lgamma(k + 1) - std::lgamma(n - k + 1);
}

struct Varying {
    long lo, hi;
    long m1, m0, n1;           // the stratum's margins
    std::vector<double> logh;  // log central hypergeometric density over lo..hi (unnormalised)
};

}  // namespace

std::string_view to_string(HomogeneityStatus s) {
    switch (s) {
        case HomogeneityStatus::Computed: return "computed";
        case HomogeneityStatus::TooFewStrata: return "fewer than two varying strata";
        case HomogeneityStatus::NotWholeCounts: return "counts not whole";
        case HomogeneityStatus::TooManyTables: return "too many tables";
        case HomogeneityStatus::TooLarge: return "too large to count";
    }
    return "computed";
}

ZelenTest zelen_exact(const Strata& strata, double max_tables, double max_count_work) {
    ZelenTest z;
    z.p = std::numeric_limits<double>::quiet_NaN();
    if (!whole_counts(strata)) {
        z.status = HomogeneityStatus::NotWholeCounts;
        return z;
    }
    // Margins first: the cost of counting is bounded before anything of a stratum's width is built.
    std::vector<Varying> v;
    std::vector<long> obs;
    long s = 0;  // observed sum over the varying strata
    for (const auto& st : strata) {
        const long n1 = std::lround(st.a + st.b), m1 = std::lround(st.a + st.c), m0 = std::lround(st.b + st.d);
        const long lo = std::max(0L, n1 - m0), hi = std::min(n1, m1);
        if (hi <= lo) continue;
        v.push_back(Varying{lo, hi, m1, m0, n1, {}});
        obs.push_back(std::lround(st.a));
        s += std::lround(st.a);
    }
    z.strata_varying = v.size();
    if (v.size() < 2) return z;

    // Offsets: y_k = a_k - lo_k in 0..w_k; the tables are the y with sum t = s - sum lo_k.
    const std::size_t K = v.size();
    long t = s;
    for (const auto& x : v) t -= x.lo;
    // ways[k][r]: number of (y_k, ..., y_{K-1}) summing to r <= t (doubles: counts can be huge).
    // Its cost, and the densities' length, are bounded before either is built.
    double work = 0, len = 1;
    for (std::size_t k = K; k-- > 0;) {
        const double w = double(v[k].hi - v[k].lo);
        work += len * (w + 1) + (w + 1);
        len = std::min(len + w, double(t) + 1);
    }
    if (work > max_count_work) {
        z.status = HomogeneityStatus::TooLarge;
        return z;
    }
    for (auto& x : v) {
        x.logh.reserve(static_cast<std::size_t>(x.hi - x.lo + 1));
        for (long a = x.lo; a <= x.hi; ++a)
            x.logh.push_back(log_choose(double(x.m1), double(a)) + log_choose(double(x.m0), double(x.n1 - a)));
    }
    const std::size_t cap = static_cast<std::size_t>(t) + 1;
    std::vector<std::vector<double>> ways(K + 1);
    ways[K] = {1.0};
    for (std::size_t k = K; k-- > 0;) {
        const std::size_t w = static_cast<std::size_t>(v[k].hi - v[k].lo);
        const auto& after = ways[k + 1];
        std::vector<double> cur(std::min(after.size() + w, cap), 0.0);
        for (std::size_t y = 0; y <= w; ++y)
            for (std::size_t r = 0; r < after.size() && r + y < cur.size(); ++r) cur[r + y] += after[r];
        ways[k] = std::move(cur);
    }
    z.tables = ways[0][static_cast<std::size_t>(t)];
    if (z.tables > max_tables) {
        z.status = HomogeneityStatus::TooManyTables;
        return z;
    }

    double log_obs = 0, ref = 0;  // ref bounds every table's log probability from above
    for (std::size_t k = 0; k < K; ++k) {
        log_obs += v[k].logh[static_cast<std::size_t>(obs[k] - v[k].lo)];
        ref += *std::max_element(v[k].logh.begin(), v[k].logh.end());
    }
    // Enumerate every table with the observed sum (depth-first, pruned by `ways`), summing the
    // probabilities relative to exp(ref).
    double total = 0, extreme = 0;
    const double cut = std::log1p(1e-7);
    auto walk = [&](auto&& self, std::size_t k, long remaining, double logp) -> void {
        if (k == K) {
            const double rel = std::exp(logp - ref);
            total += rel;
            if (logp - log_obs <= cut) extreme += rel;
            return;
        }
        const long w = v[k].hi - v[k].lo;
        for (long yk = 0; yk <= std::min(w, remaining); ++yk) {
            const long rest = remaining - yk;
            if (rest < 0 || static_cast<std::size_t>(rest) >= ways[k + 1].size() || ways[k + 1][static_cast<std::size_t>(rest)] == 0) continue;
            self(self, k + 1, rest, logp + v[k].logh[static_cast<std::size_t>(yk)]);
        }
    };
    walk(walk, 0, t, 0.0);
    z.p = std::min(1.0, extreme / total);
    z.status = HomogeneityStatus::Computed;
    return z;
}

}  // namespace foldline::stats
