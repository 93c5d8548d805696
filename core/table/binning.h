#pragma once
// Turning numeric columns into categorical stratifiers.
//   integer_levels: a numeric column whose values are all integers with few distinct values
//     (a count, a coded category) becomes one level per value, in numeric order.
//   quantile_bins: any other numeric column is cut at its quantiles into up to `bins` bins
//     labelled by their ranges, "[lo, hi)" and "[lo, hi]" for the last.
// Missing cells (NaN) stay missing (the code levels.size()).
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "core/table/table.h"

namespace foldline {

/// One level per distinct value when every non-missing value is an integer and there are at
/// most max_levels of them; nullopt otherwise (also for a categorical input or no values).
/// Levels are printed without a decimal point ("3", "-1") and sorted numerically.
std::optional<Column> integer_levels(const Column& numeric, std::size_t max_levels);

/// Quantile bins: cut points are the values at weighted shares 1/bins, 2/bins, ... of the
/// sorted non-missing values; duplicate cuts are merged, so a column with few distinct values
/// gets fewer bins. A value equal to a cut goes to the bin above it. `weights` (empty = 1 each)
/// are the table's row weights. Returns a column with no levels when there is no non-missing
/// value; one level when all values are equal; nullopt for a categorical input or bins < 2.
std::optional<Column> quantile_bins(const Column& numeric, int bins,
                                    const std::vector<double>& weights = {});

/// Short label of a number: up to 6 significant digits, no trailing zeros ("12.5", "3e+06").
std::string format_number(double x);

}  // namespace foldline
