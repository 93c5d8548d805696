#pragma once
// The mean-gap question through the audit service: candidates, the mean scan, the one FDR step
// and ranking, from an AuditSpec whose question kind is Mean. run_audit.h's scan_table calls it;
// nothing else should.
#include "core/audit/audit_spec.h"
#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/scan/mean_scan.h"
#include "core/scan/scan_result.h"
#include "core/table/table.h"

namespace foldline::audit {

/// The mean question of a spec (outcome, groups, log scale, pay-gap conventions, alpha, pairs).
MeanQuestion mean_question(const AuditSpec& spec, unsigned threads);

/// Scans `table` for the spec's mean question. Errors: Usage when the question does not fit the
/// data (outcome missing or not numeric, a group not found, a value <= 0 under log_outcome) or no
/// column qualifies as a stratifier; a stop request gives a result with cancelled set.
Result<ScanResult> scan_mean_question(const Table& table, const AuditSpec& spec, unsigned threads,
                                      const Work& work);

/// Why a mean question cannot run on counts grouped elsewhere (a database's push-down).
inline constexpr const char* kMeanNeedsRows =
    "a mean-gap question needs the rows: database push-down for mean gaps is not available yet; "
    "export the rows to a CSV file (or query them into memory) and run the audit on them";

}  // namespace foldline::audit
