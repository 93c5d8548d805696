#pragma once
// The memo's trend chart for one slope finding: points, each stratum's fitted line and the
// pooled line, read from the rows (the lines use the finding's own slopes; a least-squares
// line passes through its group's mean, which fixes the intercept).
#include <cstddef>

#include "core/report/memo_content.h"
#include "core/scan/slope_scan.h"
#include "core/table/table.h"

namespace foldline::report {

/// Up to this many points are drawn by default; more are thinned evenly (every k-th row).
inline constexpr std::size_t kMaxChartPoints = 4000;

/// The chart of `finding` over `table`. Strata are rebuilt with joint_stratifier (numeric
/// stratifiers cut with `bins` / `max_levels` as the scan cut them) and matched to the finding's
/// groups by label; rows in no matched group (a missing cell) are drawn with group -1. A stratum
/// whose slope is undefined (NaN) or which has no rows gets no line. x or y not a numeric column
/// of `table`, or no row with both present → no points, no lines, pooled unset; max_points == 0
/// → lines only.
MemoScatter slope_chart(const Table& table, const SlopeFinding& finding, int bins = 4, std::size_t max_levels = 50,
                        std::size_t max_points = kMaxChartPoints);

}  // namespace foldline::report
