#include "core/scan/mean_scan.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <numeric>

#include "core/common/run_tasks.h"
#include "core/scan/mean_analysis.h"
#include "core/scan/mean_cells.h"
#include "core/stats/median.h"

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr std::size_t kSingle = static_cast<std::size_t>(-1);

std::string number_text(double v) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.10g", v);
    return buf;
}

// The rows of the question, compacted to the rows that take part: the group slot, the analysed
// value, the outcome itself, the weight, and each candidate's codes (kMissing when missing).
constexpr std::uint16_t kMissing = 0xFFFF;

struct MeanRows {
    std::vector<std::uint8_t> slot;
    std::vector<double> y;    // analysed value (log y with log_outcome)
    std::vector<double> raw;  // the outcome itself (for medians and pay-gap means)
    std::vector<double> weight;  // empty: every row counts once
    std::vector<std::vector<std::uint16_t>> codes;  // per candidate
    std::vector<std::uint32_t> sorted;  // rows by ascending raw value (pay gap only)
    std::size_t slots = 0;
    std::size_t size() const { return slot.size(); }
};

Result<MeanRows> encode(const Table& t, const Question& g, const MeanQuestion& q, const CandidateSet* cands) {
    MeanRows r;
    r.slots = g.slots();
    const RowCells cells = encode_rows(t, g);  // the outcome bit is irrelevant here; only the slot is read
    const Column& oc = t.columns[g.outcome_column];
    std::vector<std::uint32_t> used;
    used.reserve(t.rows);
    for (std::size_t i = 0; i < t.rows; ++i) {
        if (cells.cell[i] == cells.unused() || !(t.weight(i) > 0)) continue;
        const double v = oc.values[i];
        if (!std::isfinite(v)) continue;
        if (q.log_outcome && !(v > 0))
            return make_error("outcome '" + oc.name + "' is " + number_text(v) + " in data row " + std::to_string(i + 1) +
                                  ": --log-outcome needs every value above 0 (leave the option off, or filter those "
                                  "rows out first)",
                              t.source);
        used.push_back(static_cast<std::uint32_t>(i));
    }
    const std::size_t n = used.size();
    r.slot.resize(n);
    r.y.resize(n);
    r.raw.resize(n);
    if (t.weighted()) r.weight.resize(n);
    for (std::size_t k = 0; k < n; ++k) {
        const std::size_t i = used[k];
        r.slot[k] = static_cast<std::uint8_t>(cells.cell[i] / 2);
        r.raw[k] = oc.values[i];
        r.y[k] = q.log_outcome ? std::log(oc.values[i]) : oc.values[i];
        if (t.weighted()) r.weight[k] = t.weights[i];
    }
    if (cands)
        for (const auto& c : cands->candidates) {
            std::vector<std::uint16_t> codes(n);
            visit_codes(*c.column, [&](const auto& v) {
                const std::size_t miss = c.column->missing_code();
                for (std::size_t k = 0; k < n; ++k) {
                    const std::size_t code = v[used[k]];
                    codes[k] = code >= miss ? kMissing : static_cast<std::uint16_t>(code);
                }
            });
            r.codes.push_back(std::move(codes));
        }
    if (q.pay_gap) {
        r.sorted.resize(n);
        for (std::size_t k = 0; k < n; ++k) r.sorted[k] = static_cast<std::uint32_t>(k);
        std::sort(r.sorted.begin(), r.sorted.end(), [&](std::uint32_t a, std::uint32_t b) { return r.raw[a] < r.raw[b]; });
    }
    return r;
}

// The rows as the fast path reads them (row-level data without weights): every table row with
// its group slot (slots for a row that takes no part) and its analysed value.
MeanCellRows cell_rows(const Table& t, const Question& g, const MeanQuestion& q) {
    MeanCellRows r;
    r.slots = g.slots();
    const RowCells cells = encode_rows(t, g);
    const Column& oc = t.columns[g.outcome_column];
    r.slot.resize(t.rows);
    r.y.resize(t.rows);
    const auto unused = static_cast<std::uint8_t>(r.slots);
    for (std::size_t i = 0; i < t.rows; ++i) {
        const double v = oc.values[i];
        const bool use = cells.cell[i] != cells.unused() && std::isfinite(v);
        r.slot[i] = use ? static_cast<std::uint8_t>(cells.cell[i] / 2) : unused;
        r.y[i] = !use ? 0.0 : q.log_outcome ? std::log(v) : v;
    }
    return r;
}

