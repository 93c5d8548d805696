#pragma once
// The one entry point that turns a data file into a Table, whatever its format: CSV/TSV text
// (core/io/csv_reader.h), SAS transport and data sets, SPSS and Stata files
// (core/io/stat_file_reader.h), .xlsx and .xls workbooks (core/io/xlsx_reader.h,
// core/io/xls_reader.h). The format is chosen by the file's first bytes when they are
// conclusive (a zip archive, a compound file, an SPSS or SAS header), else by its extension;
// anything else is read as CSV text. Every format gives the same columnar Table (see
// core/table/table.h), takes the count column and type overrides, and refuses bad input with an
// Error naming the file; files are opened read-only.
//
// Decimal marks (core/io/decimal_mark.h) apply to text formats and to text cells of
// spreadsheets: Auto reads a column written consistently with decimal commas as numbers and
// reports ambiguous columns; Comma reads every column that way (CSV: the file is read with every
// column as text first); Point reads only decimal points.
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/csv_reader.h"
#include "core/io/decimal_mark.h"
#include "core/table/table.h"

namespace foldline {

enum class FileFormat { Csv, Xpt, Sas7bdat, Sav, Dta, Xlsx, Xls };

/// "CSV", "SAS transport", "SAS data set", "SPSS", "Stata", "xlsx", "xls".
std::string_view format_name(FileFormat f);
/// "csv", "xpt", "sas7bdat", "sav", "dta", "xlsx", "xls" (for JSON).
std::string_view format_key(FileFormat f);

/// Reading options: the CSV options (delimiter, missing markers, count column, type overrides,
/// caps) plus what other formats and the decimal mark need.
struct ReadOptions : CsvOptions {
    std::string sheet;                      ///< workbooks: the sheet's name; empty = the first sheet
    DecimalMark decimal = DecimalMark::Auto;
};

struct ReadReport {
    FileFormat format = FileFormat::Csv;
    CsvReport csv;                         ///< CSV only
    std::string sheet;                     ///< workbooks: the sheet read ("" = the first)
    std::vector<std::string> warnings;     ///< every format (CSV's own warnings included)
    std::vector<NumberReading> numbers;    ///< columns read with a decimal comma, or ambiguous
};

/// The format of the file at `path` (by magic, then extension); Csv when nothing else fits.
FileFormat detect_format(const std::string& path);

/// Reads the data file at `path`. Progress and cancellation as in read_csv.
Result<Table> read_table(const std::string& path, const ReadOptions& opts = {}, ReadReport* report = nullptr,
                         const Work& work = {});

}  // namespace foldline
