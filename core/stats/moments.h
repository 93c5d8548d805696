#pragma once
// Per-stratum moment sums: the sufficient statistics of every slope figure.
//
// A stratum is summarised by its row count, its total weight, the weighted means and the
// weighted centred co-moments (Σ w (x−x̄)(y−ȳ) and friends). Summaries merge exactly
// (Chan, Golub & LeVeque 1979, pairwise update), so moments computed elsewhere — another
// thread, another file, a database's GROUP BY — combine into the same answer as one pass.
//
// Numerical stability: centred co-moments are never formed as Σxy − ΣxΣy/n over the whole
// input. Single rows are folded in with West's (1979) weighted Welford update; the scan's hot
// loop (StratumMoments) instead sums deviations from a per-stratum shift that is re-centred on
// the running mean every block of rows, which keeps cancellation bounded by the spread of a
// block around the stratum's mean, not by the magnitude of the values.
#include <Eigen/Core>

#include <cstddef>
#include <cstdint>
#include <vector>

namespace foldline {

/// Weighted bivariate moments of (x, y) about their means. A default value is empty (w == 0).
/// Means are held as origin + offset, the origin being the first value folded in: the offset
/// stays small even when the values are huge, so deviations keep every significant digit.
struct BivariateMoments {
    double rows = 0;  ///< rows folded in (unweighted count)
    double w = 0;     ///< Σ weights: the number of observations for pre-counted data
    double x0 = 0;    ///< origin of x (any value; the first one folded in)
    double y0 = 0;    ///< origin of y
    double dx = 0;    ///< weighted mean of x minus x0
    double dy = 0;    ///< weighted mean of y minus y0
    double cxx = 0;   ///< Σ w (x − x̄)²
    double cxy = 0;   ///< Σ w (x − x̄)(y − ȳ)
    double cyy = 0;   ///< Σ w (y − ȳ)²

    /// Weighted mean of x; 0 when empty.
    double mean_x() const { return x0 + dx; }
    /// Weighted mean of y; 0 when empty.
    double mean_y() const { return y0 + dy; }
    /// Summary from figures computed elsewhere (weight, means, centred co-moments).
    static BivariateMoments from_means(double rows, double w, double mean_x, double mean_y,
                                       double cxx, double cxy, double cyy);

    /// Folds in one row. A weight <= 0 or a NaN value leaves the moments unchanged.
    void add(double x, double y, double weight = 1.0);
    /// Folds in another summary (exact pairwise merge). Merging an empty summary only adds its
    /// row count.
    void merge(const BivariateMoments& other);
    /// True when nothing has been folded in.
    bool empty() const { return w <= 0; }
};

/// Merge of all parts, in order; empty when `parts` is empty.
BivariateMoments merge_all(const std::vector<BivariateMoments>& parts);

/// Weighted moments of a vector z (dimension d): means and the centred cross-product matrix
/// Σ w (z − z̄)(z − z̄)ᵀ. Used when covariates join x and y: by convention z = (x, c1..cp, y).
/// Means are held as origin (first row) + offset, as in BivariateMoments.
struct MomentMatrix {
    double rows = 0;
    double w = 0;
    Eigen::VectorXd origin;  ///< size d (zeros when empty)
    Eigen::VectorXd offset;  ///< mean − origin
    Eigen::MatrixXd cross;   ///< d × d, symmetric (zeros when empty)

    MomentMatrix() = default;
    /// Empty summary of dimension d.
    explicit MomentMatrix(Eigen::Index d);
    Eigen::Index dim() const { return origin.size(); }
    /// Weighted means (zeros when empty).
    Eigen::VectorXd mean() const { return origin + offset; }
    /// Folds in one row of d values (weighted Welford). weight <= 0 leaves it unchanged; the
    /// caller filters rows with NaN (a NaN would poison every entry).
    void add(const double* z, double weight = 1.0);
    /// Exact pairwise merge. Merging an empty summary only adds its row count; dimensions must
    /// agree.
    void merge(const MomentMatrix& other);
    /// The (x, y) summary, taking x = index 0 and y = index d−1; empty when d < 2.
    BivariateMoments xy() const;
    bool empty() const { return w <= 0; }
};

/// Accumulates one BivariateMoments per stratum code from a stream of rows — the scan's hot
/// loop. Each stratum keeps running block sums of deviations from a shift equal to its mean at
/// the start of the block (its first value in the first block); every `block_rows` rows the
/// block sums are folded into the stratum's summary and the shift re-centred. No allocation
/// happens per row.
class StratumMoments {
public:
    /// `strata` codes 0..strata−1 are accepted. block_rows 0 means the default (16384).
    explicit StratumMoments(std::size_t strata, std::size_t block_rows = 0);

    /// Adds one row to stratum k (k < strata; not checked). NaN values must be filtered first.
    void add(std::size_t k, double x, double y, double weight = 1.0) {
        Block& b = block_[k];
        if (b.rows == 0) start_block(k, x, y);
        const double dx = x - b.sx0, dy = y - b.sy0;
        const double wdx = weight * dx, wdy = weight * dy;
        b.rows += 1;
        b.w += weight;
        b.sx += wdx;
        b.sy += wdy;
        b.sxx += wdx * dx;
        b.sxy += wdx * dy;
        b.syy += wdy * dy;
        if (++pending_ == block_rows_) fold();
    }

    /// Folds the open blocks and returns one summary per stratum (empty ones for unseen codes).
    std::vector<BivariateMoments> finish();

private:
    struct Block {
        double rows = 0, w = 0, sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
        double sx0 = 0, sy0 = 0;
    };
    void start_block(std::size_t k, double x, double y);
    void fold();

    std::vector<Block> block_;
    std::vector<BivariateMoments> total_;
    std::size_t block_rows_;
    std::size_t pending_ = 0;
};

}  // namespace foldline
