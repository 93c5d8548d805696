#pragma once
// The trend checks of a rate scan whose counting ran elsewhere: per-stratum moment sums of y on
// x grouped by each stratifier's values (core/table/grouped_counts.h) are folded into the
// stratifier's levels, as the rate scan's cubes were (core/scan/grouped_cubes.h), and every
// figure comes from those moments (slope_finding_from_moments in core/scan/slope_scan.h).
#include <vector>

#include "core/common/error.h"
#include "core/scan/grouped_cubes.h"
#include "core/scan/slope_scan.h"
#include "core/table/grouped_counts.h"

namespace foldline {

/// One slope check per stratifier of `input` other than q.x and q.y, in stratifier order, as
/// the table scan's scan_slopes gives for singles (q_value NaN, no stability). `counts` must be
/// the counts `input` was built from. Errors: a stratifier without its moment sums, a value
/// absent from the stratifier's own set. No stratifier: an empty list.
Result<std::vector<SlopeFinding>> slope_checks_from_groups(const GroupedMoments& moments,
                                                           const GroupedCounts& counts,
                                                           const GroupedScanInput& input,
                                                           const SlopeQuestion& q);

}  // namespace foldline
