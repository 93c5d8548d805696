#pragma once
// What the headless commands share besides the audit itself (core/audit): the exit code of an
// error's kind, refusing to write over an input, and writing the shareable outputs (JSON, CSV
// pair, PDF memo through the Qt memo writer when this build has it).
#include <string>
#include <vector>

#include "core/audit/project_file.h"
#include "core/common/error.h"
#include "core/report/scan_json.h"
#include "core/scan/scan_result.h"
#include "core/table/table.h"

namespace foldline::cli {

/// Exit code of `foldline run` when a finding's class differs from the one saved in the project.
inline constexpr int kClassChanged = 4;

/// The exit code of an error's kind: 3 input, 2 usage, 1 internal.
int exit_code(const Error& e);

/// Prints "foldline COMMAND: message" for the error and returns its exit code.
int fail(const std::string& command, const Error& e);

/// Writes the PDF memo of a finished audit; `table` (the rows scanned) gives the trend sections
/// their charts, null leaves them without. Returns 0, or prints the reason and returns 2 when this
/// build has no Qt (FOLDLINE_BUILD_UI=OFF) or 3 when the file cannot be written.
/// `detail` is "families" or "full"; empty: the project's memo.detail ("families" without one).
int write_memo(const std::string& command, const ScanResult& result, const DataInfo& info,
               const project::Project* p, const std::string& data_change, const std::string& out_path,
               const Table* table = nullptr, const std::string& detail = {});

/// The outputs `foldline scan` shares besides its JSON: the PDF memo (`memo_path`) and the CSV
/// pair (`csv_prefix`); empty = not asked; `table` as for write_memo. Returns 0 or the exit code
/// after printing the reason.
int write_shared_outputs(const std::string& command, const ScanResult& result, const DataInfo& info,
                         const std::string& memo_path, const std::string& csv_prefix,
                         const Table* table = nullptr, const std::string& memo_detail = {});

/// Checks `--memo-detail` (`families` or `full`); an error message naming the value, else empty.
std::string memo_detail_problem(const std::string& value);

/// An error message when `output` names the same file as one of `inputs` (outputs never
/// overwrite the data or the project); empty when it is safe or `output` is empty or "-".
std::string overwrites_input(const std::string& output, const std::vector<std::string>& inputs);

/// True when this build can write PDF memos.
bool memo_available();

}  // namespace foldline::cli
