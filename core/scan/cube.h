#pragma once
// Count cubes: the sufficient statistics of a rate scan. One tight pass over contiguous code
// arrays counts every row into (stratum, exposure slot, outcome); missing stratifier values and
// rows outside the question fall into spare slots that are dropped. Pairs of stratifiers are
// counted over their joint codes in the same single pass. No allocation or virtual call per row.
#include <cstddef>
#include <string>
#include <vector>

#include "core/scan/question.h"
#include "core/stats/stratified.h"
#include "core/table/table.h"

namespace foldline {

/// Weighted counts per stratum, exposure slot and outcome. Strata are the stratifier's levels
/// (or, for a pair, level1 * levels2 + level2), missing values excluded.
struct CountCube {
    std::size_t strata = 0;
    std::size_t slots = 0;
    std::vector<double> counts;  ///< [stratum][slot][positive? 1 : 0]
    double at(std::size_t stratum, std::size_t slot, int positive) const {
        return counts[(stratum * slots + slot) * 2 + static_cast<std::size_t>(positive)];
    }
    /// Rows (weights) in the stratum in any slot.
    double stratum_total(std::size_t stratum) const;
};

/// Cube over one categorical stratifier. `weights` empty = each row counts once.
/// A table with no rows gives a cube of zeros.
CountCube build_cube(const Column& stratifier, const RowCells& rows, const std::vector<double>& weights);

/// Cube over the joint levels of two categorical stratifiers (rows missing either are dropped).
/// A stratifier without levels gives a cube with no strata.
CountCube build_pair_cube(const Column& first, const Column& second, const RowCells& rows,
                          const std::vector<double>& weights);

/// The cubes of `first` paired with each column of `seconds`, in that order, equal to
/// build_pair_cube(first, *seconds[k], ...) for each k. Unweighted tables count every pair in
/// one pass over blocks of rows: the first column's code and the row's cell are combined once
/// per row and reused by each pair. Empty `seconds` gives no cubes.
std::vector<CountCube> build_pair_cubes(const Column& first, const std::vector<const Column*>& seconds,
                                        const RowCells& rows, const std::vector<double>& weights);

/// The 2 x 2 x K strata of one comparison (focal slot against slot 0), keeping only strata with
/// at least one row in either group; `kept` (optional) receives their stratum indices. Empty when
/// no stratum has rows.
stats::Strata comparison_strata(const CountCube& cube, std::size_t focal_slot,
                                std::vector<std::size_t>* kept = nullptr);

}  // namespace foldline
