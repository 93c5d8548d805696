#pragma once
// Medians with frequency weights. Unlike means, medians are not mergeable sums: a cell's median
// needs its rows. The scan gets every cell's median in one pass over the rows in ascending
// order of the value (core/scan/mean_scan.cpp): each cell's running weight crosses half its
// total at its median.
//
// Definition: with total weight W, the median is the smallest value whose cumulative weight
// exceeds W/2; when the cumulative weight equals W/2 exactly at a value, the median is the mean
// of that value and the next larger one of the same cell. Unweighted, this is the textbook
// median (the middle value, or the mean of the two middle values).
#include <cstddef>
#include <vector>

namespace foldline::stats {

/// Weighted median of `values` (any order) with frequency `weights` (empty: each counts once).
/// NaN values and weights <= 0 are skipped; NaN when nothing is left.
double weighted_median(std::vector<double> values, std::vector<double> weights = {});

/// Medians of several cells from values folded in ascending order.
class SortedMedians {
public:
    /// `totals[c]`: the total weight cell c will receive.
    explicit SortedMedians(std::vector<double> totals);
    /// Folds in the next value (values must come in ascending order over all cells); a cell
    /// index out of range or a weight <= 0 is ignored.
    void add(std::size_t cell, double value, double weight = 1.0);
    /// Median of each cell; NaN for a cell that received nothing. A cell whose cumulative
    /// weight reached exactly half at its last value gets that value.
    std::vector<double> medians() const;

private:
    std::vector<double> half_, cum_, median_, pending_;
};

}  // namespace foldline::stats
