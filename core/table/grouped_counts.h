#pragma once
// Counts grouped elsewhere, one pre-counted table per grouping set: what a database returns for
// one GROUP BY GROUPING SETS query over (outcome, exposure), (outcome, exposure, s) for every
// stratifier s and (outcome, exposure, s, t) for every pair. Plain data: the reader that fills
// it lives in core/io, the scan that reads it in core/scan/grouped_cubes.h.
#include <string>
#include <vector>

#include "core/table/table.h"

namespace foldline {

/// Every table is pre-counted (weights = rows per cell, one row per distinct combination, NULL
/// kept as a missing value) and its rows are in order of first appearance in the source, so its
/// level order is the source's order of first appearance. An empty source gives empty tables.
struct GroupedCounts {
    Table pooled;                  ///< columns: outcome, exposure
    std::vector<Table> singles;    ///< columns: outcome, exposure, stratifier (one per stratifier column)
    std::vector<Table> pairs;      ///< columns: outcome, exposure, s, t for pairs of singles' columns
    bool weighted_source = false;  ///< the source rows were pre-counted themselves (a count column)
    /// Stratifiers whose numeric values in the pair sets are already their levels' codes (the
    /// engine binned them with cut points taken from their own sets); others hold source values.
    std::vector<std::string> coded_in_pairs;
};

/// Moment sums of one stratum of a slope question, on values centred by a shift (x - shift_x,
/// y - shift_y) so that the sums do not lose digits to large values.
struct CentredSums {
    double n = 0;    ///< rows (x and y both present)
    double sx = 0;   ///< Σ dx
    double sy = 0;   ///< Σ dy
    double sxx = 0;  ///< Σ dx²
    double sxy = 0;  ///< Σ dx dy
    double syy = 0;  ///< Σ dy²
    bool x_constant = false;  ///< every x of the stratum is the same value (known exactly, not from the sums)
    bool y_constant = false;  ///< every y of the stratum is the same value
};

/// Per-stratum moment sums of y on x grouped elsewhere (one GROUPING SETS query: the empty set
/// and one set per stratifier column), plus the two row-level figures the scan needs.
struct GroupedMoments {
    double shift_x = 0, shift_y = 0;    ///< every sum is of values minus these
    CentredSums pooled;                 ///< every row with x and y present
    std::vector<Column> values;         ///< per stratifier column: its distinct values (NULL = missing)
    std::vector<std::vector<CentredSums>> sums;  ///< per stratifier column: the sums of each value's rows
    double hc3 = 0;                     ///< HC3 robust SE of the pooled slope; NaN when undefined
    bool zero_one = false;              ///< every y used is 0 or 1 (a linear probability model)
};

}  // namespace foldline