// Origins for the cells of a summed check: each cell's mean, 0 where it has none.
std::vector<double> cell_origins(const std::vector<stats::MeanMoments>& cells) {
    std::vector<double> o(cells.size(), 0.0);
    for (std::size_t c = 0; c < cells.size(); ++c) {
        const double m = cells[c].mean();
        if (std::isfinite(m)) o[c] = m;
    }
    return o;
}

// One cell's sums about its origin (the first value folded in): the shifted-data form of the
// centred sums (Chan, Golub & LeVeque 1983). Folding in needs no division, and because the origin
// lies within the cell's own spread of its mean, Σd² − (Σd)²/Σw loses only as many digits as
// (origin − mean)² / variance has (values near 1e6 with unit spread keep their digits).
struct Cell {
    double rows = 0, w = 0, y0 = 0, s1 = 0, s2 = 0;
    void add(double y) {
        if (rows == 0) y0 = y;
        const double d = y - y0;
        rows += 1;
        w += 1;
        s1 += d;
        s2 += d * d;
    }
    void add(double y, double wt) {
        if (rows == 0) y0 = y;
        const double d = y - y0;
        rows += 1;
        w += wt;
        s1 += wt * d;
        s2 += wt * d * d;
    }
    stats::MeanMoments moments() const {
        stats::MeanMoments m;
        if (!(w > 0)) return m;
        m.rows = rows;
        m.w = w;
        m.y0 = y0;
        m.dy = s1 / w;
        m.css = std::max(0.0, s2 - s1 * m.dy);
        return m;
    }
};

// The cells of candidate `a` alone (bs empty) or of the pairs (a, b) for each b of `bs`, in one
// pass over the rows: the row's first code, slot and value are read once for the whole batch.
std::vector<std::vector<Cell>> accumulate(const MeanRows& rows, std::size_t a, std::size_t la,
                                          const std::vector<std::size_t>& bs, const std::vector<std::size_t>& lbs) {
    const std::size_t slots = rows.slots, n = rows.size();
    const auto& ca = rows.codes[a];
    const bool weighted = !rows.weight.empty();
    std::vector<std::vector<Cell>> out;
    if (bs.empty()) {
        out.emplace_back(la * slots);
        auto& cells = out[0];
        for (std::size_t r = 0; r < n; ++r) {
            const std::size_t k = ca[r];
            if (k == kMissing) continue;
            Cell& c = cells[k * slots + rows.slot[r]];
            if (weighted) c.add(rows.y[r], rows.weight[r]);
            else c.add(rows.y[r]);
        }
        return out;
    }
    std::vector<const std::uint16_t*> cb;
    std::vector<Cell*> cp;
    for (std::size_t j = 0; j < bs.size(); ++j) {
        out.emplace_back(la * lbs[j] * slots);
        cb.push_back(rows.codes[bs[j]].data());
    }
    for (auto& o : out) cp.push_back(o.data());
    const std::size_t m = bs.size();
    for (std::size_t r = 0; r < n; ++r) {
        const std::size_t ka = ca[r];
        if (ka == kMissing) continue;
        const std::size_t s = rows.slot[r];
        const double y = rows.y[r];
        for (std::size_t j = 0; j < m; ++j) {
            const std::size_t kb = cb[j][r];
            if (kb == kMissing) continue;
            Cell& c = cp[j][(ka * lbs[j] + kb) * slots + s];
            if (weighted) c.add(y, rows.weight[r]);
            else c.add(y);
        }
    }
    return out;
}

