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

// std::round, bit for bit, without the library call it compiles to on baseline x86-64 (it was
// a tenth of the bootstrap's instructions): truncate through an integer, then step away from
// zero when the dropped fraction (exact: x and its truncation share an exponent range) is at
// least one half. Values of 2^52 or more, infinities and NaN are already whole or unchanged.
inline double round_half_away(double x) {
    if (!(std::fabs(x) < 4503599627370496.0)) return x;
    const double t = static_cast<double>(static_cast<std::int64_t>(x));
    if (std::fabs(x - t) >= 0.5) return t + (x < 0 ? -1.0 : 1.0);
    return t == 0 ? std::copysign(0.0, x) : t;
}

// Exact multinomial by conditional binomials over the cells idx[0..m) with the given shares
// (summing to `total_share`), written into out.
void conditional_binomials(std::int64_t n, const double* share, const std::size_t* idx, std::size_t m,
                           double total_share, double* out, Xoshiro256& rng) {
    double rest = total_share;
    for (std::size_t j = 0; j < m; ++j) {
        const std::size_t i = idx[j];
        if (n <= 0 || rest <= 0) {
            out[i] = 0;
            continue;
        }
        if (j + 1 == m) {
            out[i] = static_cast<double>(n);
            n = 0;
            continue;
        }
        const double p = std::min(1.0, std::max(0.0, share[i] / rest));
        rest -= share[i];
        std::int64_t x = 0;
        if (p >= 1.0) x = n;
        else if (p > 0) x = std::binomial_distribution<std::int64_t>(n, p)(rng);
        out[i] = static_cast<double>(x);
        n -= x;
    }
}

// Both groups of a cube: group 0 is (a, b) per stratum, group 1 is (c, d).
class CubeSampler {
public:
    explicit CubeSampler(const Strata& strata) : k_(strata.size()) {
        for (int g = 0; g < 2; ++g) {
            std::vector<double> share(2 * k_);
            double n = 0;
            for (std::size_t z = 0; z < k_; ++z) {
                share[2 * z] = g == 0 ? strata[z].a : strata[z].c;
                share[2 * z + 1] = g == 0 ? strata[z].b : strata[z].d;
                n += share[2 * z] + share[2 * z + 1];
            }
            if (n > 0)
                for (auto& x : share) x /= n;
            groups_.emplace_back(static_cast<std::int64_t>(std::llround(n)), std::move(share));
        }
        draw_.resize(2 * k_);
    }

    void draw(Strata& out, Xoshiro256& rng) {
        out.resize(k_);
        for (int g = 0; g < 2; ++g) {
            groups_[static_cast<std::size_t>(g)].draw(draw_.data(), rng);
            for (std::size_t z = 0; z < k_; ++z) {
                if (g == 0) {
                    out[z].a = draw_[2 * z];
                    out[z].b = draw_[2 * z + 1];
                } else {
                    out[z].c = draw_[2 * z];
                    out[z].d = draw_[2 * z + 1];
                }
            }
        }
    }

private:
    std::size_t k_;
    std::vector<MultinomialSampler> groups_;
    std::vector<double> draw_;
};

}  // namespace

MultinomialSampler::MultinomialSampler(std::int64_t n, std::vector<double> share) : n_(n), share_(std::move(share)) {
    const double dn = static_cast<double>(n);
    for (std::size_t i = 0; i < share_.size(); ++i) {
        if (share_[i] <= 0) continue;
        if (dn * share_[i] * (1.0 - share_[i]) >= kNormalFrom) {
            large_.push_back(i);
            p_large_ += share_[i];
        } else {
            small_.push_back(i);
            p_small_ += share_[i];
        }
    }
    for (auto i : large_) {
        const double q = share_[i] / p_large_;
        q_.push_back(q);
        root_q_.push_back(std::sqrt(q));
    }
    z_.resize(large_.size());
    if (!large_.empty() && !small_.empty()) {
        pl_ = p_large_ / (p_large_ + p_small_);
        npq_ = dn * pl_ * (1 - pl_);
    }
}

void MultinomialSampler::draw(double* out, Xoshiro256& rng) {
    std::fill(out, out + share_.size(), 0.0);
    const double dn = static_cast<double>(n_);
    std::int64_t n_large = 0;
    if (large_.empty()) n_large = 0;
    else if (small_.empty()) n_large = n_;
    else if (npq_ >= kNormalFrom)
        n_large = static_cast<std::int64_t>(std::clamp(round_half_away(dn * pl_ + std::sqrt(npq_) * rng.normal()), 0.0, dn));
    else
        n_large = std::binomial_distribution<std::int64_t>(n_, std::min(1.0, pl_))(rng);
    conditional_binomials(n_ - n_large, share_.data(), small_.data(), small_.size(), p_small_, out, rng);
    if (large_.empty()) return;
    const double nl = static_cast<double>(n_large), root = std::sqrt(nl);
    double s = 0;
    for (std::size_t j = 0; j < large_.size(); ++j) {
        z_[j] = rng.normal();
        s += root_q_[j] * z_[j];
    }
    double sum = 0;
    std::size_t biggest = large_[0];
    for (std::size_t j = 0; j < large_.size(); ++j) {
        const double x = std::max(0.0, round_half_away(nl * q_[j] + root * (root_q_[j] * z_[j] - q_[j] * s)));
        out[large_[j]] = x;
        sum += x;
        if (x > out[biggest]) biggest = large_[j];
    }
    out[biggest] = std::max(0.0, out[biggest] + (nl - sum));
}

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
    Strata out;
    if (strata.empty()) return out;
    CubeSampler(strata).draw(out, rng);
    return out;
}

double bootstrap_share(const Strata& strata, int draws, std::uint64_t seed,
                       const std::function<bool(const Strata&)>& holds) {
    if (draws <= 0) return std::numeric_limits<double>::quiet_NaN();
    Xoshiro256 rng(seed);
    CubeSampler sampler(strata);
    Strata resampled;
    int hits = 0;
    for (int i = 0; i < draws; ++i) {
        sampler.draw(resampled, rng);
        if (holds(resampled)) ++hits;
    }
    return static_cast<double>(hits) / draws;
}

}  // namespace foldline::stats
