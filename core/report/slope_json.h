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

/// The whole scan document for a slope question, laid out as scan_to_json's: "version",
/// "data", "question" {kind "slope", outcome, exposure, covariates, linear_probability},
/// "settings", "candidates", "excluded", "summary" {checks, classes, reversals}, "findings"
/// (ranked slope findings, then the latent finding when there is one). Never fails.
nlohmann::json slope_scan_to_json(const SlopeScanResult& result, const DataInfo& data);

}  // namespace foldline
