#pragma once
// Running an audit: the one application layer `foldline scan`, `foldline run`, `foldline memo`
// and the workbench call. From an AuditSpec (core/audit/audit_spec.h) and rows in memory, cubes
// counted by a database, or the project's data file, it selects the candidates, runs the rate or
// slope scan (with trend checks and the hidden-group hint when the spec asks), controls the
// false discovery rate, ranks, and attaches the diagram's verdicts with their adjusted
// estimates. The front ends only parse input, convert types and show what comes back.
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/audit/audit_spec.h"
#include "core/io/decimal_mark.h"
#include "core/audit/verdicts.h"
#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/report/scan_json.h"
#include "core/scan/rate_scan.h"
#include "core/scan/scan_result.h"
#include "core/table/grouped_counts.h"
#include "core/table/row_filter.h"
#include "core/table/table.h"

namespace foldline::audit {

struct RunOptions {
    unsigned threads = 2;  ///< worker threads (0 = the machine's)
    Work work;             ///< progress and cancellation
    RateFindingCallback on_rate_finding;  ///< each rate finding as soon as it exists (class provisional)
};

/// The question kind a scan of `outcome` on `exposure` asks when nobody said: a slope when both
/// columns are numeric, no positive level is named and the exposure has more than `max_levels`
/// distinct values; a rate otherwise (also when a column is missing: the rate path names it).
project::QuestionKind infer_kind(const Table& table, const project::QuestionSettings& question,
                                 std::size_t max_levels);

/// The spec's rows filter, read (the empty filter when the spec has none). Usage error pointing
/// at the character that does not fit (core/table/row_filter.h).
Result<filter::RowFilter> rows_filter(const AuditSpec& spec);

/// The rows of `table` the spec's filter keeps (core/table/row_filter.h: levels renumbered as a
/// file of those rows would give them): what the workbench shows and scans. Usage error for a
/// filter that does not fit the columns; Input error when it keeps no row.
Result<Table> filter_rows(const Table& table, const AuditSpec& spec);

/// The columns whose combinations form the compared groups when the spec's exposure names them
/// joined by "+" (core/table/combined_column.h); empty for an ordinary exposure.
std::vector<std::string> combined_groups(const Table& table, const AuditSpec& spec);

/// Adds the combined exposure column the spec names (combined_groups) to `table`, unless it is
/// already there. Error when the combinations cannot be formed.
Status add_combined_groups(Table& table, const AuditSpec& spec);

/// The estimate settings (bins, level limit, alpha) of a spec.
EstimateSettings estimate_settings(const AuditSpec& spec);

/// Scans `table` as `spec` asks, on the rows its filter keeps (filtered here unless
/// `table.filter` says the rows already passed that filter) and with the combined exposure
/// column (added here to a copy unless the caller added it: add_combined_groups). The parts of
/// combined groups never stratify (listed as excluded), and the diagram's verdicts read the parts
/// as one node (core/causal/combined_exposure.h). Errors carry their kind: Usage when the question, a trend or a
/// covariate does not fit the data (a column missing or not numeric, a settings problem); Input
/// when no column qualifies as a stratifier or the scan fails on the data; Internal otherwise.
/// A stop request gives a result with cancelled set (findings so far, or none for slopes).
Result<ScanResult> scan_table(const Table& table, const AuditSpec& spec, const RunOptions& options = {});

/// The same over cubes counted elsewhere (a database's GROUPING SETS: core/scan/grouped_cubes.h)
/// and, for trend checks, per-stratum moment sums. Rate questions only; verdicts need rows and
/// are not attached (a caller that has a diagram loads the rows instead).
Result<ScanResult> scan_groups(const GroupedCounts& counts, const std::optional<GroupedMoments>& moments,
                               const AuditSpec& spec, const RunOptions& options = {});

/// A finished audit of the project's data.
struct AuditRun {
    Table table;                  ///< the rows scanned
    ScanResult result;            ///< findings with their verdicts
    DataInfo info;                ///< path, digest, rows
    std::string data_change;      ///< how the data changed since the project was saved, else empty
    std::string diagram_problem;  ///< why the diagram could not judge some finding, else empty
    std::vector<std::string> read_warnings;  ///< the reader's warnings about the file
    std::vector<NumberReading> numbers;      ///< how numbers written as text were read (decimal marks)
};

/// Reads the spec's data file (or `data_override`, a new extract with the same columns) with the
/// recorded reading options, its SHA-256 computed beside the parse, says how it changed since it
/// was recorded, keeps the rows the spec's filter keeps (AuditRun::table holds those; info.rows
/// counts the rows read) and scans them (scan_table). Errors as for scan_table, and Input for a file that
/// is missing or cannot be read.
Result<AuditRun> run_audit(const AuditSpec& spec, const std::string& data_override = {},
                           const RunOptions& options = {});

/// Diagram nodes are matched to data columns by name: an Input error naming an observed node
/// that is not a column of `table`, or the diagram's own problem (cycle, duplicate name).
Status check_diagram_columns(const causal::Diagram& diagram, const Table& table, const std::string& source = {});

}  // namespace foldline::audit
