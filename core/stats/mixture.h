#pragma once
// Two-dimensional Gaussian mixtures with full covariances, fitted by EM (Dempster, Laird &
// Rubin 1977) from several seeded k-means++ starts (Arthur & Vassilvitskii 2007), the number
// of components chosen by BIC (Schwarz 1978): BIC = −2 log L + (6k − 1) ln n.
//
// Inputs are standardised (each coordinate to mean 0, SD 1) for the fit and the results mapped
// back; log-likelihoods and BIC are reported on the original scale. A ridge of
// `regularisation` (in standardised units) is added to every covariance diagonal. Inputs larger
// than `max_points` are replaced by a seeded simple random sample of that size (default
// 10,000), so the cost is bounded and the result deterministic for a seed.
#include "core/common/error.h"
#include "core/common/progress.h"

#include <cstddef>
#include <cstdint>
#include <vector>

namespace foldline {

struct Gaussian2 {
    double weight = 0;           ///< mixing proportion
    double mean[2] = {0, 0};
    double cov[3] = {0, 0, 0};   ///< var x, cov xy, var y
};

struct MixtureFit {
    int k = 0;
    bool ok = false;             ///< false: every start degenerated (a component lost its points)
    std::vector<Gaussian2> components;  ///< sorted by mean x, then mean y
    double log_likelihood = 0;   ///< NaN when !ok
    double bic = 0;              ///< NaN when !ok
    int iterations = 0;          ///< EM iterations of the best start
    bool converged = false;
};

struct MixtureOptions {
    int k_max = 6;
    int starts = 5;
    int max_iterations = 300;
    double tolerance = 1e-5;     ///< stop when the log-likelihood per point improves less
    double regularisation = 1e-6;
    std::size_t max_points = 10000;
    std::uint64_t seed = 1;
};

/// Best of `options.starts` EM runs with k components on the points (x[i], y[i]); the caller
/// passes finite values only and at most max_points of them (no subsampling here). ok == false
/// when k < 1, there are fewer than 2k points per coordinate pair, or every start degenerated.
MixtureFit fit_gaussian_mixture(const std::vector<double>& x, const std::vector<double>& y, int k,
                                const MixtureOptions& options);

struct MixtureSelection {
    std::vector<MixtureFit> fits;  ///< fits[k − 1] for k = 1..k_max
    int best_k = 0;                ///< smallest BIC among ok fits; 0 when none is ok
    std::size_t points = 0;        ///< points fitted (after subsampling)
};

/// Subsamples (seeded) to max_points, fits k = 1..k_max and picks the smallest BIC. Pairs with
/// a NaN are dropped first. Errors: fewer than 12 usable points, either coordinate without
/// spread, cancellation.
Result<MixtureSelection> select_gaussian_mixture(const std::vector<double>& x,
                                                 const std::vector<double>& y,
                                                 const MixtureOptions& options,
                                                 const Work& work = {});

}  // namespace foldline
