#pragma once
// A diagram's verdict on each finding, with the adjusted estimate it points to, computed once
// per finding with the audit's own settings. `foldline scan --diagram`, `foldline run`, the
// memo, the JSON and CSV documents and the workbench's diagram step all read these values; none
// of them decides a verdict or computes an estimate of its own.
#include <string>
#include <vector>

#include "core/causal/diagram.h"
#include "core/causal/verdict.h"
#include "core/common/error.h"
#include "core/scan/estimate_over.h"
#include "core/scan/scan_result.h"
#include "core/table/table.h"

namespace foldline::audit {

/// How the columns of a set a diagram names are cut (as the scan cut its candidates), and the
/// interval level: the audit's scan settings.
struct EstimateSettings {
    int bins = 4;
    std::size_t max_levels = 50;
    double alpha = 0.05;
};

/// The verdict on a rate finding of `result` (question and alpha from the result) and, for a
/// verdict pointing to another set, the difference standardised over that set computed on
/// `table` (null table: no estimate, estimate_problem says the rows are needed). Errors: the
/// diagram cannot judge the finding (a stratifier, the exposure or the outcome not in it).
/// A diagram lacking any of the finding's columns is an Error in core/causal/missing_columns's
/// words (judge and attach_verdicts), naming every missing column.
Result<FindingVerdict> rate_verdict(const causal::CausalGraph& graph, const ScanResult& result,
                                    const RateFinding& finding, const Table* table, const EstimateSettings& settings);

/// The same for a slope finding: the pooled, within or other set's within slope, each adjusted
/// for the trend's covariates when it has any.
Result<FindingVerdict> slope_verdict(const causal::CausalGraph& graph, const ScanResult& result,
                                     const SlopeFinding& finding, const Table* table, const EstimateSettings& settings);

/// The same for a mean-gap finding: the pooled (Welch) difference, the fixed-effects difference
/// within the finding's strata with its HC1 interval (the figure its class is decided on), or the fixed-effects
/// difference over the joint strata of another set (fixed_effects_gap_over), measure
/// "mean_difference" (of log y on the log scale).
Result<FindingVerdict> mean_verdict(const causal::CausalGraph& graph, const ScanResult& result,
                                    const MeanFinding& finding, const Table* table, const EstimateSettings& settings);

/// The verdict of `diagram` on the finding of `result` that compares `exposure` and `outcome`
/// stratified by `strata` (a rate finding of the result's question, first comparison with those
/// strata, a mean-gap finding of the result's groups and outcome, or a slope finding of
/// x = exposure, y = outcome), with its estimate as rate_verdict, mean_verdict and slope_verdict
/// give it. With no such finding (or no result: a diagram judged before any scan)
/// the verdict alone, without an estimate. Errors: an invalid diagram, or one that cannot judge.
Result<FindingVerdict> judge(const causal::Diagram& diagram, const std::string& exposure, const std::string& outcome,
                             const std::vector<std::string>& strata, const ScanResult* result, const Table* table,
                             const EstimateSettings& settings);

/// Fills every finding's `verdict` (or `verdict_problem`) under `diagram`. Returns the first
/// problem met (an invalid diagram, or a finding the diagram cannot judge), empty when none.
/// An empty diagram clears the verdicts and returns "".
std::string attach_verdicts(ScanResult& result, const Table* table, const causal::Diagram& diagram,
                            const EstimateSettings& settings);

/// The adjusted estimate over the joint strata of `set` for the result's question of `kind`: the
/// rate difference of comparison `comparison` standardised to the set's pooled mix, the mean
/// gap's fixed-effects difference of that comparison over the set's joint strata, or the trend's
/// (result.slope_question) within slope with one intercept per joint stratum. Errors: an empty
/// set, an unknown column, no rows (null table), no joint stratum informing it.
Result<EstimateOver> estimate_over_set(const ScanResult& result, FindingKind kind, const Table* table,
                                       const std::vector<std::string>& set, const EstimateSettings& settings,
                                       std::size_t comparison = 0);

}  // namespace foldline::audit
