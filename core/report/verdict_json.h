#pragma once
// A diagram's verdict on a finding, with the estimate that answers the question: the pooled
// figure, the finding's own stratified figure, or a standardisation over another observed set
// that the diagram names (computed here with the same engine, over the joint strata of that set).
#include <string>

#include <nlohmann/json.hpp>

#include "core/causal/verdict.h"
#include "core/scan/question.h"
#include "core/scan/rate_finding.h"
#include "core/scan/slope_scan.h"
#include "core/table/table.h"

namespace foldline::report {

/// The verdict object of a rate finding: causal::Verdict's JSON plus `adjusted_estimate`
/// {view: "pooled"|"stratified"|"standardised", over: [columns], measure: "risk_difference",
/// estimate, ci} — null when the effect is not identifiable by adjustment, or when the set to
/// standardise over has no stratum with both groups. `rows` are encode_rows(table, question) of
/// the question the finding answers.
nlohmann::json rate_verdict_json(const Table& table, const RowCells& rows,
                                 const RateFinding& finding, const causal::Verdict& verdict, double alpha);

/// The verdict object of a slope finding; the estimate is the pooled slope, the finding's
/// within slope, or the within slope over another set (measure "slope"), each adjusted for the
/// question's covariates when it has any; null as above.
nlohmann::json slope_verdict_json(const Table& table, const SlopeQuestion& question, const SlopeFinding& finding,
                                  const causal::Verdict& verdict);

}  // namespace foldline::report
