#pragma once
// Findings as CSV for spreadsheets: one file with a row per finding, a second with a row per
// stratum of every finding. RFC 4180: CRLF line ends, a header row, fields that hold a comma,
// a double quote, CR or LF are quoted with inner quotes doubled; every text from the data (column
// names, levels) or the reviewer (notes) passes through csv_field. Undefined numbers (NaN, ±inf)
// are empty fields; other numbers use up to 10 significant digits.
#include <string>
#include <string_view>

#include "core/io/project_file.h"
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

/// Writes PREFIX-findings.csv and PREFIX-strata.csv atomically. Error names the file that
/// failed (a file written before the failure stays written).
Status write_csv_exports(const ScanResult& result, const project::Project* project, const std::string& prefix);

}  // namespace foldline::report
