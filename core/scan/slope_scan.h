#pragma once
// The slope scan: is the pooled trend of a numeric outcome y on a numeric exposure x reversed,
// explained, masked or split by a stratifier (or a pair of them)?
//
// One pass over the rows (shared by a batch of checks) builds each check's per-stratum moment
// sums (core/stats/moments.h); every figure of a finding is computed from those, except the
// HC3 robust SE of the pooled slope, which needs row leverages and is computed once per scan
// in its own pass. Rows are used when x, y and every covariate are present and the row weight
// is positive; a missing stratifier cell is a stratum of its own, labelled "(missing)", so
// every check of a scan compares the same rows and the pooled figures are identical across
// the scan.
//
// Classification (alpha = SlopeQuestion::alpha; "significant" = two-sided Student t p <= alpha
// on the classical SE; with covariates the adjusted pooled and within slopes are used, while
// the stratum slopes and the equal-slopes test stay unadjusted):
//   reversal      the pooled and the within slope lie significantly on opposite sides of zero:
//                 intersection-union test, p_reversal = the larger of the two one-sided p-values
//                 (pooled in its own direction, within in the opposite one) <= alpha, and, once
//                 q_value is filled (apply_fdr), q_value <= alpha as well;
//   heterogeneous at least one stratum slope is significantly positive and one significantly
//                 negative, and the F-test of equal slopes rejects;
//   explained     the pooled slope is significant, the within slope is not;
//   masked        the pooled slope is not significant, the within slope is;
//   stable        none of these. The rules are tried in this order.
// A 0/1 outcome is analysed as a linear probability model (flagged in the finding).
// Stability (SlopeQuestion::bootstrap > 0) is computed for findings that are not stable.
#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/scan/candidates.h"
#include "core/scan/finding.h"
#include "core/stats/regression.h"
#include "core/table/table.h"

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace foldline {

struct SlopeQuestion {
    std::string x;                        ///< numeric exposure column
    std::string y;                        ///< numeric outcome column
    std::vector<std::string> covariates;  ///< numeric columns to adjust for (may be empty)
    double alpha = 0.05;
    int bootstrap = 0;                    ///< resamples for stability; 0 = none
    std::uint64_t seed = 1;
    unsigned threads = 0;                 ///< threads sharing a scan's checks (0 = hardware concurrency)
};

/// One stratum of a check.
struct SlopeGroup {
    std::string level;                ///< label; a pair's labels joined by " / "
    std::vector<std::string> levels;  ///< one label per stratifier ("(missing)" for empty cells)
    std::size_t code = 0;             ///< stratum code: c1 × (levels2 + 1) + c2 for a pair
    double n = 0;                     ///< observations (Σ weights)
    double rows = 0;
    double slope = 0, se = 0, ci_low = 0, ci_high = 0, p = 0, r = 0;  ///< NaN when undefined
    bool informative = false;         ///< n >= 3 and spread in x
    std::string reason;               ///< why not informative
};

struct PooledSlope {
    double slope = 0, ci_low = 0, ci_high = 0, se = 0, p = 0, df = 0;
    double se_robust = 0;             ///< HC3 SE of this (unadjusted) slope; NaN when undefined
    double r = 0, r_ci_low = 0, r_ci_high = 0;
    double n = 0;
};

struct WithinSlope {
    double slope = 0, ci_low = 0, ci_high = 0, se = 0, p = 0, df = 0;
    std::size_t strata = 0;                  ///< non-empty strata (intercepts)
    PrecisionWeightedSlope precision_weighted;  ///< inverse-variance mean of informative strata
};

/// A trend check stratified by one column or a pair (the shared part in FindingHeader: strata,
/// class, p_reversal, q_value, stability {share, draws}, verdict).
struct SlopeFinding : FindingHeader {
    SlopeFinding() { kind = FindingKind::Slope; }
    std::string x, y;
    std::vector<std::string> covariates;
    bool reversal = false;
    std::array<int, 5> draws_by_class{};  ///< resamples per class, indexed by rank(FindingClass)
    PooledSlope pooled;      ///< unadjusted
    WithinSlope within;      ///< unadjusted
    bool adjusted = false;   ///< covariates given: the two figures below drive the class
    SlopeEstimate adjusted_pooled;
    SlopeEstimate adjusted_within;
    EqualSlopesTest equal_slopes;
    bool linear_probability = false;  ///< y is 0/1: slopes are differences in probability
    std::vector<SlopeGroup> groups;   ///< non-empty strata, in code order
    std::vector<std::string> uninformative;  ///< labels of groups with informative == false
    double rows_used = 0;
    double n = 0;            ///< observations used (Σ weights)
};

/// The class of a finding from its figures at level alpha, honouring q_value when it is not
/// NaN. Also sets reversal and p_reversal. Undefined slopes (NaN) count as not significant.
FindingClass classify(SlopeFinding& f, double alpha);

/// One check: y on x stratified by the joint levels of `strata` (1 or 2 categorical columns of
/// `table`'s length). Errors: x or y missing or not numeric, a covariate missing or not
/// numeric, a stratifier of the wrong length or type, no usable rows, too many joint strata
/// (> 1,048,576), cancellation. q_value is NaN.
Result<SlopeFinding> check_slope(const Table& table, const SlopeQuestion& q,
                                 const std::vector<const Column*>& strata, const Work& work = {});

/// The same over the stratifiers chosen by select_candidates (core/scan/candidates.h).
Result<std::vector<SlopeFinding>> scan_slopes(const Table& table, const SlopeQuestion& q,
                                              const CandidateSet& candidates, bool pairs,
                                              const Work& work = {});

/// One check from per-stratum moments computed elsewhere (a database's GROUP BY): `strata[k]`
/// summarises the rows with code k of the stratifier (k == levels.size(): the "(missing)"
/// stratum; an empty summary is no group), `pooled` every row used, `hc3` the pooled slope's
/// robust SE (NaN when unknown). Covariates of `q` are ignored. Gives the finding check_slope
/// gives for rows with these moments (q_value NaN, no stability); no strata: no groups and an
/// undefined within slope.
SlopeFinding slope_finding_from_moments(const SlopeQuestion& q, const std::string& stratifier,
                                        const std::vector<std::string>& levels,
                                        const std::vector<BivariateMoments>& strata,
                                        const BivariateMoments& pooled, double hc3,
                                        bool linear_probability);

/// Every check for a candidate list: each candidate alone and, if `pairs`, every pair (i < j),
/// singles first, in candidate order. q-values are left NaN for the caller. An empty candidate
/// list gives an empty vector. Errors as for check_slope. Bootstrap stability, when asked for,
/// costs O(bootstrap × rows) per finding that is not stable.
Result<std::vector<SlopeFinding>> scan_slopes(const Table& table, const SlopeQuestion& q,
                                              const std::vector<const Column*>& candidates,
                                              bool pairs, const Work& work = {});

/// A Gaussian-mixture component of the (x, y) cloud.
struct LatentComponent {
    double weight = 0;        ///< mixing proportion
    double n = 0;             ///< expected observations (weight × rows fitted)
    double mean_x = 0, mean_y = 0;
    double sd_x = 0, sd_y = 0, correlation = 0;
    double slope = 0;         ///< cov(x, y) / var(x) within the component; NaN if var(x) is 0
};

/// Hidden-group hint: mixtures with 1..6 components fitted to (x, y), chosen by BIC.
struct LatentFinding {
    std::string x, y;
    std::size_t rows_used = 0;     ///< rows with both values present
    std::size_t rows_fitted = 0;   ///< after the seeded subsample (see core/stats/mixture.h)
    std::uint64_t seed = 0;
    std::vector<double> bic;       ///< index k−1 for k components; NaN where a fit failed
    int k = 0;                     ///< chosen number of components (0 when nothing fitted)
    std::vector<LatentComponent> components;
    double pooled_slope = 0;       ///< OLS slope over the rows used
    bool opposite = false;         ///< k >= 2 and every component slope has the pooled's opposite sign
    std::string note;              ///< plain-words hint; never a statement about a real group
};

/// Fits the mixtures and reports the chosen one. Rows are weighted by nothing (weights of a
/// pre-counted table are ignored: each row is one point). Errors: x or y missing or not
/// numeric, fewer than 12 usable rows, cancellation.
Result<LatentFinding> find_groups(const Table& table, const SlopeQuestion& q, std::uint64_t seed,
                                  const Work& work = {});

}  // namespace foldline
