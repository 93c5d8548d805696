#pragma once
// JSON form of slope findings (kind "slope") and hidden-group hints (kind "latent") — part of
// the published `foldline scan` JSON. Every undefined figure (NaN, ±inf) is written as null;
// an interval is a two-element array [low, high].
#include "core/report/scan_json.h"
#include "core/scan/slope_scan.h"

#include <nlohmann/json.hpp>

namespace foldline {

/// {"kind": "slope", "strata", "class", "reversal", "p_reversal", "q_value", "stability",
/// "pooled" {slope, slope_ci, se, se_robust, r, r_ci, n, ...}, "within" {slope, slope_ci, se,
/// ...}, "groups" [{level, n, slope, slope_ci, r, ...}], "uninformative", ...}. Never fails;
/// an empty finding gives the same keys with null figures.
nlohmann::json to_json(const SlopeFinding& f);

/// {"kind": "latent", "x", "y", "k", "bic" [per k = 1..6], "components" [{weight, mean [x, y],
/// slope, ...}], "pooled_slope", "opposite", "note", ...}. Never fails.
nlohmann::json to_json(const LatentFinding& f);

}  // namespace foldline
