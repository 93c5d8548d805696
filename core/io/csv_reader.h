#pragma once
// The CSV/TSV reader: RFC 4180 text in UTF-8 → a columnar Table.
//
// What it accepts: quoted fields (doubled quotes, delimiters and newlines inside quotes), a
// delimiter among , ; tab | (detected unless given), one header row, UTF-8 with or without a
// byte-order mark, LF or CRLF line ends. Blank lines are skipped. A column is Numeric when
// every non-missing cell parses as a decimal number (sign, decimals, exponent; spaces around
// it allowed; "inf", "nan", hex and thousands separators are not numbers), otherwise
// Categorical with levels in order of first appearance, kept byte for byte (quotes removed,
// doubled quotes collapsed). A quoted cell equal to a missing marker is missing too. A column
// with no non-missing cell at all is Numeric (all NaN). Duplicate or empty header names are
// made unique ("a_2", "column_3") with a warning. The result does not depend on the thread
// count or the chunk size.
//
// What it refuses, as an Error naming file, 1-based physical line, column and what was
// expected: UTF-16/32 text, invalid UTF-8, an empty file, a header with no rows, ragged rows
// (or skips them when asked), an unclosed quote (reported at the line where it opened), a
// stray quote inside an unquoted field, a number beyond the double range in a Numeric column
// (1e400; in a Categorical column it is just a level), missing, negative, fractional or
// non-numeric counts or counts above 2^53 in the count column, a file that changed while
// being read (see mapping_guard.h: a shrinking file cannot raise SIGBUS), and fields or rows beyond the hostile-input caps.
//
// Files are opened read-only and memory-mapped. The body is cut into chunks after a newline;
// chunks are parsed in parallel into per-chunk columns (numbers, or chunk-local dictionary
// codes one byte wide), then checked in file order: a chunk that started on a record boundary
// and ended cleanly proves its successor did too; when a quoted field crosses a cut, the cut
// moves to the end of that record and the next chunk is read again. Dictionaries are merged
// in file order (so levels keep their first-appearance order) and codes remapped into the
// narrowest width. Pages already parsed are handed back, so peak memory stays near the size
// of the finished table rather than the file. UTF-8 is checked on header names and on each
// new level (a cell that parses as a number is ASCII by construction).
#include <cstddef>
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/delimiter_detect.h"
#include "core/table/table.h"

namespace foldline {

struct CsvOptions {
    char delimiter = 0;  ///< 0 = detect among , ; \t |
    std::vector<std::string> missing_markers = {"", "NA", "N/A", "NULL", "."};
    std::string count_column;  ///< non-empty: pre-counted table; this column becomes Table::weights
    bool skip_ragged = false;  ///< false: a ragged row is an error; true: skip it and report its line
    unsigned threads = 0;      ///< 0 = hardware concurrency
    std::map<std::string, ColumnType> type_overrides;  ///< force a column's type
    bool all_text = false;  ///< every column without an override (and not the count column) reads as categorical
    std::size_t max_field_bytes = 16u << 20;  ///< hostile-input caps, named in the error message
    std::size_t max_fields_per_row = 1u << 16;
    std::size_t chunk_bytes = 0;  ///< parallel chunk size; 0 = automatic (1–8 MiB)
};

struct CsvReport {
    char delimiter = ',';
    bool had_bom = false;
    std::size_t physical_lines = 0;
    std::vector<std::size_t> skipped_lines;  ///< 1-based physical lines of skipped ragged rows
    std::vector<std::string> warnings;       ///< e.g. duplicate column names made unique
};

/// Reads the CSV file at `path`. Progress is reported in bytes; a stop request gives the
/// Error "cancelled". An empty file, or one with a header but no rows, is an Error.
Result<Table> read_csv(const std::string& path, const CsvOptions& opts = {},
                       CsvReport* report = nullptr, const Work& work = {});

/// Same as read_csv on text already in memory; `name` stands for the file in messages.
Result<Table> read_csv_text(std::string_view text, const std::string& name,
                            const CsvOptions& opts = {}, CsvReport* report = nullptr,
                            const Work& work = {});

}  // namespace foldline
