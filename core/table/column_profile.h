#pragma once
// The rule that leaves a column out of the stratifiers before it is counted, in one place: the
// scan of a table (core/scan/candidates.h), the scan of grouping-set cells
// (core/scan/grouped_cubes.h) and the database profile (core/io/odbc_source.h) all describe the
// column as a ColumnProfile and take the reason from exclusion_reason, so they print the same
// words for the same column.
#include <cstddef>
#include <optional>
#include <string>

namespace foldline {

/// What is known of a column before it is counted, wherever the figures come from.
struct ColumnProfile {
    double rows = 0;          ///< rows of the source (Σ weights where a row stands for many)
    double missing = 0;       ///< rows of those where the column is missing
    double distinct = 0;      ///< distinct non-missing values (levels in use)
    bool categorical = true;  ///< text levels; a numeric column is decided on its levels or bins later
    bool row_level = true;    ///< one row per observation (not pre-counted): "one value per row" applies
};

/// Why the column is left out, or nothing. Tried in this order:
///   "mostly missing (M of R rows)"  any column with missing > max_missing_share × rows (rows > 0);
///   "constant"                      a categorical column with fewer than 2 values;
///   "one value per row"             a row-level categorical column with a different value in
///                                   every non-missing row, and more rows than max_levels;
///   "too many levels (N > L)"       a categorical column with more than max_levels values.
/// Counts in the words are whole rows (a fractional Σ weights is truncated).
std::optional<std::string> exclusion_reason(const ColumnProfile& p, std::size_t max_levels,
                                            double max_missing_share);

}  // namespace foldline
