#pragma once
// JSON form of a finding's verdict (core/audit/verdicts.h computes it): causal::Verdict's JSON
// (core/report/causal_json.h) plus `adjusted_estimate` {view: "pooled"|"stratified"|
// "standardised", over: [columns], measure: "risk_difference"|"slope", estimate, ci} — null when
// the effect is not identifiable by adjustment or the estimate is undefined — and, when an
// estimate over another set could not be computed, `estimate_problem` saying why.
#include <nlohmann/json.hpp>

#include "core/scan/finding.h"

namespace foldline::report {

/// The verdict object of any finding.
nlohmann::json verdict_to_json(const FindingVerdict& verdict);

}  // namespace foldline::report
