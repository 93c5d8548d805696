#pragma once
// Tests of conditional independence X ⫫ Y | Z from summaries (never rows).
//   g_squared_test: the likelihood-ratio statistic G² = 2 Σ O ln(O/E) summed over the strata
//     of Z, E = row total × column total / stratum total (Agresti 2002, Categorical Data
//     Analysis, 2nd ed., §3.2.1; summed over strata as in Spirtes, Glymour & Scheines 2000,
//     §5.4.2). Degrees of freedom per stratum (r_s − 1)(c_s − 1) over the rows and columns that
//     occur in that stratum (empty rows and columns dropped: common practice).
//   partial_correlation_test: the partial correlation of X and Y given Z from pooled
//     within-stratum sums of squares and cross-products (stratum intercepts for the categorical
//     part of Z, linear terms for its numeric part), tested by Fisher's z with √(n − k − 3),
//     k = number of regressors (Fisher 1924, Metron 3:329; Anderson 2003, An Introduction to
//     Multivariate Statistical Analysis, 3rd ed., §4.3).
#include <cstddef>
#include <vector>

#include <Eigen/Dense>

namespace foldline::stats {

struct CiTest {
    double statistic = 0;  ///< G², or Fisher's z for a partial correlation
    double df = 0;         ///< G² degrees of freedom; NaN for Fisher's z
    double p = 0;          ///< NaN when not assessable (df 0, too few rows, constant column)
    double n = 0;          ///< weighted rows used
    double partial_r = 0;  ///< partial correlation (Fisher's z only; NaN for G²)
};

/// Counts of X (rows) × Y (columns) in each stratum of Z: cells[(s × rows + i) × cols + j].
struct StratifiedCounts {
    std::size_t strata = 0;
    std::size_t rows = 0;
    std::size_t cols = 0;
    std::vector<double> cells;
    double& at(std::size_t s, std::size_t i, std::size_t j) { return cells[(s * rows + i) * cols + j]; }
    double at(std::size_t s, std::size_t i, std::size_t j) const { return cells[(s * rows + i) * cols + j]; }
};

/// G² over the strata; p from the chi-square survival function. df 0 (every stratum has one
/// occurring level of X or of Y, or no counts at all) → statistic 0, p NaN.
CiTest g_squared_test(const StratifiedCounts& counts);

/// Pooled within-stratum sums of squares and cross-products of (Z numeric..., X, Y): X and Y
/// are the last two variables. `strata` = number of strata that hold rows, `n` = Σ weights.
struct WithinMoments {
    Eigen::MatrixXd sscp;
    double n = 0;
    std::size_t strata = 1;
};

/// Partial correlation of the last two variables given the others and the strata, with
/// Fisher's z test. Numeric terms that are linear combinations of others count once (rank).
/// A constant X or Y (after adjustment), or n − k − 3 ≤ 0 → p NaN.
CiTest partial_correlation_test(const WithinMoments& m);

}  // namespace foldline::stats
