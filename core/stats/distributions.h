#pragma once
// Tail probabilities and quantiles used by the rate statistics. P-values are always computed as
// survival functions (Boost.Math complement()), never as 1 - cdf, so tiny p-values keep their
// precision.
namespace foldline::stats {

/// P(X > x) for X ~ chi-square(df). NaN for NaN x or df <= 0; 1 for x <= 0.
double chi_square_sf(double x, double df);

/// P(Z > z) for a standard normal Z. NaN for NaN z; 0 for +inf, 1 for -inf.
double normal_sf(double z);

/// Two-sided normal p-value 2 P(Z > |z|). NaN for NaN z.
double normal_two_sided_p(double z);

/// The standard normal quantile q with P(Z > q) = upper (e.g. 1.959964 for 0.025).
/// NaN unless 0 < upper < 1.
double normal_upper_quantile(double upper);

/// z for a two-sided (1 - alpha) interval: normal_upper_quantile(alpha / 2). NaN unless 0<alpha<1.
double z_for_alpha(double alpha);

}  // namespace foldline::stats
