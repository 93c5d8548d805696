#pragma once
// What the PDF memo is built from, assembled the same way for `foldline run`, `foldline memo`,
// `foldline scan --memo` and the workbench: the finished scan (its findings carry their
// verdicts), the data's facts, the project (title, analyst, decisions, notes, memo choices and
// the diagram drawn), the rows for the trend charts, the date and any change in the data.
#include <string>

#include "core/audit/project_file.h"
#include "core/report/memo_content.h"

namespace foldline::audit {

/// The memo input; pointers are kept, not copied (they must outlive the input). `project` and
/// `table` may be null; `date` is YYYY-MM-DD from the caller's clock.
report::MemoInput memo_input(const ScanResult& result, const DataInfo& data, const project::Project* project,
                             const Table* table, std::string date, std::string data_change = {});

/// Today's date (UTC) as YYYY-MM-DD, or SOURCE_DATE_EPOCH's date when that is set (for
/// reproducible memos).
std::string today();

}  // namespace foldline::audit
