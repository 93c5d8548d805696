#pragma once
// Parametric resampling of a count cube: each group's rows are redrawn as one multinomial over
// its (stratum, outcome) cells with the observed cell shares, keeping the group's total fixed.
// This is the row bootstrap done on sufficient statistics (cost independent of the row count).
// Cells with n p (1 - p) >= 50 are drawn jointly from the normal approximation of the
// multinomial (same covariance, exact total, rounded); the other cells, and how many rows go to
// the large cells, are drawn exactly by conditional binomials. Random numbers come
// from xoshiro256** (Blackman & Vigna 2018) seeded through splitmix64, normal deviates from the
// ziggurat method, so a seed gives the same draws on every run and thread.
#include <cstddef>
#include <cstdint>
#include <functional>
#include <limits>
#include <vector>

#include "core/stats/stratified.h"

namespace foldline::stats {

/// xoshiro256** generator; satisfies UniformRandomBitGenerator.
class Xoshiro256 {
public:
    using result_type = std::uint64_t;
    explicit Xoshiro256(std::uint64_t seed);
    static constexpr result_type min() { return 0; }
    static constexpr result_type max() { return std::numeric_limits<result_type>::max(); }
    result_type operator()();
    /// Uniform double in [0, 1) with 53 random bits.
    double uniform() { return static_cast<double>((*this)() >> 11) * 0x1.0p-53; }
    /// Standard normal deviate (ziggurat method of Marsaglia & Tsang 2000, 128 layers; the layer
    /// index and the value come from separate bits of one 64-bit draw).
    double normal();

private:
    std::uint64_t s_[4];
};

/// Multinomial(n, share) over k cells, with everything that depends only on the observed shares
/// prepared once (used for each group of a count cube, and for the cell counts of a mean-gap
/// resample). Cells with n p (1 - p) >= 50 ("large") are drawn jointly from the normal
/// approximation with the multinomial's covariance n (diag q - q q') and an exact total:
/// x_i = n_L q_i + sqrt(n_L) (sqrt(q_i) Z_i - q_i sum_j sqrt(q_j) Z_j), rounded, the rounding
/// remainder given to the largest cell. How many rows go to the large cells, and the small cells
/// themselves, are drawn exactly (conditional binomials). No serial chain runs through the large
/// cells, which is where the time went.
class MultinomialSampler {
public:
    /// `share` sums to 1 (cells with share <= 0 always get 0).
    MultinomialSampler(std::int64_t n, std::vector<double> share);
    /// Writes one draw (share.size() counts summing to n) into out.
    void draw(double* out, Xoshiro256& rng);

private:
    std::int64_t n_;
    std::vector<double> share_;
    std::vector<std::size_t> large_, small_;
    std::vector<double> q_, root_q_, z_;
    double p_large_ = 0, p_small_ = 0, pl_ = 0, npq_ = 0;
};

/// One multinomial redraw of both groups. Weighted (non-integer) totals are rounded to the
/// nearest count. Empty strata -> empty result.
Strata resample_strata(const Strata& strata, Xoshiro256& rng);

/// Share of `draws` resamples (seeded with `seed`) for which `holds` is true. NaN when draws <= 0.
double bootstrap_share(const Strata& strata, int draws, std::uint64_t seed,
                       const std::function<bool(const Strata&)>& holds);

}  // namespace foldline::stats
