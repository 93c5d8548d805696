#pragma once
// The mean gap: a numeric outcome y compared between a focal and a reference group, pooled and
// within strata. Every figure comes from per-cell sufficient statistics (stratum × group: Σw,
// weighted mean, centred sum of squares), never from rows, so cells counted elsewhere (another
// thread, a pre-counted file, a database's GROUP BY) give the same answers.
//
// Weights are frequency weights: a cell of Σw = 3 is three observations, so a pre-counted table
// and the rows it was counted from give the same figures.
//
// Sources: Welch (1947, Biometrika 34:28) and Satterthwaite (1946) for the unequal-variance
// interval and test; the fixed-effects coefficient and its classical and HC1 (MacKinnon & White
// 1985) standard errors are those of OLS of y on a group indicator plus stratum indicators;
// Cochran (1954, Biometrics 10:101) Q; the symmetric two-factor decomposition of Das Gupta
// (1993) as in core/stats/decomposition.h.
#include <cstddef>
#include <string>
#include <vector>

#include "core/stats/decomposition.h"

namespace foldline::stats {

/// Weighted moments of one variable about its mean. A default value is empty (w == 0). The
/// mean is held as origin + offset (the origin being the first value folded in), so deviations
/// keep their digits when the values are large and their spread small (see core/stats/moments.h).
struct MeanMoments {
    double rows = 0;  ///< rows folded in (unweighted count)
    double w = 0;     ///< Σ weights: the number of observations
    double y0 = 0;    ///< origin
    double dy = 0;    ///< weighted mean minus y0
    double css = 0;   ///< Σ w (y − ȳ)²

    /// Weighted mean; NaN when empty.
    double mean() const;
    /// Sample variance css / (w − 1); NaN when w <= 1.
    double variance() const;
    /// True when nothing has been folded in.
    bool empty() const { return !(w > 0); }

