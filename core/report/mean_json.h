#pragma once
// JSON form of mean-gap findings (kind "mean") — part of the published `foldline scan` JSON.
// Every undefined figure (NaN, ±inf) is written as null; an interval is a two-element array
// [low, high]. Differences are focal − reference on the analysed scale (log(y) when the
// question's log_outcome is set, with the exp(d) − 1 percentages beside them).
#include <nlohmann/json.hpp>

#include "core/scan/mean_finding.h"
#include "core/scan/scan_result.h"

namespace foldline {

/// {"kind": "mean", "strata", "class", "reversal", "p_reversal", "q_value", "stability",
/// "outcome", "focal", "reference", "log_outcome", "n", "crude" {focal, reference, difference,
/// ratio}, "fixed_effects" {estimate, se, se_hc1, df, ci, ci_hc1, p, p_hc1}, "standardised",
/// "interaction", "cochran_q", "decomposition", "sensitivity", "percent" (log outcome only),
/// "pay_gap" (when asked), "strata_table" [...], "uninformative"}. Never fails.
nlohmann::json to_json(const MeanFinding& f);

/// The "mean_question" object of a mean scan ({outcome, log_outcome, pay_gap}); null when the
/// result holds no mean-gap findings.
nlohmann::json mean_question_json(const ScanResult& r);

}  // namespace foldline
