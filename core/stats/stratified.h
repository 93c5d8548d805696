#pragma once
// Stratified 2 x 2 x K analysis from sufficient statistics (never rows).
//
// Stratum k: focal group a events, b non-events (n1 = a + b); reference group c events,
// d non-events (n0 = c + d); m1 = a + c, m0 = b + d, N = n1 + n0. Counts are doubles so weighted
// (pre-counted) data pass through unchanged.
//
// Sources:
//   Mantel-Haenszel OR: Mantel & Haenszel 1959 (JNCI 22:719); variance of ln OR_MH: Robins,
//     Breslow & Greenland 1986 (Biometrics 42:311).
//   MH RR and MH RD with their variances: Greenland & Robins 1985 (Biometrics 41:55); the RD
//     variance of Sato 1989 (Biometrics 45:1323) is reported beside it.
//   CMH test: reported both without and with a continuity correction. The corrected statistic
//     follows R's mantelhaen.test convention: 0.5 is subtracted from |delta| only when
//     |delta| >= 0.5 (statsmodels always subtracts it; the two agree whenever |delta| >= 0.5).
//     This is the only place where a 0.5 correction enters the stratified figures.
//   Breslow-Day homogeneity test (Breslow & Day 1980, IARC Sci. Publ. 32) with Tarone's
//     correction (Tarone 1985, Biometrika 72:91).
// Zero cells: the MH estimators need no correction (a stratum with a zero margin adds nothing to
// the sums); a stratum in which one group has no rows carries no information and callers drop it
// before calling (see StratumCounts::informative).
#include <cstddef>
#include <vector>

#include "core/stats/proportions.h"

namespace foldline::stats {

struct StratumCounts {
    double a = 0, b = 0, c = 0, d = 0;
    double n_focal() const { return a + b; }
    double n_reference() const { return c + d; }
    double total() const { return a + b + c + d; }
    /// Both groups have rows, so the stratum informs a comparison.
    bool informative() const { return a + b > 0 && c + d > 0; }
};

using Strata = std::vector<StratumCounts>;

/// Element-wise sum of all strata (the crude, pooled table). All zeros for no strata.
StratumCounts pooled(const Strata& strata);

struct Estimate {
    double estimate;   ///< point estimate (NaN when undefined)
    double se;         ///< standard error on the scale of the CI (log scale for ratios)
    Interval ci;       ///< 1 - alpha interval (NaN when undefined)
};

/// Mantel-Haenszel odds ratio with the Robins-Breslow-Greenland CI (on the log scale).
/// Estimate 0 or +inf when one of the sums is zero (CI NaN then); NaN when both are zero or no strata.
Estimate mh_odds_ratio(const Strata& strata, double alpha = 0.05);

/// Mantel-Haenszel risk ratio with the Greenland-Robins CI (log scale). NaN when undefined.
Estimate mh_risk_ratio(const Strata& strata, double alpha = 0.05);

struct RiskDifferenceMh {
    Estimate greenland_robins;  ///< MH RD with the Greenland-Robins 1985 variance (Wald CI)
    double se_sato;             ///< Sato 1989 standard error of the same MH RD
    Interval ci_sato;           ///< Wald CI from the Sato standard error
};

/// Mantel-Haenszel risk difference (weights n1 n0 / N). NaN figures when no informative stratum.
RiskDifferenceMh mh_risk_difference(const Strata& strata, double alpha = 0.05);

struct CmhTest {
    double delta;                ///< sum of (a - n1 m1 / N)
    double variance;             ///< sum of n1 n0 m1 m0 / (N^2 (N - 1))
    double z;                    ///< signed delta / sqrt(variance), uncorrected
    double statistic;            ///< delta^2 / variance (chi-square, 1 df), no correction
    double p;                    ///< its survival-function p-value
    double statistic_corrected;  ///< (|delta| - 0.5)^2 / variance when |delta| >= 0.5
    double p_corrected;
};

/// Cochran-Mantel-Haenszel test of no association. Strata with N < 2 add nothing. All NaN
/// when the variance is zero (no stratum with both groups and both outcomes).
CmhTest cmh_test(const Strata& strata);

struct BreslowDayTest {
    double statistic;          ///< Breslow-Day statistic
    double p;                  ///< chi-square survival p with df
    double statistic_tarone;   ///< with Tarone's correction
    double p_tarone;
    double df;                 ///< strata used - 1
    std::size_t strata_used;   ///< strata with both groups and both outcomes
};

/// Fitted focal-group events of one stratum under a common odds ratio psi (the Breslow-Day E: the
/// root in the stratum's range of the quadratic in the header comment of breslow_day); its
/// fitted cells are E, n1 - E, m1 - E, N - n1 - m1 + E. NaN when a margin is zero or psi is not
/// finite and positive.
double common_or_fitted_a(const StratumCounts& s, double psi);

/// Breslow-Day test of a common odds ratio psi (usually the MH OR) with Tarone's correction,
/// over the strata whose margins are all positive. NaN statistic and p when fewer than 2 strata
/// are usable or psi is not finite and positive.
BreslowDayTest breslow_day(const Strata& strata, double psi);

struct TwoByTwo {
    double rate_focal, rate_reference;  ///< NaN for a group with no rows
    Interval rate_focal_ci, rate_reference_ci;  ///< Wilson
    double rd;                           ///< rate_focal - rate_reference
    Interval rd_ci;                      ///< Newcombe hybrid score
    double rr;                           ///< risk ratio (0.5 added to each cell if one is zero)
    double odds_ratio;                   ///< odds ratio (0.5 added to each cell if one is zero)
    double selection_ratio;              ///< rate_focal / rate_reference (NaN if the latter is 0)
    double z;                            ///< signed single-table MH z (N - 1 form), NaN if undefined
};

/// Rates, differences and ratios of one 2 x 2 table. Rates NaN for a group without rows; the
/// risk and odds ratios add 0.5 to every cell (Haldane-Anscombe) only when a cell is zero;
/// selection ratio NaN when the reference rate is 0 or undefined.
TwoByTwo two_by_two(const StratumCounts& s, double alpha = 0.05);

}  // namespace foldline::stats