// Medians (and, under a log outcome, raw-scale moments) of every cell, from the sorted rows,
// and the pooled median of each group over the check's rows.
template <typename CodeOf>
void cell_medians(const MeanRows& rows, std::size_t strata, CodeOf code_of,
                  const std::vector<stats::MeanMoments>& cells, bool need_raw, std::vector<double>& medians,
                  std::vector<stats::MeanMoments>& raw, std::vector<double>& pooled) {
    const std::size_t slots = rows.slots;
    std::vector<double> totals(cells.size()), group_totals(slots, 0.0);
    for (std::size_t c = 0; c < cells.size(); ++c) {
        totals[c] = cells[c].w;
        group_totals[c % slots] += cells[c].w;
    }
    stats::SortedMedians m(std::move(totals)), g(std::move(group_totals));
    if (need_raw) raw.assign(cells.size(), {});
    const bool weighted = !rows.weight.empty();
    for (const auto i : rows.sorted) {
        const std::size_t k = code_of(i);
        if (k >= strata) continue;
        const std::size_t c = k * slots + rows.slot[i];
        const double wt = weighted ? rows.weight[i] : 1.0;
        m.add(c, rows.raw[i], wt);
        g.add(rows.slot[i], rows.raw[i], wt);
        if (need_raw) raw[c].add(rows.raw[i], wt);
    }
    medians = m.medians();
    pooled = g.medians();
}

PercentGap percent(double d, double lo, double hi) {
    auto pc = [](double v) { return std::isnan(v) ? kNaN : std::expm1(v); };
    return {pc(d), pc(lo), pc(hi)};
}

}  // namespace

Result<Question> check_mean_question(const Table& t, const MeanQuestion& q) {
    if (q.outcome.empty()) return make_error("no outcome given: pass --mean COLUMN (a numeric outcome)");
    const Column* oc = t.column(q.outcome);
    if (!oc) return make_error("outcome column '" + q.outcome + "' not found", t.source);
    if (!oc->is_numeric())
        return make_error("outcome column '" + q.outcome + "' is not numeric: a mean gap needs numbers "
                          "(a yes/no outcome is a rate question: pass --outcome instead)",
                          t.source);
    QuestionSpec spec = q.groups;
    spec.outcome = q.outcome;
    spec.positive.reset();
    auto g = resolve_groups(t, spec);
    if (!g) return g;
    if (g->slots() > 127)
        return make_error("exposure '" + g->exposure + "' has too many groups for a mean scan: name the focal group");
    if (q.log_outcome) {
        auto rows = encode(t, *g, MeanQuestion{q.outcome, q.groups, true, false}, nullptr);
        if (!rows) return rows.error();
    }
    return g;
}

