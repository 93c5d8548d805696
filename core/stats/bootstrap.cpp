#include "core/stats/bootstrap.h"

#include <cmath>
#include <limits>

namespace foldline::stats {

namespace {
// Multinomial by conditional binomials over cells[0..k), writing into out.
void multinomial(std::int64_t n, const std::vector<double>& share, std::vector<double>& out,
                 std::mt19937_64& rng) {
    double rest = 1.0;
    for (std::size_t i = 0; i < share.size(); ++i) {
        if (n <= 0 || rest <= 0) {
            out[i] = 0;
            continue;
        }
        if (i + 1 == share.size()) {
            out[i] = static_cast<double>(n);
            n = 0;
            continue;
        }
        const double p = std::min(1.0, std::max(0.0, share[i] / rest));
        std::int64_t x = 0;
        if (p >= 1.0) x = n;
        else if (p > 0) x = std::binomial_distribution<std::int64_t>(n, p)(rng);
        out[i] = static_cast<double>(x);
        n -= x;
        rest -= share[i];
    }
}
}  // namespace

Strata resample_strata(const Strata& strata, std::mt19937_64& rng) {
    const std::size_t k = strata.size();
    Strata out(k);
    if (k == 0) return out;
    std::vector<double> share(2 * k), draw(2 * k);
    for (int g = 0; g < 2; ++g) {
        double n = 0;
        for (std::size_t z = 0; z < k; ++z) {
            share[2 * z] = g == 0 ? strata[z].a : strata[z].c;
            share[2 * z + 1] = g == 0 ? strata[z].b : strata[z].d;
            n += share[2 * z] + share[2 * z + 1];
        }
        if (n > 0)
            for (auto& s : share) s /= n;
        multinomial(static_cast<std::int64_t>(std::llround(n)), share, draw, rng);
        for (std::size_t z = 0; z < k; ++z) {
            if (g == 0) {
                out[z].a = draw[2 * z];
                out[z].b = draw[2 * z + 1];
            } else {
                out[z].c = draw[2 * z];
                out[z].d = draw[2 * z + 1];
            }
        }
    }
    return out;
}

double bootstrap_share(const Strata& strata, int draws, std::uint64_t seed,
                       const std::function<bool(const Strata&)>& holds) {
    if (draws <= 0) return std::numeric_limits<double>::quiet_NaN();
    std::mt19937_64 rng(seed);
    int hits = 0;
    for (int i = 0; i < draws; ++i)
        if (holds(resample_strata(strata, rng))) ++hits;
    return static_cast<double>(hits) / draws;
}

}  // namespace foldline::stats
