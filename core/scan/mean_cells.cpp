#include "core/scan/mean_cells.h"

#include <algorithm>

namespace foldline {
namespace {

constexpr std::size_t kBlock = 2048;  // a block's cell indexes and deviations stay in L1

// Sums of one check's cells about fixed origins: per cell one 32-byte record (count, Σd, Σd²,
// unused) so that a row's update touches one cache line, as two 2-wide additions.
typedef double Pair2 __attribute__((vector_size(16)));
struct alignas(32) Record {
    Pair2 ns;   // count, Σd
    Pair2 sq;   // Σd², unused
};
struct Sums {
    std::vector<Record> r;
    explicit Sums(std::size_t cells) : r(cells, Record{Pair2{0, 0}, Pair2{0, 0}}) {}
    std::size_t size() const { return r.size(); }
    double n(std::size_t c) const { return r[c].ns[0]; }
    double s1(std::size_t c) const { return r[c].ns[1]; }
    double s2(std::size_t c) const { return r[c].sq[0]; }
};

// One cell's sums about its first value (the exact form; see MeanMoments).
struct FirstValueCell {
    double rows = 0, y0 = 0, s1 = 0, s2 = 0;
    void add(double y) {
        if (rows == 0) y0 = y;
        const double d = y - y0;
        rows += 1;
        s1 += d;
        s2 += d * d;
    }
};

stats::MeanMoments moments_of(double rows, double origin, double s1, double s2) {
    stats::MeanMoments m;
    if (!(rows > 0)) return m;
    m.rows = rows;
    m.w = rows;
    m.y0 = origin;
    m.dy = s1 / rows;
    m.css = rows > 1 ? std::max(0.0, s2 - s1 * m.dy) : 0.0;
    return m;
}

// True when a used cell (code below `codes`, slot below `slots`) lost more than kMaxLoss.
bool lost_digits(const Sums& sums, std::size_t codes, std::size_t slots) {
    const std::size_t stride = slots + 1;
    for (std::size_t k = 0; k < codes; ++k)
        for (std::size_t g = 0; g < slots; ++g) {
            const std::size_t c = k * stride + g;
            const double n = sums.n(c);
            if (n < 2) continue;
            const double s1 = sums.s1(c), s2 = sums.s2(c);
            const double css = s2 - s1 * (s1 / n);
            if (!(s2 <= kMaxLoss * css)) return true;
        }
    return false;
}

// Cells of a summed check as moments; `origin(c)` gives cell c's origin.
template <typename Origin>
std::vector<stats::MeanMoments> to_moments(const Sums& sums, Origin origin) {
    std::vector<stats::MeanMoments> out(sums.size());
    for (std::size_t c = 0; c < out.size(); ++c) out[c] = moments_of(sums.n(c), origin(c), sums.s1(c), sums.s2(c));
    return out;
}

// The exact form: each cell about its first value. `cell_of(i)` gives row i's cell.
template <typename CellOf>
std::vector<stats::MeanMoments> exact_cells(const MeanCellRows& rows, std::size_t cells, CellOf cell_of) {
    std::vector<FirstValueCell> acc(cells);
    const std::size_t n = rows.slot.size();
    for (std::size_t i = 0; i < n; ++i) {
        if (rows.slot[i] == rows.slots) continue;
        acc[cell_of(i)].add(rows.y[i]);
    }
    std::vector<stats::MeanMoments> out(cells);
    for (std::size_t c = 0; c < cells; ++c) out[c] = moments_of(acc[c].rows, acc[c].y0, acc[c].s1, acc[c].s2);
    return out;
}

// Consecutive rows often fall in the same cell; each of kCopies interleaved copies of the sums
// takes every other row, so one row's update does not wait for the previous row's store.
constexpr std::size_t kCopies = 2;

template <typename C>
void add_block(const std::uint32_t* base, const double* d, const C* code, std::size_t m, std::uint32_t stride,
               std::size_t cells, Record* rec) {
    Record* r0 = rec;
    Record* r1 = rec + cells;
    std::size_t i = 0;
    for (; i + kCopies <= m; i += kCopies) {
        const std::uint32_t c0 = static_cast<std::uint32_t>(code[i]) * stride + base[i];
        const std::uint32_t c1 = static_cast<std::uint32_t>(code[i + 1]) * stride + base[i + 1];
        const double d0 = d[i], d1 = d[i + 1];
        r0[c0].ns += Pair2{1.0, d0};
        r0[c0].sq += Pair2{d0 * d0, 0.0};
        r1[c1].ns += Pair2{1.0, d1};
        r1[c1].sq += Pair2{d1 * d1, 0.0};
    }
    for (; i < m; ++i) {
        const std::uint32_t c = static_cast<std::uint32_t>(code[i]) * stride + base[i];
        r0[c].ns += Pair2{1.0, d[i]};
        r0[c].sq += Pair2{d[i] * d[i], 0.0};
    }
}

// Adds the copies into the first.
void fold(Sums& sums, std::size_t cells) {
    for (std::size_t k = 1; k < kCopies; ++k)
        for (std::size_t c = 0; c < cells; ++c) {
            sums.r[c].ns += sums.r[k * cells + c].ns;
            sums.r[c].sq += sums.r[k * cells + c].sq;
        }
    sums.r.resize(cells);
}

}  // namespace

std::vector<stats::MeanMoments> pooled_slot_moments(const MeanCellRows& rows) {
    return exact_cells(rows, rows.slots + 1, [&](std::size_t i) { return rows.slot[i]; });
}

std::vector<stats::MeanMoments> single_cells(const MeanCellRows& rows, const Column& a, const std::vector<double>& origins) {
    const std::size_t stride = rows.slots + 1, la = a.levels.size(), cells = (la + 1) * stride;
    const std::size_t n = rows.slot.size();
    Sums sums(kCopies * cells);
    std::vector<std::uint32_t> base(kBlock);
    std::vector<double> d(kBlock);
    for (std::size_t from = 0; from < n; from += kBlock) {
        const std::size_t m = std::min(kBlock, n - from);
        for (std::size_t i = 0; i < m; ++i) {
            const std::size_t g = rows.slot[from + i];
            base[i] = static_cast<std::uint32_t>(g);
            d[i] = rows.y[from + i] - origins[g];
        }
        visit_codes(a, [&](const auto& ca) {
            add_block(base.data(), d.data(), ca.data() + from, m, static_cast<std::uint32_t>(stride), cells,
                      sums.r.data());
        });
    }
    fold(sums, cells);
    if (lost_digits(sums, la, rows.slots))
        return visit_codes(a, [&](const auto& ca) {
            return exact_cells(rows, cells, [&](std::size_t i) { return ca[i] * stride + rows.slot[i]; });
        });
    return to_moments(sums, [&](std::size_t c) { return origins[c % stride]; });
}

std::vector<std::vector<stats::MeanMoments>> pair_cells(const MeanCellRows& rows, const Column& a,
                                                        const std::vector<const Column*>& bs,
                                                        const std::vector<double>& origins) {
    const std::size_t stride = rows.slots + 1, la = a.levels.size(), sa = (la + 1) * stride;
    const std::size_t n = rows.slot.size();
    std::vector<Sums> sums;
    for (const Column* b : bs) sums.emplace_back(kCopies * (b->levels.size() + 1) * sa);
    std::vector<std::uint32_t> base(kBlock);
    std::vector<double> d(kBlock);
    for (std::size_t from = 0; from < n; from += kBlock) {
        const std::size_t m = std::min(kBlock, n - from);
        visit_codes(a, [&](const auto& ca) {
            for (std::size_t i = 0; i < m; ++i) {
                const std::size_t c = static_cast<std::size_t>(ca[from + i]) * stride + rows.slot[from + i];
                base[i] = static_cast<std::uint32_t>(c);
                d[i] = rows.y[from + i] - origins[c];
            }
        });
        for (std::size_t j = 0; j < bs.size(); ++j)
            visit_codes(*bs[j], [&](const auto& cb) {
                add_block(base.data(), d.data(), cb.data() + from, m, static_cast<std::uint32_t>(sa),
                          sums[j].size() / kCopies, sums[j].r.data());
            });
    }
    for (auto& sm : sums) fold(sm, sm.size() / kCopies);
    std::vector<std::vector<stats::MeanMoments>> out;
    for (std::size_t j = 0; j < bs.size(); ++j) {
        // Cells (code_b, code_a, slot) read as codes code_b * (la + 1) + code_a: a used cell has
        // both codes below their missing value.
        const std::size_t lb = bs[j]->levels.size();
        bool lost = false;
        for (std::size_t kb = 0; kb < lb && !lost; ++kb) {
            Sums part(0);
            part.r.assign(sums[j].r.begin() + kb * sa, sums[j].r.begin() + kb * sa + la * stride);
            lost = lost_digits(part, la, rows.slots);
        }
        if (lost) {
            out.push_back(visit_codes(a, [&](const auto& ca) {
                return visit_codes(*bs[j], [&](const auto& cb) {
                    return exact_cells(rows, sums[j].size(),
                                       [&](std::size_t i) { return (cb[i] * (la + 1) + ca[i]) * stride + rows.slot[i]; });
                });
            }));
            continue;
        }
        out.push_back(to_moments(sums[j], [&](std::size_t c) { return origins[c % sa]; }));
    }
    return out;
}

}  // namespace foldline
