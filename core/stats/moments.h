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

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <vector>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

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

    /// Summary from sums of values centred by a shift, as a database returns them: n rows of
    /// weight 1 with Σdx, Σdy, Σdx², Σdxdy, Σdy² where dx = x − shift_x, dy = y − shift_y. The
    /// co-moments are Σdx² − (Σdx)²/n and so on (negative rounding clamped to 0); a stratum known
    /// to have one x (or y) value gets exactly 0 for the co-moments of that variable. Empty when
    /// n <= 0.
    static BivariateMoments from_centred_sums(double n, double sx, double sy, double sxx, double sxy,
                                              double syy, double shift_x, double shift_y,
                                              bool x_constant = false, bool y_constant = false);

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
/// block sums are folded into the stratum's summary and the shift re-centred. With few strata
/// (<= 64) add_rows spreads consecutive rows over four independent sets of block sums (merged
/// when folding) so that rows of the same stratum do not wait on each other. No allocation
/// happens per row.
class StratumMoments {
public:
    /// `strata` codes 0..strata−1 are accepted. block_rows 0 means the default (65536).
    explicit StratumMoments(std::size_t strata, std::size_t block_rows = 0);

    /// Adds one row to stratum k (k < strata; not checked). NaN values must be filtered first.
    void add(std::size_t k, double x, double y, double weight = 1.0) {
        push<true>(k, k, x, y, weight);
        if (++pending_ >= block_rows_) fold();
    }

    /// Adds rows 0..n−1: row i goes to stratum a[i]·kb + b[i] (a[i] when b is null), with
    /// weight w[i] (1 when w is null). Codes must be below the stratum count; values finite.
    template <typename T>
    void add_rows(const T* a, const T* b, std::size_t kb, const double* x, const double* y,
                  const double* w, std::size_t n) {
        std::size_t i0 = 0;
        while (i0 < n) {
            const std::size_t i1 = i0 + std::min(n - i0, block_rows_ - pending_);
            if (b && w) run<true, true>(a, b, kb, x, y, w, i0, i1);
            else if (b) run<true, false>(a, b, kb, x, y, w, i0, i1);
            else if (w) run<false, true>(a, b, kb, x, y, w, i0, i1);
            else run<false, false>(a, b, kb, x, y, w, i0, i1);
            pending_ += i1 - i0;
            i0 = i1;
            if (pending_ >= block_rows_) fold();
        }
    }

    /// Folds the open blocks and returns one summary per stratum (empty ones for unseen codes).
    std::vector<BivariateMoments> finish();

private:
    static constexpr std::size_t kLanes = 4;
    static constexpr std::size_t kFewStrata = 64;
    struct Block {
        double rows = 0, w = 0, sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
        double sx0 = 0, sy0 = 0;
    };
    template <bool Pair, bool Weighted, typename T>
    void run(const T* a, const T* b, std::size_t kb, const double* x, const double* y,
             const double* w, std::size_t i0, std::size_t i1) {
        const std::size_t s = total_.size(), mask = lane_mask_;
        for (std::size_t i = i0; i < i1; ++i) {
            const std::size_t k = Pair ? std::size_t{a[i]} * kb + b[i] : std::size_t{a[i]};
            push<Weighted>((i & mask) * s + k, k, x[i], y[i], Weighted ? w[i] : 1.0);
        }
    }
    template <bool Weighted>
    void push(std::size_t slot, std::size_t k, double x, double y, double weight) {
        Block& b = block_[slot];
        if (b.rows == 0) start_block(b, k, x, y);
#if defined(__SSE2__)
        // The same additions and products as below, two fields per instruction: (rows, w),
        // (sx, sy) and (sxx, sxy) are neighbours in Block. Each field sees the same operations
        // in the same order, so the sums are bit-for-bit those of the scalar code.
        const __m128d d = _mm_sub_pd(_mm_set_pd(y, x), _mm_loadu_pd(&b.sx0));
        const __m128d wd = Weighted ? _mm_mul_pd(_mm_set1_pd(weight), d) : d;
        const double wdx = _mm_cvtsd_f64(wd), dy = _mm_cvtsd_f64(_mm_unpackhi_pd(d, d));
        const double wdy = _mm_cvtsd_f64(_mm_unpackhi_pd(wd, wd));
        _mm_storeu_pd(&b.rows, _mm_add_pd(_mm_loadu_pd(&b.rows), _mm_set_pd(weight, 1.0)));
        _mm_storeu_pd(&b.sx, _mm_add_pd(_mm_loadu_pd(&b.sx), wd));
        _mm_storeu_pd(&b.sxx, _mm_add_pd(_mm_loadu_pd(&b.sxx), _mm_mul_pd(_mm_set1_pd(wdx), d)));
        b.syy += wdy * dy;
#else
        const double dx = x - b.sx0, dy = y - b.sy0;
        const double wdx = Weighted ? weight * dx : dx, wdy = Weighted ? weight * dy : dy;
        b.rows += 1;
        b.w += weight;
        b.sx += wdx;
        b.sy += wdy;
        b.sxx += wdx * dx;
        b.sxy += wdx * dy;
        b.syy += wdy * dy;
#endif
    }
    void start_block(Block& b, std::size_t k, double x, double y);
    void fold();

    std::size_t lane_mask_;     // kLanes − 1 for few strata, else 0
    std::vector<Block> block_;  // lanes × strata, lane-major
    std::vector<BivariateMoments> total_;
    std::size_t block_rows_;
    std::size_t pending_ = 0;
};

}  // namespace foldline
