#pragma once
// JSON form of the causal results, the shape `foldline adjust --json` writes and the scan's
// per-finding "verdict" object uses:
//   roles:    [{"name", "role", "observed"}]
//   verdict:  {"answer", "exposure", "outcome", "stratifier", "stratifier_roles",
//              "stratifier_valid", "empty_set_valid", "valid_sets", "standardise_over"
//              (null when not identifiable), "unobserved_needed", "roles", "reason",
//              "direct_effect": {"applies", "mediators", "identifiable", "stratifier_suffices",
//                                "conditioning_set", "extra_sets", "reason"}}
//   adjust:   {"exposure", "outcome", "roles", "empty_set_valid", "minimal_sets", "truncated",
//              "smallest" (null when none), "identifiable", "unobserved_needed",
//              "outcome_causes_exposure", "summary"}
#include <vector>

#include <nlohmann/json.hpp>

#include "core/causal/verdict.h"

namespace foldline::report {

/// Roles as a list in the given order; empty list → [].
nlohmann::json roles_to_json(const std::vector<causal::NamedRole>& roles);
/// A verdict; an empty stratifier gives "stratifier": [].
nlohmann::json to_json(const causal::Verdict& v);
/// The adjustment report of `foldline adjust`.
nlohmann::json to_json(const causal::AdjustmentReport& r);

}  // namespace foldline::report
