#pragma once
// Legacy Excel workbooks (.xls, BIFF 2–8) through Debian's libfreexl: one sheet (the first, or
// the one named) becomes a Table through the shared column builder, with the same rules as the
// .xlsx reader (first row the header, rows with no value skipped, dates as ISO text, a value
// under a column with no header refused). libfreexl reads cached formula results and does not
// expose merged cells, so a merged range reads as its top-left value and empty cells.
//
// What it refuses, as an Error naming the file: something that is not an .xls workbook (the
// library's reason), a password-protected workbook, a named sheet that does not exist (the
// sheets are listed), an empty sheet, more than max_cells cells.
#include <cstdint>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/csv_reader.h"
#include "core/table/table.h"

namespace foldline {

/// Reads `sheet` (empty = the first sheet) of the .xls workbook at `path`.
Result<Table> read_xls(const std::string& path, const std::string& sheet, const CsvOptions& opts,
                       std::vector<std::string>* warnings = nullptr, const Work& work = {},
                       std::uint64_t max_cells = 200'000'000);

}  // namespace foldline
