#pragma once
// Findings as CSV for spreadsheets: one file with a row per finding, a second with a row per
// stratum of every finding — a pair for rate findings and, when the scan checked slopes, a pair
// for slope findings (their columns differ). RFC 4180: CRLF line ends, a header row, fields that hold a comma,
// a double quote, CR or LF are quoted with inner quotes doubled; every text from the data (column
// names, levels) or the reviewer (notes) passes through csv_field. Undefined numbers (NaN, ±inf)
// are empty fields; other numbers use up to 10 significant digits.
#include <string>
#include <string_view>
#include <vector>

#include "core/audit/project_file.h"
#include "core/scan/scan_result.h"

namespace foldline::report {

/// One RFC 4180 field: `s` as is, or in double quotes with inner quotes doubled when it holds
/// a comma, quote, CR or LF. Empty string → empty field.
std::string csv_field(std::string_view s);

/// A number as a CSV field; NaN or infinite → empty field.
std::string csv_number(double x);

/// Header + one row per rate finding, in the scan's order. Decision and note come from
/// `project` when given (nullptr or no review → "undecided", empty note). An empty scan gives
/// the header alone.
std::string findings_csv(const ScanResult& result, const project::Project* project = nullptr);

/// Header + one row per stratum of every finding (finding number = 1-based row of
/// findings_csv). An empty scan gives the header alone.
std::string strata_csv(const ScanResult& result);

/// Header + one row per slope finding, in the scan's order (kind "slope"). Decision and note
/// as for findings_csv, matched by project::slope_key. No slope findings → the header alone.
std::string slope_findings_csv(const ScanResult& result, const project::Project* project = nullptr);

/// Header + one row per stratum of every slope finding (finding number = 1-based row of
/// slope_findings_csv). No slope findings → the header alone.
std::string slope_strata_csv(const ScanResult& result);

/// The files write_csv_exports writes for `result`: for a mean-gap question PREFIX-mean-findings.csv
/// and PREFIX-mean-strata.csv (core/report/mean_csv.h); otherwise PREFIX-findings.csv and PREFIX-strata.csv
/// unless the scan asked only a slope question, then PREFIX-slope-findings.csv and
/// PREFIX-slope-strata.csv when it checked slopes. An empty result → the rate pair.
std::vector<std::string> csv_export_paths(const ScanResult& result, const std::string& prefix);

/// Writes the files csv_export_paths names, each atomically. Error names the file that failed
/// (a file written before the failure stays written).
Status write_csv_exports(const ScanResult& result, const project::Project* project, const std::string& prefix);

}  // namespace foldline::report
