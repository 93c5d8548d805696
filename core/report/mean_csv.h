#pragma once
// Mean-gap findings as CSV (the conventions of core/report/csv_export.h: RFC 4180, CRLF, text
// through csv_field, undefined numbers as empty fields): PREFIX-mean-findings.csv with a row per
// finding and PREFIX-mean-strata.csv with a row per stratum of every finding.
#include <string>

#include "core/audit/project_file.h"
#include "core/scan/scan_result.h"

namespace foldline::report {

/// Header + one row per mean-gap finding in the scan's order (kind "mean"). Decision and note
/// from `project` (matched by project::mean_key); none → "undecided", empty note.
std::string mean_findings_csv(const ScanResult& result, const project::Project* project = nullptr);

/// Header + one row per stratum of every mean-gap finding (finding = 1-based row of
/// mean_findings_csv), with the pay-gap figures when they were computed.
std::string mean_strata_csv(const ScanResult& result);

}  // namespace foldline::report
