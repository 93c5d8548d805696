#pragma once
// Direct standardisation of the two groups' rates to one standard stratum mix. With the pooled
// (whole population's) mix as the standard this is the back-door adjustment over the strata
// (Pearl 2009, Causality, Thm 3.3.2 [from memory]). Variance treats the weights as fixed:
// Var = sum w_z^2 [r1z (1 - r1z) / n1z + r0z (1 - r0z) / n0z] (common practice), Wald CI.
#include "core/stats/stratified.h"

namespace foldline::stats {

struct Standardized {
    double rate_focal, rate_reference;  ///< standardised rates
    double rd;                          ///< their difference
    double se;
    Interval rd_ci;
};

/// Standardises over the informative strata (both groups present), weights = each stratum's
/// share of all rows in informative strata. All NaN when no stratum is informative.
Standardized standardized_rd(const Strata& strata, double alpha = 0.05);

}  // namespace foldline::stats
