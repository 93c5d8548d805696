#pragma once
// The adjusted estimate over any set of columns a causal diagram names: the rate comparison
// standardised to the pooled mix of the set's joint strata, or the trend's within slope with one
// intercept per joint stratum. Called only through core/audit/verdicts.h, which every verdict
// (`scan --diagram`, `run`, the memo, the workbench's Diagram step) goes through, so all quote
// one number.
#include <cstddef>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/scan/question.h"
#include "core/scan/slope_scan.h"
#include "core/table/table.h"

namespace foldline {

struct EstimateOver {
    std::vector<std::string> over;  ///< the set, as given
    double estimate = 0;            ///< NaN when undefined (see each function)
    double ci_low = 0, ci_high = 0; ///< NaN when undefined
    std::size_t strata = 0;         ///< joint strata with rows (rates: with both groups)
};

/// The risk difference of comparison `comparison` (0-based, as in RateFinding::comparison) of the
/// question encoded in `rows` (encode_rows), directly standardised over the joint strata of `set`
/// (core/stats/standardize.h; Wald interval at level 1 - alpha). Numeric columns are cut as the
/// scan cuts them (`bins`, `max_levels`); rows missing any column of the set are left out. An
/// empty set gives the pooled difference over one stratum. NaN estimate when no joint stratum
/// holds both groups. Errors: those of joint_stratifier (unknown column, too many joint levels).
Result<EstimateOver> standardised_rd_over(const Table& table, const RowCells& rows, const std::vector<std::string>& set,
                                          std::size_t comparison, double alpha = 0.05, int bins = 4,
                                          std::size_t max_levels = 50);

/// The within-stratum slope of `question` (y on x, its covariates honoured) with one intercept per
/// joint stratum of `set`, and its interval. Empty set → one stratum: the pooled slope. NaN when
/// the slope is undefined (no spread in x within any stratum). Errors: those of joint_stratifier
/// and check_slope (x, y or a covariate missing or not numeric, no usable rows).
Result<EstimateOver> within_slope_over(const Table& table, const SlopeQuestion& question,
                                       const std::vector<std::string>& set, int bins = 4,
                                       std::size_t max_levels = 50);

/// The mean-gap difference of comparison `comparison` (0-based, as in MeanFinding::comparison) of
/// the groups in `groups` (resolve_groups; outcome_column names the numeric outcome) with one
/// level per joint stratum of `set`: the fixed-effects (within-strata) difference, i.e. the group
/// coefficient of OLS of y (log y when `log_outcome`) on the group indicator plus joint-stratum
/// indicators, with its HC1 t interval at level 1 - alpha as the scan's class uses it
/// (core/stats/mean_gap.h). Rows
/// missing the outcome, the group or any column of the set, with a weight <= 0 or (log scale)
/// with y <= 0 are left out. NaN estimate when no joint stratum holds both groups. Errors: those
/// of joint_stratifier, an outcome that is not numeric.
Result<EstimateOver> fixed_effects_gap_over(const Table& table, const Question& groups, bool log_outcome,
                                            const std::vector<std::string>& set, std::size_t comparison,
                                            double alpha = 0.05, int bins = 4, std::size_t max_levels = 50);

}  // namespace foldline
