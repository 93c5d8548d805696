#pragma once
// The scan's JSON document: Foldline's published interface (documented in the README,
// "JSON output"). Numbers that are undefined (NaN, infinite) are written as null; counts that
// are whole numbers are written as integers.
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/io/source_record.h"
#include "core/scan/scan_result.h"

namespace foldline {

/// Where the scanned rows came from.
struct DataInfo {
    std::string path;
    std::string sha256;  ///< hex digest of the file's bytes; empty when not computed
    double rows = 0;     ///< rows read (weighted rows for a pre-counted file are in findings)
    std::optional<DatabaseRecord> database = std::nullopt;  ///< set for a database source (then sha256 is empty)
    std::string format = {};  ///< "xpt", "sav", "xlsx" …; empty for CSV text (not written then)
    std::string sheet = {};   ///< workbooks: the sheet read; empty = the first (not written then)
};

inline constexpr int kScanJsonVersion = 1;

/// The whole document: "findings" lists the rate findings (kind "rate", ranked) and then the
/// slope findings (kind "slope", ranked; core/report/slope_json.h). An empty result gives a
/// document with empty lists.
nlohmann::json scan_to_json(const ScanResult& result, const DataInfo& data);

/// One finding as it appears in "findings".
nlohmann::json rate_finding_to_json(const RateFinding& f);

/// A finding's "family": {lead, role ("lead", "member" or "proxy"), reason}.
nlohmann::json family_to_json(const FindingHeader& f);

/// The top-level "families" list in rank order: [{kind, focal (rate families, else null), lead,
/// class, size, proxies, members}]; flagged families only. None → [].
nlohmann::json families_to_json(const ScanResult& result);

/// The "candidates" list shared by the rate and slope documents: [{column, origin}], origin ""
/// where `origins` is shorter than `names`. No names → [].
nlohmann::json candidates_to_json(const std::vector<std::string>& names, const std::vector<std::string>& origins);

/// The "excluded" list shared by the rate and slope documents: [{column, reason}]. Empty → [].
nlohmann::json excluded_to_json(const std::vector<Exclusion>& excluded);

/// The per-class counts of a "summary": every class name with 0.
nlohmann::json empty_class_counts();

/// The "summary" object alone (counts by class, reversals); zero counts for an empty result.
nlohmann::json scan_to_json_summary(const ScanResult& result);

/// The same document as scan_to_json, as compact text with a final newline (rate findings are
/// streamed rather than built as a tree: several times faster on large scans).
std::string scan_json_text(const ScanResult& result, const DataInfo& data);

}  // namespace foldline
