#pragma once
// Stability of mean-gap findings: the share of resamples in which a finding keeps its class,
// as for rates and slopes, computed from the finding's per-stratum sufficient statistics alone
// (so a scan of rows, of a pre-counted file or of a database gives the same draws).
//
// One resample is the row bootstrap of both groups, drawn on sufficient statistics under normal
// theory: each group's observations are redrawn over its strata as one multinomial with the
// observed shares (core/stats/bootstrap.h), then a cell of n* draws from a cell with mean m and
// plug-in variance v = css / n gets mean m + √(v / n*) Z and centred sum of squares v χ²(n* − 1),
// the exact distribution of a bootstrap cell when the values are normal. With skewed values
// (pay) the row bootstrap's cell variances vary more than χ² says, so shares near 1 or 0 are the
// readable ones. Cells of one observation (no SD) redraw as copies of it: mean m, sum of squares 0.
//
// Each finding is seeded from its label and focal group (FNV-1a) and the scan's seed, and its
// strata are resampled in the order of their labels, so the draws depend on neither the order of
// the findings nor the order in which levels first appeared.
#include <cstdint>
#include <vector>

#include "core/common/progress.h"
#include "core/scan/mean_finding.h"

namespace foldline {

/// Share of `draws` resamples in which the class (decided on the raw reversal p) equals f.cls.
/// NaN when draws <= 0 or the finding has no strata.
double mean_class_stability(const MeanFinding& f, double alpha, int draws, std::uint64_t seed);

/// Fills `stability` of every finding whose class is not stable (`draws` resamples each, in
/// parallel on `threads`), reporting progress as "bootstrap". Findings left unfinished by a stop
/// request keep no stability; returns false when stopped.
bool resample_mean_findings(std::vector<MeanFinding>& findings, double alpha, int draws, std::uint64_t seed,
                            unsigned threads, const Work& work = {});

}  // namespace foldline
