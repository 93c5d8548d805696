#pragma once
// Shared by `foldline run`, `foldline memo` and `foldline scan --memo/--csv`: re-running a saved
// audit from its project file, comparing the classes with the saved ones, and writing the
// shareable outputs (JSON, CSV pair, PDF memo).
#include <optional>
#include <string>
#include <vector>

#include "core/causal/verdict.h"
#include "core/common/error.h"
#include "core/io/project_file.h"
#include "core/report/scan_json.h"
#include "core/scan/candidates.h"
#include "core/scan/scan_result.h"
#include "core/table/table.h"

namespace foldline::cli {

/// Exit code of `foldline run` when a finding's class differs from the one saved in the project.
inline constexpr int kClassChanged = 4;

struct AuditRun {
    Table table;
    ScanResult result;
    DataInfo info;
    std::vector<std::optional<causal::Verdict>> verdicts;  ///< per rate finding; empty without diagram
    std::string data_change;  ///< DataChange::message when the recorded data changed, else empty
    std::string diagram_problem;  ///< why the diagram could not be used, else empty
};

/// Re-runs the project's audit (a rate question, with the trend checks it records, or a slope
/// question) on its data (or on `data_override` when non-empty: a new
/// extract with the same columns) with the saved question, settings, seed and diagram.
/// `exit_code` receives 3 (input) or 2 (usage: the question no longer fits the data) on error.
Result<AuditRun> run_audit(const project::Project& p, const std::string& data_override, unsigned threads,
                           int& exit_code);

/// A slope (trend) audit as `foldline scan` runs it for a numeric outcome on a numeric
/// exposure: candidates (x, y and the covariates left out), every check (pairs when asked),
/// FDR, ranking; rate fields of the result stay empty. `exit_code` receives 2 when x, y or a
/// covariate is missing or not numeric, 3 when the scan fails, 0 on success.
Result<ScanResult> slope_audit(const Table& table, const SlopeQuestion& q, const CandidateOptions& options,
                               bool pairs, int& exit_code);

/// Slope checks added to a rate scan (`--trend X:Y`): y on x within each single candidate other
/// than x, y and the covariates; q-values left for the rate scan's FDR step. Exit codes as for
/// slope_audit. No candidate left → empty vector.
Result<std::vector<SlopeFinding>> trend_checks(const Table& table, const SlopeQuestion& q,
                                               const CandidateSet& candidates, int& exit_code);

/// Verdicts for each rate finding under `diagram` (nullopt where the diagram cannot judge one);
/// also fills RateFinding::verdict with the answer's name, and the verdict_detail JSON of rate
/// and slope findings (with the adjusted estimate the verdict points to, computed on `table`).
/// Empty diagram → empty vector.
std::vector<std::optional<causal::Verdict>> attach_verdicts(ScanResult& result, const Table& table,
                                                            const causal::Diagram& diagram, std::string& problem);

struct ClassChange {
    project::FindingKey key;
    std::optional<FindingClass> before;  ///< nullopt: a newly flagged finding
    std::optional<FindingClass> after;   ///< nullopt: no longer produced
};

/// Findings whose class differs from the saved one: a saved class that changed or vanished, and
/// (when the project saved any class) a flagged finding that had none. No saved class → empty.
std::vector<ClassChange> class_changes(const project::Project& p, const ScanResult& result);

/// Saves the classes of every finding of `result` into the project's reviews (decisions and
/// notes kept).
void record_classes(project::Project& p, const ScanResult& result);

/// Today's date (UTC) as YYYY-MM-DD, or SOURCE_DATE_EPOCH's date when that is set (for
/// reproducible memos).
std::string today();

/// Writes the PDF memo; `table` (the rows scanned) gives the trend sections their charts, null
/// leaves them without. Returns 0, or prints the reason and returns 2 when this build has no
/// Qt (FOLDLINE_BUILD_UI=OFF) or 3 when the file cannot be written.
int write_memo(const std::string& command, const ScanResult& result, const DataInfo& info,
               const project::Project* p, const std::vector<std::optional<causal::Verdict>>& verdicts,
               const std::string& data_change, const std::string& out_path, const Table* table = nullptr);

/// The outputs `foldline scan` shares besides its JSON: the PDF memo (`memo_path`) and the CSV
/// pair (`csv_prefix`); empty = not asked; `table` as for write_memo. Returns 0 or the exit code after printing the reason.
int write_shared_outputs(const std::string& command, const ScanResult& result, const DataInfo& info,
                         const std::string& memo_path, const std::string& csv_prefix,
                         const Table* table = nullptr);

/// An error message when `output` names the same file as one of `inputs` (outputs never
/// overwrite the data or the project); empty when it is safe or `output` is empty or "-".
std::string overwrites_input(const std::string& output, const std::vector<std::string>& inputs);

/// True when this build can write PDF memos.
bool memo_available();

}  // namespace foldline::cli
