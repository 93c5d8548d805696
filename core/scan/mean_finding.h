#pragma once
// Plain result structs of a mean-gap question (a numeric outcome compared between a focal and a
// reference group, pooled and within strata): what tables, the memo and the JSON will read. No
// behaviour beyond small helpers; every figure is filled by analyse_mean_strata
// (core/scan/mean_analysis.h) from per-cell sufficient statistics (core/stats/mean_gap.h).
//
// Pay and clinical endpoints are typical outcomes: a view that renders these findings carries
// the caution that they are a statistical screen, not a legal or clinical determination.
#include <cstddef>
#include <string>
#include <vector>

#include "core/scan/classify.h"
#include "core/scan/finding.h"
#include "core/scan/pay_gap.h"
#include "core/stats/evalue.h"
#include "core/stats/decomposition.h"
#include "core/stats/mean_gap.h"

namespace foldline {

/// One stratum of a mean-gap comparison.
struct MeanStratumRow {
    std::string level;                     ///< "G3" or, for a pair, "G3 | north"
    std::vector<std::string> levels;       ///< one label per stratifier
    stats::GroupMean focal, reference;     ///< n (Σw), mean, SD, t interval; NaN for an absent group
    stats::GapEstimate difference;         ///< focal − reference with Welch's interval and test
    double share = 0;                      ///< stratum's share of all observations in the comparison
    double share_focal = 0, share_reference = 0;  ///< stratum's share within each group
    bool informative = true;               ///< both groups have observations
    std::string reason;                    ///< why not informative ("no focal rows"), else empty
};

/// A difference on the log scale read as a percentage: exp(d) − 1 (interval likewise).
struct PercentGap {
    double estimate = 0, ci_low = 0, ci_high = 0;  ///< NaN when undefined
};

/// The E-value of the fixed-effects difference as a standardised mean difference.
struct MeanSensitivity {
    double smd = 0;     ///< fixed-effects difference / residual SD of the additive model
    double smd_se = 0;  ///< classical SE of the difference / the same SD
    stats::SmdEValue e; ///< VanderWeele & Ding's conversion (core/stats/evalue.h)
};

/// A mean-gap comparison stratified by one column or a pair (the shared part in FindingHeader:
/// strata, class, p_reversal, q_value, stability, verdict).
struct MeanFinding : FindingHeader {
    MeanFinding() { kind = FindingKind::Mean; }
    std::string outcome;                   ///< the numeric outcome column
    std::string focal, reference;          ///< the two groups compared (focal − reference)
    std::size_t comparison = 0;            ///< index of the focal group among the question's
    bool log_outcome = false;              ///< figures are of log(y): differences are log ratios
    double rows_used = 0;                  ///< observations (Σw) in the comparison with known strata

    stats::CrudeMeans crude;               ///< pooled means, Welch difference, ratio of means
    stats::FixedEffectsGap fixed_effects;  ///< within-strata difference (classical and HC1 SEs)
    stats::GapEstimate standardised;       ///< standard: pooled mix of the informative strata
    stats::InteractionTest interaction;    ///< group × stratum F test: the homogeneity test of the class
    stats::CochranQ cochran_q;             ///< of the per-stratum Welch differences
    stats::Decomposition decomposition;    ///< within / composition split of the crude difference

    MeanSensitivity sensitivity;           ///< E-value of the fixed-effects difference
    PercentGap crude_percent, fixed_effects_percent, standardised_percent;  ///< log outcome only: exp(d) − 1
    PayGap pay_gap;                        ///< pay-gap conventions, when asked for (computed flag)

    std::vector<MeanStratumRow> strata_table;
    std::vector<std::string> uninformative;  ///< labels of strata left out of the adjusted figures
    std::size_t informative_strata = 0;
    bool strata_disagree = false;          ///< informative strata with differences of both signs

    bool direction_flip = false;           ///< fixed-effects difference on the other side of 0
    double change = 0;                     ///< |crude − fixed-effects difference|, for ranking
    ClassInputs class_inputs{};            ///< what the class was decided from (kept to re-decide)

    bool reversal() const { return cls == FindingClass::Reversal; }
};

}  // namespace foldline
