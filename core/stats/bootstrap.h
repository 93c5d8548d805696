#pragma once
// Parametric resampling of a count cube: each group's rows are redrawn as one multinomial over
// its (stratum, outcome) cells with the observed cell shares, keeping the group's total fixed.
// This is the row bootstrap done on sufficient statistics (cost independent of the row count).
// Deterministic for a given seed (std::mt19937_64 and conditional binomials; a given standard
// library gives the same stream on every run).
#include <cstdint>
#include <functional>
#include <random>

#include "core/stats/stratified.h"

namespace foldline::stats {

/// One multinomial redraw of both groups. Weighted (non-integer) totals are rounded to the
/// nearest count. Empty strata -> empty result.
Strata resample_strata(const Strata& strata, std::mt19937_64& rng);

/// Share of `draws` resamples (seeded with `seed`) for which `holds` is true. NaN when draws <= 0.
double bootstrap_share(const Strata& strata, int draws, std::uint64_t seed,
                       const std::function<bool(const Strata&)>& holds);

}  // namespace foldline::stats
