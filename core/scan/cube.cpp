#include "core/scan/cube.h"

#include <algorithm>
#include <cstdint>

namespace foldline {

namespace {

// Counting kernel: idx(i) = code[i] * (W + 1) + cell[i] into a flat histogram. Two interleaved
// histograms halve the store-to-load dependency when consecutive rows hit the same counter.
template <typename C>
void count_single(const std::vector<C>& codes, const std::uint8_t* cell, std::size_t n, std::size_t w1,
                  const double* weights, std::vector<double>& hist) {
    if (!weights) {
        std::vector<std::uint32_t> h0(hist.size(), 0), h1(hist.size(), 0);
        std::size_t i = 0;
        for (; i + 1 < n; i += 2) {
            ++h0[codes[i] * w1 + cell[i]];
            ++h1[codes[i + 1] * w1 + cell[i + 1]];
        }
        if (i < n) ++h0[codes[i] * w1 + cell[i]];
        for (std::size_t k = 0; k < hist.size(); ++k) hist[k] = static_cast<double>(h0[k]) + h1[k];
    } else {
        for (std::size_t i = 0; i < n; ++i) hist[codes[i] * w1 + cell[i]] += weights[i];
    }
}

template <typename C1, typename C2>
void count_pair(const std::vector<C1>& c1, const std::vector<C2>& c2, std::size_t k2, const std::uint8_t* cell,
                std::size_t n, std::size_t w1, const double* weights, std::vector<double>& hist) {
    const std::size_t stride = k2 * w1;
    if (!weights) {
        std::vector<std::uint32_t> h0(hist.size(), 0), h1(hist.size(), 0);
        std::size_t i = 0;
        for (; i + 1 < n; i += 2) {
            ++h0[c1[i] * stride + c2[i] * w1 + cell[i]];
            ++h1[c1[i + 1] * stride + c2[i + 1] * w1 + cell[i + 1]];
        }
        if (i < n) ++h0[c1[i] * stride + c2[i] * w1 + cell[i]];
        for (std::size_t k = 0; k < hist.size(); ++k) hist[k] = static_cast<double>(h0[k]) + h1[k];
    } else {
        for (std::size_t i = 0; i < n; ++i) hist[c1[i] * stride + c2[i] * w1 + cell[i]] += weights[i];
    }
}

// Fused pair counting, layout [code2][code1][cell]: base[i] = code1[i] * w1 + cell[i] is shared by
// every pair of the first column, so a pair's counter is base[i] + code2[i] * s1.
template <typename C>
void make_base(const C* c1, const std::uint8_t* cell, std::size_t n, std::uint32_t w1, std::uint32_t* base) {
    for (std::size_t i = 0; i < n; ++i) base[i] = static_cast<std::uint32_t>(c1[i]) * w1 + cell[i];
}

template <typename C>
void count_with_base(const std::uint32_t* base, const C* c2, std::size_t n, std::uint32_t s1, std::uint32_t* h0,
                     std::uint32_t* h1) {
    std::size_t i = 0;
    for (; i + 1 < n; i += 2) {
        ++h0[static_cast<std::uint32_t>(c2[i]) * s1 + base[i]];
        ++h1[static_cast<std::uint32_t>(c2[i + 1]) * s1 + base[i + 1]];
    }
    if (i < n) ++h0[static_cast<std::uint32_t>(c2[i]) * s1 + base[i]];
}

// Copies the non-missing strata and the real slots out of the padded histogram.
CountCube finish(const std::vector<double>& hist, std::size_t k1, std::size_t k2, std::size_t slots) {
    // hist layout: [(code1 * (k2 + 1) + code2)][cell 0 .. 2 * slots] with k2 = 0 for single cubes
    // handled by the caller passing k2 = 0 and k1 levels.
    CountCube cube;
    cube.slots = slots;
    const std::size_t w1 = 2 * slots + 1;
    const bool pair = k2 > 0;
    cube.strata = pair ? k1 * k2 : k1;
    cube.counts.assign(cube.strata * slots * 2, 0.0);
    for (std::size_t s = 0; s < cube.strata; ++s) {
        const std::size_t src = pair ? (s / k2) * (k2 + 1) + s % k2 : s;
        for (std::size_t c = 0; c < 2 * slots; ++c) cube.counts[s * 2 * slots + c] = hist[src * w1 + c];
    }
    return cube;
}

}  // namespace

double CountCube::stratum_total(std::size_t s) const {
    double t = 0;
    for (std::size_t c = 0; c < 2 * slots; ++c) t += counts[s * 2 * slots + c];
    return t;
}

CountCube build_cube(const Column& s, const RowCells& rows, const std::vector<double>& weights) {
    const std::size_t k = s.levels.size(), w1 = 2 * rows.slots + 1;
    std::vector<double> hist((k + 1) * w1, 0.0);
    const std::size_t n = rows.cell.size();
    visit_codes(s, [&](const auto& codes) {
        count_single(codes, rows.cell.data(), std::min(n, codes.size()), w1,
                     weights.empty() ? nullptr : weights.data(), hist);
    });
    return finish(hist, k, 0, rows.slots);
}

CountCube build_pair_cube(const Column& a, const Column& b, const RowCells& rows,
                          const std::vector<double>& weights) {
    const std::size_t k1 = a.levels.size(), k2 = b.levels.size(), w1 = 2 * rows.slots + 1;
    std::vector<double> hist((k1 + 1) * (k2 + 1) * w1, 0.0);
    const std::size_t n = rows.cell.size();
    visit_codes(a, [&](const auto& ca) {
        visit_codes(b, [&](const auto& cb) {
            count_pair(ca, cb, k2 + 1, rows.cell.data(), std::min({n, ca.size(), cb.size()}), w1,
                       weights.empty() ? nullptr : weights.data(), hist);
        });
    });
    if (k2 == 0) return finish(hist, 0, 0, rows.slots);
    return finish(hist, k1, k2, rows.slots);
}

std::vector<CountCube> build_pair_cubes(const Column& first, const std::vector<const Column*>& seconds,
                                        const RowCells& rows, const std::vector<double>& weights) {
    std::vector<CountCube> out;
    out.reserve(seconds.size());
    if (!weights.empty() || seconds.size() < 2) {
        for (const Column* b : seconds) out.push_back(build_pair_cube(first, *b, rows, weights));
        return out;
    }
    const std::size_t k1 = first.levels.size(), w1 = 2 * rows.slots + 1, s1 = (k1 + 1) * w1;
    std::size_t n = std::min(rows.cell.size(), first.size());
    for (const Column* b : seconds) n = std::min(n, b->size());
    // Two interleaved histograms per pair, as in count_pair.
    std::vector<std::vector<std::uint32_t>> hist(seconds.size());
    for (std::size_t k = 0; k < seconds.size(); ++k) hist[k].assign(2 * (seconds[k]->levels.size() + 1) * s1, 0);
    constexpr std::size_t kBlock = 4096;  // base, codes and cells of a block stay in L1
    std::vector<std::uint32_t> base(kBlock);
    const auto w = static_cast<std::uint32_t>(w1), s = static_cast<std::uint32_t>(s1);
    for (std::size_t from = 0; from < n; from += kBlock) {
        const std::size_t m = std::min(kBlock, n - from);
        visit_codes(first, [&](const auto& c1) { make_base(c1.data() + from, rows.cell.data() + from, m, w, base.data()); });
        for (std::size_t k = 0; k < seconds.size(); ++k) {
            std::uint32_t* h0 = hist[k].data();
            std::uint32_t* h1 = h0 + hist[k].size() / 2;
            visit_codes(*seconds[k], [&](const auto& c2) { count_with_base(base.data(), c2.data() + from, m, s, h0, h1); });
        }
    }
    for (std::size_t k = 0; k < seconds.size(); ++k) {
        const std::size_t k2 = seconds[k]->levels.size(), half = hist[k].size() / 2;
        CountCube cube;
        cube.slots = rows.slots;
        cube.strata = k1 * k2;
        cube.counts.assign(cube.strata * rows.slots * 2, 0.0);
        for (std::size_t st = 0; st < cube.strata; ++st) {
            const std::size_t src = (st % k2) * s1 + (st / k2) * w1;
            for (std::size_t c = 0; c < 2 * rows.slots; ++c)
                cube.counts[st * 2 * rows.slots + c] =
                    static_cast<double>(hist[k][src + c]) + static_cast<double>(hist[k][half + src + c]);
        }
        out.push_back(std::move(cube));
    }
    return out;
}

stats::Strata comparison_strata(const CountCube& cube, std::size_t focal_slot, std::vector<std::size_t>* kept) {
    stats::Strata out;
    if (kept) kept->clear();
    for (std::size_t s = 0; s < cube.strata; ++s) {
        stats::StratumCounts t;
        t.a = cube.at(s, focal_slot, 1);
        t.b = cube.at(s, focal_slot, 0);
        t.c = cube.at(s, 0, 1);
        t.d = cube.at(s, 0, 0);
        if (t.total() <= 0) continue;
        out.push_back(t);
        if (kept) kept->push_back(s);
    }
    return out;
}

}  // namespace foldline