    /// Folds in one value (West 1979 weighted update). A weight <= 0 or NaN, or a NaN or infinite
    /// value, leaves the moments unchanged.
    void add(double y, double weight = 1.0);
    /// Exact pairwise merge (Chan, Golub & LeVeque 1979). Merging an empty summary only adds
    /// its row count.
    void merge(const MeanMoments& other);
    /// Summary from figures computed elsewhere; empty when w <= 0 or mean is not finite (css
    /// below 0 is taken as 0).
    static MeanMoments from_mean(double rows, double w, double mean, double css);
};

/// The two cells of one stratum.
struct MeanStratumCells {
    MeanMoments focal;
    MeanMoments reference;
    /// Both groups have observations: the stratum informs the adjusted figures.
    bool informative() const { return !focal.empty() && !reference.empty(); }
};

/// One entry per stratum (order is the caller's).
using MeanCells = std::vector<MeanStratumCells>;

/// Accumulates MeanCells from rows: stratum code k (< strata), group (focal or reference).
class MeanCellBuilder {
public:
    explicit MeanCellBuilder(std::size_t strata) : cells_(strata) {}
    /// Adds one row; k >= strata, a NaN value or a weight <= 0 is ignored.
    void add(std::size_t k, bool focal, double y, double weight = 1.0);
    const MeanCells& cells() const { return cells_; }

private:
    MeanCells cells_;
};

/// A point estimate with its standard error, interval and test.
struct GapEstimate {
    double estimate;  ///< NaN when undefined
    double se;        ///< NaN when undefined
    double ci_low, ci_high;
    double df;        ///< degrees of freedom of the t reference; +inf for a normal one
    double stat;      ///< estimate / se (t or z)
    double p;         ///< two-sided
};

/// Mean of one group with its t interval (df = w − 1).
struct GroupMean {
    double n;         ///< Σ w
    double mean, sd;  ///< NaN when undefined (sd needs n > 1)
    double ci_low, ci_high;
};

/// Mean of a group with the t interval mean ± t(1 − α/2, n − 1) sd / √n. Mean NaN when empty;
/// sd and interval NaN when n <= 1 or alpha outside (0, 1); a zero sd gives a zero-width interval.
GroupMean group_mean(const MeanMoments& m, double alpha = 0.05);

/// Welch's difference focal − reference: SE √(s1²/n1 + s0²/n0), Welch–Satterthwaite df, t
/// interval and two-sided t test. Estimate NaN when a group is empty; SE, df, interval, t and p
/// NaN when a group has n <= 1 or the SE is 0.
GapEstimate welch_difference(const MeanMoments& focal, const MeanMoments& reference, double alpha = 0.05);

/// One-sided upper tail P(T_df > t) converted to the standard normal z with the same upper tail
/// (z = Φ⁻¹(1 − P)), keeping t's sign: lets a t test enter the normal-scale class rules.
/// NaN for NaN t or df <= 0; ±inf when the tail underflows.
double t_to_z(double t, double df);

/// Pooled figures of the two groups over all strata.
struct CrudeMeans {
    GroupMean focal, reference;
    GapEstimate difference;  ///< Welch
    double ratio;            ///< focal mean / reference mean; NaN when the reference mean is 0
};

/// Crude (pooled) means, Welch difference and ratio of means; NaN figures for an empty group.
CrudeMeans crude_means(const MeanCells& cells, double alpha = 0.05);

/// Fixed-effects (within-strata) difference: the group coefficient of OLS of y on a group
/// indicator and one indicator per informative stratum, with its classical and HC1 SEs.
struct FixedEffectsGap {
    double estimate;       ///< Σ h_k d_k / Σ h_k, h_k = n1k n0k / nk
    double se;             ///< classical: √(σ² / Σ h_k), σ² = RSS / df
    double se_hc1;         ///< HC1 heteroskedasticity-robust
    double df;             ///< N − K − 1 (N observations and K strata, informative only)
    double rss;            ///< residual sum of squares of the additive model
    GapEstimate classical; ///< t interval and test on the classical SE (df above)
    GapEstimate robust;    ///< t interval and test on the HC1 SE (df above)
    std::size_t strata;    ///< informative strata used
};

/// Estimate NaN when no stratum is informative; SEs NaN when df <= 0 (or, for HC1, when the
/// meat is 0 — every residual zero); a zero classical σ² gives SE 0 and NaN test figures.
FixedEffectsGap fixed_effects_difference(const MeanCells& cells, double alpha = 0.05);

/// Directly standardised difference Σ s_k d_k with s_k the pooled share (Σw, both groups) of
/// stratum k among informative strata; SE √Σ s_k² (s1k²/n1k + s0k²/n0k) with the standard
/// taken as fixed, normal interval and test.
/// Estimate NaN when no stratum is informative; SE NaN when any informative cell has n <= 1.
GapEstimate standardised_difference(const MeanCells& cells, double alpha = 0.05);

/// F test of the group × stratum interaction: the additive model (group + strata) against the
/// full cell-means model, informative strata only. F = [ΔRSS / (K − 1)] / [RSS_full / (N − 2K)].
struct InteractionTest {
    double f, df1, df2, p;  ///< NaN when K < 2, N − 2K <= 0 or RSS_full == 0
};

/// The interaction F test; all NaN (df set when known) under the conditions above.
InteractionTest interaction_f_test(const MeanCells& cells);

/// Cochran's Q of the per-stratum Welch differences with inverse-variance weights 1/(s1²/n1 +
/// s0²/n0); strata whose variance is undefined or 0 are left out.
struct CochranQ {
    double q, df, p;       ///< NaN when fewer than 2 strata enter
    double pooled;         ///< the inverse-variance weighted mean difference (NaN when none enter)
    double i_squared;      ///< max(0, (Q − df) / Q); NaN when Q is 0 or undefined
    std::size_t strata;    ///< strata that entered
};

/// Cochran's Q; figures NaN as stated above.
CochranQ cochran_q(const MeanCells& cells);

/// Exact split of the crude difference M1 − M0 into a within part Σ (c1k + c0k)/2 (m1k − m0k)
/// and a composition part Σ (m1k + m0k)/2 (c1k − c0k), c_gk = n_gk / n_g. A stratum where one
/// group is absent gets that group's mean set to the other group's (its within part is 0 and
/// the identity stays exact), as decompose_crude_rd does for rates. All NaN when a group is
/// empty.
Decomposition decompose_crude_mean_gap(const MeanCells& cells);

}  // namespace foldline::stats
