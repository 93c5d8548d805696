#pragma once
// The per-cell sums of the mean scan for row-level data without weights: stratum × group cells
// of every check read straight from the table's code columns (no copy of the codes), in
// blocks that stay in cache, summing deviations from a fixed origin per cell so the per-row work
// is one count and two additions, about what a rate scan's count costs.
//
// Accuracy. A cell's centred sum of squares is Σd² − (Σd)²/n with d = y − origin; it keeps its
// digits while the origin lies within a few of the cell's standard deviations of its mean (the
// loss is the factor Σd² / css). The origin of a single stratifier's cells is their group's
// pooled mean; of a pair's cells, the mean of the first stratifier's cell the pair cell lies in.
// A check with any cell whose factor exceeds kMaxLoss (a stratum far from its parent's mean in
// its own spread, or a cell whose values are all equal) is summed again with the cell's first
// value as its origin (the exact form of core/stats/mean_gap.h), so every cell keeps the
// accuracy that form has.
#include <cstddef>
#include <cstdint>
#include <vector>

#include "core/stats/mean_gap.h"
#include "core/table/table.h"

namespace foldline {

/// The rows of a mean question as the fast path reads them: one group slot per table row (the
/// value `slots` for a row that takes no part) and the analysed value of each row.
struct MeanCellRows {
    std::vector<std::uint8_t> slot;  ///< per table row: group slot, or `slots` when unused
    std::vector<double> y;           ///< per table row: analysed value (unused rows: anything)
    std::size_t slots = 0;
};

/// Largest accepted Σd² / css of a cell before its check is summed again exactly.
inline constexpr double kMaxLoss = 64.0;

/// Per-slot pooled moments over every used row (exact: first-value origin), one per slot.
std::vector<stats::MeanMoments> pooled_slot_moments(const MeanCellRows& rows);

/// Cells of stratifier `a` alone: (a.levels.size() + 1) × (slots + 1) moments, cell
/// (code, slot) at code * (slots + 1) + slot; the last code is the missing value and the last
/// slot the unused rows (both dropped by the caller). `origins` holds one origin per slot.
std::vector<stats::MeanMoments> single_cells(const MeanCellRows& rows, const Column& a,
                                             const std::vector<double>& origins);

/// Cells of the pairs (a, b) for each b in `bs`, one pass over the rows per block: per pair
/// (b.levels.size() + 1) × (a.levels.size() + 1) × (slots + 1) moments, cell (code_a, code_b,
/// slot) at (code_b * (la + 1) + code_a) * (slots + 1) + slot. `origins` holds one origin per
/// cell of `a` alone (as single_cells lays them out).
std::vector<std::vector<stats::MeanMoments>> pair_cells(const MeanCellRows& rows, const Column& a,
                                                        const std::vector<const Column*>& bs,
                                                        const std::vector<double>& origins);

}  // namespace foldline
