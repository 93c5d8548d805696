#pragma once
// The warning a headless command prints when a file read one row per observation looks
// pre-counted (core/table/count_column_guess) and no --count-column was given.
#include <ostream>
#include <string>

#include "core/table/table.h"

namespace foldline::cli {

/// Writes "foldline COMMAND: warning: ..." naming the likely count column to `err` when
/// `count_column` is empty and the table looks pre-counted; returns whether it warned.
bool warn_if_count_column_forgotten(std::ostream& err, const std::string& command, const Table& table,
                                    const std::string& count_column);

}  // namespace foldline::cli
