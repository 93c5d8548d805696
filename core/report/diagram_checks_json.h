#pragma once
// JSON form of the diagram's checks against the data (core/causal/diagram_check.h), the
// "diagram_checks" object of `foldline scan --diagram` and `foldline adjust --data`:
//   {"alpha", "tested", "contradicted", "claims": [{"a", "b", "given", "form", "unobserved",
//    "method", "statistic", "df", "p", "q", "n", "partial_r", "contradicted", "note", "sentence"}]}
// Undefined numbers are null (untestable claims have method "none" and null figures).
#include <nlohmann/json.hpp>

#include "core/causal/diagram_check.h"

namespace foldline::report {

nlohmann::json to_json(const causal::DiagramChecks& checks);

}  // namespace foldline::report
