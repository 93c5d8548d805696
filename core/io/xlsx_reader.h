#pragma once
// Office Open XML workbooks (.xlsx) read with libzip and expat: one sheet (the first, or the one
// named) becomes a Table through the shared column builder, so a sheet and a CSV file holding
// the same cells give the same Table.
//
// What it reads: the first row as the header (a header row is required; a row of numbers only
// is not one); shared strings (rich text joined), inline strings, formula string results,
// numbers, booleans ("TRUE"/"FALSE"), numbers styled as dates or date-times (built-in and custom
// formats, 1900 and 1904 date systems) as ISO text, empty cells as missing. Rows with no value
// are skipped, as blank lines in a CSV file. Error cells (#N/A …) are missing, with a warning.
//
// What it refuses, as an Error naming the file (and the cell when there is one): something that
// is not a zip archive or has no workbook, a named sheet that does not exist (the sheets are
// listed), merged cells, a formula with no cached value, a value in a column with no header,
// malformed XML (line and column inside the part), and a workbook beyond the limits below — a
// part that inflates past max_part_bytes or with a compression ratio above max_ratio (a zip
// bomb), or a sheet of more than max_cells cells. Parts are inflated in 64 KiB pieces and
// parsed as they stream, and no size declared in the file is used to reserve memory, so memory
// stays near the finished table.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/csv_reader.h"
#include "core/table/table.h"

namespace foldline {

struct SpreadsheetLimits {
    std::uint64_t max_part_bytes = 4ull << 30;  ///< inflated size of one part (sheet, shared strings)
    double max_ratio = 250;                     ///< inflated / compressed, for parts above 1 MiB
    std::uint64_t max_cells = 200'000'000;      ///< header columns × data rows
};

/// Reads `sheet` (empty = the first sheet) of the workbook at `path`. Uses opts.missing_markers
/// (on text cells), count_column and type_overrides. Sheet names found go to `sheets` when given.
Result<Table> read_xlsx(const std::string& path, const std::string& sheet, const CsvOptions& opts,
                        std::vector<std::string>* warnings = nullptr, const Work& work = {},
                        const SpreadsheetLimits& limits = {});

/// Same on a workbook already in memory; `name` stands for the file in messages.
Result<Table> read_xlsx_bytes(std::string_view bytes, const std::string& name, const std::string& sheet,
                              const CsvOptions& opts, std::vector<std::string>* warnings = nullptr,
                              const Work& work = {}, const SpreadsheetLimits& limits = {});

/// ISO text of a spreadsheet date serial: "2024-03-01", with "T08:30:00" when `with_time`
/// (rounded to the second). `date1904`: the 1904 date system. The 1900 system counts the
/// nonexistent 1900-02-29 as serial 60, as spreadsheets do.
std::string spreadsheet_date_text(double serial, bool date1904, bool with_time);

}  // namespace foldline
