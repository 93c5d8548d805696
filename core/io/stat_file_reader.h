#pragma once
// SAS, SPSS and Stata data files through libreadstat: SAS transport (.xpt, versions 5 and 8),
// SAS data sets (.sas7bdat), SPSS (.sav, compressed .zsav) and Stata (.dta).
//
// Each variable becomes a column named as in the file; its variable label goes to
// Column::label. A variable with value labels becomes categorical, each label a level (a value
// without a label keeps its number as the level) and the codes are listed in
// Column::description ("1 = female; 2 = male"). System missing values, SAS and Stata special
// missing values (.A–.Z, .a–.z) and SPSS user-defined missing values and ranges are missing
// cells. Variables with a date format become ISO dates ("2024-03-01"), with a date-time format
// ISO date-times ("2024-03-01T08:30:00"), both categorical as in a CSV file; other numbers stay
// numbers. Strings are UTF-8 text read like CSV cells (missing markers, numbers). The count
// column and type overrides work as for CSV.
//
// What it refuses, as an Error naming the file: a file that is not of the format its
// extension says (the library's reason, e.g. "invalid file, or file has unsupported
// features"), a truncated file, a file with no variables or no rows, a missing count column.
// The file is opened read-only and never written.
#include <string>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/csv_reader.h"
#include "core/table/table.h"

namespace foldline {

enum class StatFormat { Xpt, Sas7bdat, Sav, Dta };

/// "SAS transport", "SAS data set", "SPSS", "Stata".
const char* stat_format_name(StatFormat f);

/// Reads the data file at `path` as `format`. Uses opts.missing_markers (on string cells),
/// count_column and type_overrides; the other CSV options do not apply. Progress is reported
/// as a fraction; a stop request gives the Error "cancelled".
Result<Table> read_stat_file(const std::string& path, StatFormat format, const CsvOptions& opts,
                             std::vector<std::string>* warnings = nullptr, const Work& work = {});

}  // namespace foldline
