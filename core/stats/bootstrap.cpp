#include "core/stats/bootstrap.h"

#include <algorithm>
#include <cmath>
#include <random>
#include <vector>

namespace foldline::stats {

namespace {

constexpr double kNormalFrom = 50.0;

std::uint64_t splitmix64(std::uint64_t& x) {
    std::uint64_t z = (x += 0x9E3779B97F4A7C15ull);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    return z ^ (z >> 31);
}

std::uint64_t rotl(std::uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }

// Multinomial by conditional binomials over the cells, written into out.
void multinomial(std::int64_t n, const double* share, std::size_t k, double* out, Xoshiro256& rng) {
    double rest = 1.0;
    for (std::size_t i = 0; i < k; ++i) {
        if (n <= 0 || rest <= 0) {
            out[i] = 0;
            continue;
        }
        if (i + 1 == k) {
            out[i] = static_cast<double>(n);
            n = 0;
            continue;
        }
        const double p = std::min(1.0, std::max(0.0, share[i] / rest));
        rest -= share[i];
        std::int64_t x = 0;
        const double dn = static_cast<double>(n);
        const double npq = dn * p * (1.0 - p);
        if (p >= 1.0) {
            x = n;
        } else if (npq >= kNormalFrom) {
            // De Moivre-Laplace: at this size the binomial skewness is below 1/sqrt(50) = 0.14.
            x = static_cast<std::int64_t>(std::clamp(std::round(dn * p + std::sqrt(npq) * rng.normal()), 0.0, dn));
        } else if (p > 0) {
            x = std::binomial_distribution<std::int64_t>(n, p)(rng);
        }
        out[i] = static_cast<double>(x);
        n -= x;
    }
}

}  // namespace

Xoshiro256::Xoshiro256(std::uint64_t seed) {
    for (auto& s : s_) s = splitmix64(seed);
}

Xoshiro256::result_type Xoshiro256::operator()() {
    const std::uint64_t result = rotl(s_[1] * 5, 7) * 9;
    const std::uint64_t t = s_[1] << 17;
    s_[2] ^= s_[0];
    s_[3] ^= s_[1];
    s_[1] ^= s_[2];
    s_[0] ^= s_[3];
    s_[2] ^= t;
    s_[3] = rotl(s_[3], 45);
    return result;
}

double Xoshiro256::normal() {
    if (has_spare_) {
        has_spare_ = false;
        return spare_;
    }
    double u, v, s;
    do {
        u = 2.0 * uniform() - 1.0;
        v = 2.0 * uniform() - 1.0;
        s = u * u + v * v;
    } while (s >= 1.0 || s == 0.0);
    const double f = std::sqrt(-2.0 * std::log(s) / s);
    spare_ = v * f;
    has_spare_ = true;
    return u * f;
}

Strata resample_strata(const Strata& strata, Xoshiro256& rng) {
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
        multinomial(static_cast<std::int64_t>(std::llround(n)), share.data(), share.size(), draw.data(), rng);
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
    Xoshiro256 rng(seed);
    int hits = 0;
    for (int i = 0; i < draws; ++i)
        if (holds(resample_strata(strata, rng))) ++hits;
    return static_cast<double>(hits) / draws;
}

}  // namespace foldline::stats
