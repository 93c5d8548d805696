#include "app/cli/count_warning.h"

#include "core/table/count_column_guess.h"

namespace foldline::cli {

bool warn_if_count_column_forgotten(std::ostream& err, const std::string& command, const Table& table,
                                    const std::string& count_column) {
    if (!count_column.empty()) return false;
    const auto g = guess_count_column(table);
    if (!g) return false;
    err << "foldline " << command << ": warning: column '" << g->column
        << "' looks like a count of observations per row (whole numbers of 0 or more, every combination of the "
           "other columns once); each row was counted once. If the file is pre-counted, add --count-column "
        << g->column << "\n";
    return true;
}

}  // namespace foldline::cli
