#pragma once
// Straight-line regression figures computed from moment summaries (core/stats/moments.h):
// pooled and per-stratum OLS slopes, the within-stratum (fixed-effects) slope, the
// precision-weighted mean of stratum slopes, the F-test of equal slopes, and slopes adjusted
// for covariates. Weights are frequency weights: a row of weight w counts as w identical
// observations, so a pre-counted table gives the same figures as the rows it was counted from,
// and every degree of freedom is counted in observations (Σw), not in rows.
//
// The one figure that is not a function of the moments is the HC3 robust standard error: it
// needs each row's leverage, so hc3_slope_se makes its own pass over the rows.
#include "core/stats/moments.h"

#include <cstddef>
#include <string>
#include <vector>

namespace foldline {

/// A slope (or any coefficient) with its classical standard error and a two-sided t interval.
struct SlopeEstimate {
    double slope = 0;      ///< NaN when undefined
    double se = 0;         ///< NaN when undefined (df <= 0)
    double ci_low = 0;     ///< NaN when se is NaN
    double ci_high = 0;
    double df = 0;         ///< residual degrees of freedom
    double p = 0;          ///< two-sided p of slope == 0 (Student t); NaN when se is NaN;
                           ///< 0 when se is 0 and the slope is not
};

/// Straight-line fit of y on x from one summary.
struct LineFit {
    double n = 0;          ///< observations (Σw)
    double rows = 0;
    double intercept = 0;  ///< NaN when the slope is undefined
    SlopeEstimate slope;
    double r = 0;          ///< Pearson r; NaN when x or y has no spread
    double r_ci_low = 0;   ///< Fisher-z interval (normal quantile); NaN when n <= 3 or |r| == 1
    double r_ci_high = 0;
    bool informative = false;  ///< n >= 3 and x has spread
    std::string reason;        ///< why not informative ("fewer than 3 rows", "no spread in x")
};

/// OLS of y on x with intercept at confidence 1 − alpha. Empty summary: n 0, every figure NaN,
/// informative false. n < 3 or no spread in x: uninformative; the slope is still given when x
/// has spread (n == 2), with NaN SE.
LineFit fit_line(const BivariateMoments& m, double alpha = 0.05);

/// True when x has no spread in m (Σw(x−x̄)² is 0 or below rounding of the mean).
bool no_spread_in_x(const BivariateMoments& m);

/// HC3 heteroskedasticity-robust SE of the pooled slope (MacKinnon & White 1985), from a pass
/// over the rows: Σ w_i x̃_i² e_i² / (1 − h_i)² / Sxx², h_i = 1/W + x̃_i²/Sxx, with the fit in
/// `pooled` (the summary of exactly the rows passed). Rows where keep is given and false, or
/// where x or y is NaN, are skipped. weights may be null (all 1). NaN when Sxx is 0, W < 3, or
/// some used row has leverage 1.
double hc3_slope_se(const double* x, const double* y, const double* weights,
                    const unsigned char* keep, std::size_t n, const BivariateMoments& pooled);

/// Within-stratum (fixed-effects) slope: OLS of y on x with one intercept per non-empty
/// stratum. slope = ΣSxy_k / ΣSxx_k, df = W − K − 1 with K the non-empty strata. NaN slope
/// when ΣSxx_k is 0; NaN SE when df <= 0. `strata` is the number of non-empty strata.
struct WithinFit {
    SlopeEstimate slope;
    std::size_t strata = 0;
    double n = 0;
};
WithinFit fit_within(const std::vector<BivariateMoments>& strata, double alpha = 0.05);

/// Inverse-variance (precision) weighted mean of per-stratum slopes, over strata that are
/// informative with a finite, positive SE; its SE is 1/√Σ(1/SE²) and its interval normal.
/// `strata` counts the slopes used; with none, every figure is NaN.
struct PrecisionWeightedSlope {
    double slope = 0, se = 0, ci_low = 0, ci_high = 0;
    std::size_t strata = 0;
};
PrecisionWeightedSlope precision_weighted_slope(const std::vector<LineFit>& fits,
                                                double alpha = 0.05);

/// F-test that every stratum has the same slope (the stratum × x interaction in a model with
/// one intercept per stratum): F = [(RSS_common − RSS_separate)/(J − 1)] / [RSS_separate/(W −
/// K − J)], with K non-empty strata and J of them with spread in x. NaN statistic and p when
/// J < 2, the denominator df <= 0, or RSS_separate is 0.
struct EqualSlopesTest {
    double f = 0, df1 = 0, df2 = 0, p = 0;
};
EqualSlopesTest equal_slopes_test(const std::vector<BivariateMoments>& strata);

/// Slope of y on x adjusted for covariates, from a MomentMatrix with z = (x, c1..cp, y):
/// OLS with intercept, solved by a pivoted LDLT of the correlation-scaled cross-product block
/// (never an explicit inverse). df = W − p − 2. NaN slope when the design is singular
/// (a covariate constant or collinear with x).
SlopeEstimate fit_adjusted(const MomentMatrix& m, double alpha = 0.05);

/// The same with one intercept per non-empty stratum: the cross-products are summed over
/// strata and df = W − K − p − 1. NaN when singular or no stratum is non-empty.
SlopeEstimate fit_adjusted_within(const std::vector<MomentMatrix>& strata, double alpha = 0.05);

/// Two-sided t-interval and p for an estimate with standard error and df. NaN-safe: a NaN or
/// non-positive se or df gives NaN interval and p.
SlopeEstimate make_estimate(double slope, double se, double df, double alpha);

/// One-sided p-value for H1: the true slope lies on side `sign` (+1 above 0, −1 below), Student
/// t with df. NaN when se or df is not positive or anything is NaN.
double one_sided_p(double slope, double se, double df, int sign);

}  // namespace foldline