Result<MeanScan> scan_means(const Table& t, const MeanQuestion& q, const CandidateSet& cands, const Work& work) {
    auto g = check_mean_question(t, q);
    if (!g) return g.error();
    for (const auto& c : cands.candidates)
        if (!c.column || c.column->size() != t.rows || !c.column->is_categorical() || c.column->levels.size() >= kMissing)
            return make_error("stratifier '" + c.name + "' does not belong to this table");
    // Row-level data without weights and without medians take the fast path (core/scan/
    // mean_cells.h): codes read in place, sums about fixed origins. Weighted rows and pay-gap
    // medians keep the compacted rows, summed about each cell's first value.
    const bool fast = !t.weighted() && !q.pay_gap;
    MeanRows rows;
    MeanCellRows fast_rows;
    if (fast) {
        fast_rows = cell_rows(t, *g, q);
    } else {
        auto rows_r = encode(t, *g, q, &cands);
        if (!rows_r) return rows_r.error();
        rows = std::move(*rows_r);
    }

    MeanScan out;
    out.groups = *g;
    const std::size_t slots = g->slots(), ncomp = g->comparisons();

    // Checks in result order: every single candidate, then every pair (i, j), i < j. A task sums
    // one single, or the pairs of i with up to kPairBatch later candidates in one pass.
    constexpr std::size_t kPairBatch = 8;
    struct Check {
        std::size_t i, j;
    };
    struct Task {
        std::size_t first, count;
    };
    std::vector<Check> checks;
    std::vector<Task> tasks;
    const std::size_t nc = cands.candidates.size();
    for (std::size_t i = 0; i < nc; ++i) {
        tasks.push_back({checks.size(), 1});
        checks.push_back({i, kSingle});
    }
    if (q.pairs)
        for (std::size_t i = 0; i < nc; ++i)
            for (std::size_t j = i + 1; j < nc; j += kPairBatch) {
                const std::size_t m = std::min(kPairBatch, nc - j);
                tasks.push_back({checks.size(), m});
                for (std::size_t k = 0; k < m; ++k) checks.push_back({i, j + k});
            }

    std::vector<MeanFinding> findings(checks.size() * ncomp);
    std::vector<char> done(checks.size(), 0);
    std::atomic<std::size_t> finished{0};
    const double total = static_cast<double>(checks.size());
    work.report(0, total, "summing cells");

    auto analyse = [&](std::size_t ti, std::vector<stats::MeanMoments> cells) {
        const Check& c = checks[ti];
        const Column& a = *cands.candidates[c.i].column;
        const bool pair = c.j != kSingle;
        const Column* b = pair ? cands.candidates[c.j].column : nullptr;
        const std::size_t lb = pair ? b->levels.size() : 1;
        const std::size_t strata = a.levels.size() * lb;
        std::vector<stats::MeanMoments> raw;
        std::vector<double> medians, pooled_median;
        if (q.pay_gap) {
            const auto& ca = rows.codes[c.i];
            if (!pair) {
                cell_medians(rows, strata, [&](std::size_t r) -> std::size_t { return ca[r] == kMissing ? strata : ca[r]; },
                             cells, q.log_outcome, medians, raw, pooled_median);
            } else {
                const auto& cb = rows.codes[c.j];
                cell_medians(rows, strata,
                             [&](std::size_t r) -> std::size_t {
                                 return ca[r] == kMissing || cb[r] == kMissing ? strata : ca[r] * lb + cb[r];
                             },
                             cells, q.log_outcome, medians, raw, pooled_median);
            }
        }
        if (!q.log_outcome) raw = cells;

        std::vector<std::string> names{cands.candidates[c.i].name};
        if (pair) names.push_back(cands.candidates[c.j].name);
        std::vector<std::vector<std::string>> labels(strata);
        std::vector<std::string> joined(strata);
        for (std::size_t k = 0; k < strata; ++k) {
            labels[k] = pair ? std::vector<std::string>{a.levels[k / lb], b->levels[k % lb]}
                             : std::vector<std::string>{a.levels[k]};
            joined[k] = pair ? labels[k][0] + " | " + labels[k][1] : labels[k][0];
        }
        for (std::size_t comp = 0; comp < ncomp; ++comp) {
            const std::size_t fs = comp + 1;
            stats::MeanCells mc(strata), rc;
            for (std::size_t k = 0; k < strata; ++k) mc[k] = {cells[k * slots + fs], cells[k * slots]};
            MeanFinding f = analyse_mean_strata(mc, labels, names, {q.outcome, g->focal[comp], g->reference}, q.alpha);
            f.comparison = comp;
            f.log_outcome = q.log_outcome;
            // The E-value reads the fixed-effects difference in units of the residual SD.
            const double sd = std::sqrt(f.fixed_effects.rss / f.fixed_effects.df);
            f.sensitivity.smd = f.fixed_effects.estimate / sd;
            f.sensitivity.smd_se = f.fixed_effects.se / sd;
            f.sensitivity.e = stats::e_value_smd(f.sensitivity.smd, f.sensitivity.smd_se, q.alpha);
            if (q.log_outcome) {
                const auto& cd = f.crude.difference;
                f.crude_percent = percent(cd.estimate, cd.ci_low, cd.ci_high);
                const auto& fe = f.fixed_effects.robust;
                f.fixed_effects_percent = percent(fe.estimate, fe.ci_low, fe.ci_high);
                const auto& sd2 = f.standardised;
                f.standardised_percent = percent(sd2.estimate, sd2.ci_low, sd2.ci_high);
            }
            if (q.pay_gap) {
                rc.resize(strata);
                std::vector<double> mf(strata), mr(strata);
                for (std::size_t k = 0; k < strata; ++k) {
                    rc[k] = {raw[k * slots + fs], raw[k * slots]};
                    mf[k] = medians[k * slots + fs];
                    mr[k] = medians[k * slots];
                }
                f.pay_gap = pay_gap(rc, joined, mf, mr, pooled_median[fs], pooled_median[0]);
            }
            findings[ti * ncomp + comp] = std::move(f);
        }
        done[ti] = 1;
        work.report(static_cast<double>(finished.fetch_add(1) + 1), total, "summing cells");
    };

    const unsigned threads = resolve_threads(q.threads);
    if (!fast) {
        run_tasks(tasks.size(), threads, [&](std::size_t t) {
            if (work.cancelled()) return;
            const Task& task = tasks[t];
            const Check& head = checks[task.first];
            const std::size_t la = cands.candidates[head.i].column->levels.size();
            std::vector<std::size_t> bs, lbs;
            if (head.j != kSingle)
                for (std::size_t k = 0; k < task.count; ++k) {
                    bs.push_back(checks[task.first + k].j);
                    lbs.push_back(cands.candidates[bs.back()].column->levels.size());
                }
            const auto sums = accumulate(rows, head.i, la, bs, lbs);
            for (std::size_t k = 0; k < task.count; ++k) {
                std::vector<stats::MeanMoments> cells(sums[k].size());
                for (std::size_t c = 0; c < cells.size(); ++c) cells[c] = sums[k][c].moments();
                analyse(task.first + k, std::move(cells));
            }
        });
    } else {
        // Singles first: their cell means are the origins of the pairs' cells.
        const std::size_t stride = slots + 1;
        std::vector<double> slot_origin = cell_origins(pooled_slot_moments(fast_rows));
        std::vector<std::vector<double>> origins(nc);
        run_tasks(nc, threads, [&](std::size_t i) {
            if (work.cancelled()) return;
            const Column& a = *cands.candidates[i].column;
            const auto sums = single_cells(fast_rows, a, slot_origin);
            origins[i] = cell_origins(sums);
            std::vector<stats::MeanMoments> cells(a.levels.size() * slots);
            for (std::size_t k = 0; k < a.levels.size(); ++k)
                for (std::size_t s = 0; s < slots; ++s) cells[k * slots + s] = sums[k * stride + s];
            analyse(i, std::move(cells));
        });
        run_tasks(tasks.size() - nc, threads, [&](std::size_t t) {
            if (work.cancelled()) return;
            const Task& task = tasks[nc + t];
            const Check& head = checks[task.first];
            const Column& a = *cands.candidates[head.i].column;
            const std::size_t la = a.levels.size();
            std::vector<const Column*> bs;
            for (std::size_t k = 0; k < task.count; ++k) bs.push_back(cands.candidates[checks[task.first + k].j].column);
            const auto sums = pair_cells(fast_rows, a, bs, origins[head.i]);
            for (std::size_t k = 0; k < task.count; ++k) {
                const std::size_t lb = bs[k]->levels.size();
                std::vector<stats::MeanMoments> cells(la * lb * slots);
                for (std::size_t ka = 0; ka < la; ++ka)
                    for (std::size_t kb = 0; kb < lb; ++kb)
                        for (std::size_t s = 0; s < slots; ++s)
                            cells[(ka * lb + kb) * slots + s] = sums[k][(kb * (la + 1) + ka) * stride + s];
                analyse(task.first + k, std::move(cells));
            }
        });
    }
    out.cancelled = work.cancelled();
    for (std::size_t ti = 0; ti < checks.size(); ++ti) {
        if (!done[ti]) continue;
        for (std::size_t comp = 0; comp < ncomp; ++comp) out.findings.push_back(std::move(findings[ti * ncomp + comp]));
    }
    return out;
}

}  // namespace foldline
