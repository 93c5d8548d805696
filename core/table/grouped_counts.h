#pragma once
// Counts grouped elsewhere, one pre-counted table per grouping set: what a database returns for
// one GROUP BY GROUPING SETS query over (outcome, exposure), (outcome, exposure, s) for every
// stratifier s and (outcome, exposure, s, t) for every pair. Plain data: the reader that fills
// it lives in core/io, the scan that reads it in core/scan/grouped_cubes.h.
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
};

}  // namespace foldline
