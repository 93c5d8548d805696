#include "core/scan/mean_scan.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <numeric>

#include "core/common/run_tasks.h"
#include "core/scan/mean_analysis.h"
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

// The rows of the question: the group slot of each row (-1 when unused) and the analysed value.
struct MeanRows {
    std::vector<std::int8_t> slot;
    std::vector<double> y;    // analysed value (log y with log_outcome)
    std::vector<double> raw;  // the outcome itself (for medians and pay-gap means)
    std::vector<std::uint32_t> sorted;  // used rows by ascending raw value (pay gap only)
    std::size_t slots = 0;
};

Result<MeanRows> encode(const Table& t, const Question& g, const MeanQuestion& q) {
    MeanRows r;
    r.slots = g.slots();
    const RowCells cells = encode_rows(t, g);  // the outcome bit is irrelevant here; only the slot is read
    const Column& oc = t.columns[g.outcome_column];
    r.slot.assign(t.rows, -1);
    r.y.assign(t.rows, kNaN);
    r.raw = oc.values;
    for (std::size_t i = 0; i < t.rows; ++i) {
        if (cells.cell[i] == cells.unused() || !(t.weight(i) > 0)) continue;
        const double v = oc.values[i];
        if (!std::isfinite(v)) continue;
        if (q.log_outcome) {
            if (!(v > 0))
                return make_error("outcome '" + oc.name + "' is " + number_text(v) + " in data row " +
                                      std::to_string(i + 1) + ": --log-outcome needs every value above 0 "
                                      "(leave the option off, or filter those rows out first)",
                                  t.source);
            r.y[i] = std::log(v);
        } else {
            r.y[i] = v;
        }
        r.slot[i] = static_cast<std::int8_t>(cells.cell[i] / 2);
    }
    if (q.pay_gap) {
        for (std::size_t i = 0; i < t.rows; ++i)
            if (r.slot[i] >= 0) r.sorted.push_back(static_cast<std::uint32_t>(i));
        std::sort(r.sorted.begin(), r.sorted.end(), [&](std::uint32_t a, std::uint32_t b) { return r.raw[a] < r.raw[b]; });
    }
    return r;
}

// Stratum code of each row for one check is a function (row → code, or `strata` when missing).
template <typename CodeOf>
void accumulate(const MeanRows& rows, const Table& t, std::size_t strata, CodeOf code_of,
                std::vector<stats::MeanMoments>& cells) {
    const std::size_t slots = rows.slots;
    cells.assign(strata * slots, {});
    const std::size_t n = rows.slot.size();
    if (t.weights.empty()) {
        for (std::size_t i = 0; i < n; ++i) {
            const int s = rows.slot[i];
            if (s < 0) continue;
            const std::size_t k = code_of(i);
            if (k >= strata) continue;
            cells[k * slots + static_cast<std::size_t>(s)].add(rows.y[i]);
        }
    } else {
        for (std::size_t i = 0; i < n; ++i) {
            const int s = rows.slot[i];
            if (s < 0) continue;
            const std::size_t k = code_of(i);
            if (k >= strata) continue;
            cells[k * slots + static_cast<std::size_t>(s)].add(rows.y[i], t.weights[i]);
        }
    }
}

// Medians (and, under a log outcome, raw-scale moments) of every cell, from the sorted rows.
template <typename CodeOf>
void cell_medians(const MeanRows& rows, const Table& t, std::size_t strata, CodeOf code_of,
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
    for (const auto i : rows.sorted) {
        const std::size_t k = code_of(i);
        if (k >= strata) continue;
        const std::size_t c = k * slots + static_cast<std::size_t>(rows.slot[i]);
        m.add(c, rows.raw[i], t.weight(i));
        g.add(static_cast<std::size_t>(rows.slot[i]), rows.raw[i], t.weight(i));
        if (need_raw) raw[c].add(rows.raw[i], t.weight(i));
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
        auto rows = encode(t, *g, MeanQuestion{q.outcome, q.groups, true, false});
        if (!rows) return rows.error();
    }
    return g;
}

Result<MeanScan> scan_means(const Table& t, const MeanQuestion& q, const CandidateSet& cands, const Work& work) {
    auto g = check_mean_question(t, q);
    if (!g) return g.error();
    for (const auto& c : cands.candidates)
        if (!c.column || c.column->size() != t.rows || !c.column->is_categorical())
            return make_error("stratifier '" + c.name + "' does not belong to this table");
    auto rows_r = encode(t, *g, q);
    if (!rows_r) return rows_r.error();
    const MeanRows& rows = *rows_r;

    MeanScan out;
    out.groups = *g;
    const std::size_t slots = rows.slots, ncomp = g->comparisons();

    struct Check {
        std::size_t i, j;
    };
    std::vector<Check> checks;
    const std::size_t nc = cands.candidates.size();
    for (std::size_t i = 0; i < nc; ++i) checks.push_back({i, kSingle});
    if (q.pairs)
        for (std::size_t i = 0; i < nc; ++i)
            for (std::size_t j = i + 1; j < nc; ++j) checks.push_back({i, j});

    std::vector<MeanFinding> findings(checks.size() * ncomp);
    std::vector<char> done(checks.size(), 0);
    std::atomic<std::size_t> finished{0};
    const double total = static_cast<double>(checks.size());
    work.report(0, total, "summing cells");
    run_tasks(checks.size(), resolve_threads(q.threads), [&](std::size_t ti) {
        if (work.cancelled()) return;
        const Check& c = checks[ti];
        const Column& a = *cands.candidates[c.i].column;
        const bool pair = c.j != kSingle;
        const Column* b = pair ? cands.candidates[c.j].column : nullptr;
        const std::size_t la = a.levels.size(), lb = pair ? b->levels.size() : 1;
        const std::size_t strata = la * lb;
        std::vector<stats::MeanMoments> cells, raw;
        std::vector<double> medians, pooled_median;
        auto run = [&](auto code_of) {
            accumulate(rows, t, strata, code_of, cells);
            if (q.pay_gap) cell_medians(rows, t, strata, code_of, cells, q.log_outcome, medians, raw, pooled_median);
        };
        visit_codes(a, [&](const auto& ca) {
            if (!pair) {
                run([&](std::size_t i) -> std::size_t { return ca[i]; });
            } else {
                visit_codes(*b, [&](const auto& cb) {
                    run([&](std::size_t i) -> std::size_t {
                        const std::size_t x = ca[i], y = cb[i];
                        return x >= la || y >= lb ? strata : x * lb + y;
                    });
                });
            }
        });
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
    });
    out.cancelled = work.cancelled();
    for (std::size_t ti = 0; ti < checks.size(); ++ti) {
        if (!done[ti]) continue;
        for (std::size_t comp = 0; comp < ncomp; ++comp) out.findings.push_back(std::move(findings[ti * ncomp + comp]));
    }
    return out;
}

}  // namespace foldline
