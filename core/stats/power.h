#pragma once
// Sample size for comparing two rates (normal approximation on Cohen's arcsine scale).
//
// Source: Cohen 1988, Statistical Power Analysis for the Behavioral Sciences, ch. 6: effect size
// h = 2 asin(sqrt p1) - 2 asin(sqrt p2); the arcsine transform has variance 1/n per group, so a
// two-sided test at level alpha with power 1 - beta needs n = 2 ((z_{1-alpha/2} + z_{1-beta}) / h)^2
// rows per group (equal groups). statsmodels' NormalIndPower with proportion_effectsize solves
// the same equation (it also counts the far tail, which changes n by far less than one row).

namespace foldline::stats {

/// Rows per group (not rounded) to detect rates p1 against p2 with the given power, two-sided
/// at alpha. NaN when p1 == p2, a rate lies outside [0, 1], or alpha or power lies outside (0, 1).
double rows_per_group_for_power(double p1, double p2, double alpha, double power);

}  // namespace foldline::stats
