#pragma once
// Zelen's exact test of a common odds ratio across 2 x 2 x K strata (homogeneity), from counts.
//
// Conditional on every stratum's margins and on S = sum of the focal-group events a_k (the
// sufficient statistic of the common odds ratio), the tables (a_1, ..., a_K) have probabilities
// proportional to the product of the strata's central hypergeometric densities; the p-value is
// the total probability of the tables no more probable than the observed one (Zelen 1971,
// Biometrika 58:129; the same fuzz 1 + 1e-7 as R's exact tests).
//
// Bounded enumeration: the number of tables with the observed S is counted first (a dynamic
// programme over the strata, itself bounded); above `max_tables` the test is not run and
// `status` says so, and
// callers report homogeneity as not assessable with these counts.
#include <cstddef>
#include <string_view>

#include "core/stats/stratified.h"

namespace foldline::stats {

enum class HomogeneityStatus {
    Computed,        ///< p filled
    TooFewStrata,    ///< fewer than two strata in which a_k can vary
    NotWholeCounts,  ///< weighted counts
    TooManyTables,   ///< more than max_tables tables share the observed S
    TooLarge,        ///< counting the tables would take over max_count_work steps
};

/// "computed", "fewer than two varying strata", "counts not whole", "too many tables", "too large to count".
std::string_view to_string(HomogeneityStatus s);

struct ZelenTest {
    HomogeneityStatus status = HomogeneityStatus::TooFewStrata;
    double p = 0;              ///< NaN unless Computed
    double tables = 0;         ///< tables with the observed S (counted even when too many)
    std::size_t strata_varying = 0;
};

/// Zelen's exact test of homogeneity; at most `max_tables` tables are enumerated, and counting
/// them (sum over strata of min(width so far, S range) x stratum width) takes at most
/// `max_count_work` steps, else TooLarge (tables left 0).
ZelenTest zelen_exact(const Strata& strata, double max_tables = 1e5, double max_count_work = 5e7);

}  // namespace foldline::stats
