#pragma once
// Pay-gap reporting conventions beside a mean-gap finding: the gap as a percentage of the
// reference group's mean, the median gap beside the mean gap, and each stratum ("category of
// workers") whose gap reaches a threshold flagged.
//
// Source (from memory; check the text before relying on it): Directive (EU) 2023/970 on pay
// transparency. Article 3(1)(c) defines the gender pay gap as the difference of average pay
// levels between female and male workers expressed as a percentage of the average pay level
// of male workers; Article 9 asks for the mean and the median gap; Article 10(1) asks for a
// joint pay assessment when a category of workers shows a difference in average pay level of
// at least 5% that the employer has not justified by objective, gender-neutral criteria (nor
// remedied within six months). Here the reference group plays the directive's "male workers".
//
// All figures are on the outcome's own scale (also under --log-outcome). A flag is a
// statistical screen, not a legal determination under equal-pay law: defer to counsel.
#include <string>
#include <vector>

#include "core/stats/mean_gap.h"

namespace foldline {

/// (reference − focal) / reference × 100: positive when the focal group's figure is lower.
/// NaN when the reference figure is 0 or either is NaN.
double gap_percent(double focal, double reference);

struct PayGapStratum {
    std::string level;
    double mean_focal = 0, mean_reference = 0, mean_gap_percent = 0;        ///< NaN when a group is absent
    double median_focal = 0, median_reference = 0, median_gap_percent = 0;  ///< NaN when a group is absent
    bool informative = false;         ///< both groups present
    bool reaches_threshold = false;   ///< informative and |mean_gap_percent| >= threshold
};

struct PayGap {
    bool computed = false;            ///< false: not asked for (figures unset)
    double threshold_percent = 5;     ///< Directive (EU) 2023/970, Article 10(1) (from memory)
    double mean_focal = 0, mean_reference = 0, mean_gap_percent = 0;
    double median_focal = 0, median_reference = 0, median_gap_percent = 0;
    std::vector<PayGapStratum> strata;         ///< one per row of the finding's strata table
    std::vector<std::string> flagged;          ///< levels of strata that reach the threshold
};

/// Figures from raw-scale cells (their means) and per-cell medians computed from the rows.
/// `levels[k]` labels cells[k]; `median_focal[k]` / `median_reference[k]` are NaN for an empty
/// cell; `pooled_median_*` the medians of each group over every stratum. Strata with no rows in
/// either group are skipped (as in the finding's strata table).
PayGap pay_gap(const stats::MeanCells& raw_cells, const std::vector<std::string>& levels,
               const std::vector<double>& median_focal, const std::vector<double>& median_reference,
               double pooled_median_focal, double pooled_median_reference, double threshold_percent = 5);

}  // namespace foldline
