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

namespace {

// Ziggurat tables for the standard normal (Marsaglia & Tsang 2000, J Stat Softw 5(8)): 128
// layers of equal area v = 9.91256303526217e-3 with base-layer edge r = 3.442619855899.
struct ZigguratTables {
    std::uint32_t k[128];
    double w[128], f[128];
    ZigguratTables() {
        const double m1 = 2147483648.0, vn = 9.91256303526217e-3;
        double dn = 3.442619855899, tn = dn;
        const double q = vn / std::exp(-0.5 * dn * dn);
        k[0] = static_cast<std::uint32_t>((dn / q) * m1);
        k[1] = 0;
        w[0] = q / m1;
        w[127] = dn / m1;
        f[0] = 1.0;
        f[127] = std::exp(-0.5 * dn * dn);
        for (int i = 126; i >= 1; --i) {
            dn = std::sqrt(-2.0 * std::log(vn / dn + std::exp(-0.5 * dn * dn)));
            k[i + 1] = static_cast<std::uint32_t>((dn / tn) * m1);
            tn = dn;
            f[i] = std::exp(-0.5 * dn * dn);
            w[i] = dn / m1;
        }
    }
};

const ZigguratTables kZig;

}  // namespace

double Xoshiro256::normal() {
    constexpr double r = 3.442619855899;
    for (;;) {
        const std::uint64_t bits = (*this)();
        const int iz = static_cast<int>(bits & 127);
        const auto hz = static_cast<std::int32_t>(static_cast<std::uint32_t>(bits >> 32));
        const std::uint32_t ahz = hz < 0 ? static_cast<std::uint32_t>(-static_cast<std::int64_t>(hz))
                                         : static_cast<std::uint32_t>(hz);
        const double x = hz * kZig.w[iz];
        if (ahz < kZig.k[iz]) return x;  // inside the layer's rectangle (about 99% of draws)
        if (iz == 0) {
            // Base layer beyond r: sample the tail (Marsaglia 1964).
            double tx, ty;
            do {
                tx = -std::log(1.0 - uniform()) / r;
                ty = -std::log(1.0 - uniform());
            } while (ty + ty < tx * tx);
            return hz > 0 ? r + tx : -r - tx;
        }
        if (kZig.f[iz] + uniform() * (kZig.f[iz - 1] - kZig.f[iz]) < std::exp(-0.5 * x * x)) return x;
    }
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
