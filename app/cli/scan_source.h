#pragma once
// `foldline scan --source odbc:... --table T | --query "SELECT ..."`: the database side of the
// scan command. Loads the pushed-down cells as a pre-counted Table (core/io/odbc_source.h) and
// describes the source for the JSON data block (never the credentials).
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/scan/candidates.h"
#include "core/table/table.h"

namespace foldline::cli {

struct DatabaseSource {
    Table table;                        ///< pre-counted cells (weights = rows per cell)
    std::string description;            ///< "odbc:<redacted connection> table T" / "... query: ..."
    double source_rows = 0;             ///< rows in the source (COUNT(*))
    std::vector<std::string> columns;   ///< every column of the source, in order
    std::vector<Exclusion> left_out;    ///< columns not fetched, with the candidate selection's reason
    double bytes_fetched = 0;
};

/// Loads the source. `required`: outcome, exposure and named stratifiers (always fetched);
/// `all_columns`: also every other column (automatic stratifiers). Error when the build has no
/// ODBC support, when both or neither of table/query are given, or from the database.
Result<DatabaseSource> load_database_source(const std::string& source, const std::string& table,
                                            const std::string& query, const std::vector<std::string>& required,
                                            bool all_columns, const CandidateOptions& options,
                                            const std::string& count_column = {});

/// Puts `left_out` into `excluded` and orders the list by the columns' positions in `columns`.
void merge_left_out(std::vector<Exclusion>& excluded, const std::vector<Exclusion>& left_out,
                    const std::vector<std::string>& columns);

}  // namespace foldline::cli
