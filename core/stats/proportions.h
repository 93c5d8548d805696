#pragma once
// Single proportions and differences of two independent proportions with score intervals.
//   Wilson (1927, JASA 22:209) score interval for one proportion.
//   Newcombe (1998, Stat Med 17:873, method 10) hybrid score interval for p1 - p2, built from
//   the two Wilson intervals. Neither needs a continuity correction; zero counts are fine.
// Counts are doubles so weighted (pre-counted) data pass straight through.

namespace foldline::stats {

struct Interval {
    double lo;
    double hi;
};

/// Proportion x/n; NaN when n <= 0.
double proportion(double x, double n);

/// Wilson score interval for x successes out of n at level 1 - alpha (default 95%).
/// {NaN, NaN} when n <= 0 or x outside [0, n]; exactly 0 (1) at the end where x == 0 (x == n).
Interval wilson(double x, double n, double alpha = 0.05);

/// Newcombe's hybrid score interval for x1/n1 - x2/n2 at level 1 - alpha.
/// {NaN, NaN} when either n <= 0.
Interval newcombe_difference(double x1, double n1, double x2, double n2, double alpha = 0.05);

}  // namespace foldline::stats
