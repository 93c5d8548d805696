#pragma once
// Exact conditional inference on a common odds ratio in 2 x 2 x K tables, from the strata's counts.
//
// Given every stratum's margins, S = sum of the focal-group events a_k has the distribution
//   P(S = s) ∝ c(s) psi^s,   lo <= s <= hi,
// where c is the convolution of the strata's central hypergeometric densities and psi the common
// odds ratio (Mehta, Patel & Gray 1985, JASA 80:969; Cox 1970, "Analysis of Binary Data"). The
// method and its conventions are those of R's stats::mantelhaen.test(exact = TRUE):
//   - two-sided p: the sum of c(s') over c(s') <= c(s) (1 + 1e-7), the fuzz R uses;
//   - one-sided p: P(S >= s) ("greater") and P(S <= s) ("less") at psi = 1;
//   - conditional MLE: the psi with E_psi(S) = s (0 when s = lo, +inf when s = hi);
//   - exact interval: lower limit solves P_psi(S >= s) = alpha / 2 (0 when s = lo), upper limit
//     solves P_psi(S <= s) = alpha / 2 (+inf when s = hi).
// With one stratum this is Fisher's exact test with the conditional MLE and interval of R's
// stats::fisher.test. R solves its equations with uniroot (tolerance about 1.2e-4 on the scale
// it searches, psi or 1 / psi in (0, 1)); here they are solved by bisection on log psi to 1e-10.
//
// Bounded time: the convolution costs sum_k (width so far) x (width of stratum k) multiply-adds
// and every root search about 100 passes over the support. Above the limits in ExactLimits the
// figures are not computed and `status` says why (the caller falls back to asymptotic figures).
// Counts must be whole numbers: weighted counts are not assessable exactly.
#include <cstddef>
#include <string>
#include <vector>

#include "core/stats/proportions.h"
#include "core/stats/stratified.h"

namespace foldline::stats {

struct ExactLimits {
    double max_support = 100000;          ///< hi - lo + 1 of S
    double max_convolution_work = 5e7;    ///< multiply-adds of the convolution
};

enum class ExactStatus {
    Computed,        ///< every figure below is filled
    NoInformation,   ///< S cannot vary (every stratum has a zero margin or one group only)
    NotWholeCounts,  ///< some count is not a whole number (weighted data)
    TooLarge,        ///< above ExactLimits: not computed, asymptotic figures stand
};

/// "computed", "no information", "counts not whole", "too large".
std::string_view to_string(ExactStatus s);

/// The conditional distribution of S given the strata margins, at psi = 1.
struct ConditionalDistribution {
    long lo = 0, hi = -1;           ///< support of S (empty when hi < lo)
    std::vector<double> density;    ///< P(S = lo + i) at psi = 1, sums to 1
    double work = 0;                ///< multiply-adds the convolution took (or would take)
};

/// Builds the distribution by convolution unless it is above `limits` (density left empty and
/// status TooLarge then). Strata with a zero margin add nothing (their a_k is fixed).
ExactStatus conditional_distribution(const Strata& strata, const ExactLimits& limits,
                                     ConditionalDistribution& out);

struct ExactCommonOr {
    ExactStatus status = ExactStatus::NoInformation;
    double s = 0;                   ///< observed S = sum of a_k
    long lo = 0, hi = 0;            ///< support of S
    double p_two_sided = 0;         ///< NaN unless Computed (likewise every figure below)
    double p_greater = 0;           ///< P(S >= s | psi = 1)
    double p_less = 0;              ///< P(S <= s | psi = 1)
    double estimate = 0;            ///< conditional MLE of the common odds ratio
    Interval ci{};                  ///< exact 1 - alpha interval
    double support = 0;             ///< hi - lo + 1
    double work = 0;                ///< convolution multiply-adds
};

/// Exact conditional test of a common odds ratio of 1, conditional MLE and exact interval, as
/// R's mantelhaen.test(x, exact = TRUE, conf.level = 1 - alpha). Figures NaN unless Computed.
/// `with_estimate` false skips the MLE and the interval (left NaN): the p-values alone.
ExactCommonOr exact_common_odds_ratio(const Strata& strata, double alpha = 0.05,
                                      const ExactLimits& limits = {}, bool with_estimate = true);

/// Fisher's exact test of one 2 x 2 table with its conditional MLE and exact interval, as R's
/// fisher.test: exact_common_odds_ratio of the single stratum.
ExactCommonOr fisher_exact(const StratumCounts& s, double alpha = 0.05, const ExactLimits& limits = {});

/// True when every count is a whole number (within 1e-9) and not negative.
bool whole_counts(const Strata& strata);

}  // namespace foldline::stats
