#include "core/scan/rate_scan.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <mutex>
#include <functional>

#include "core/common/fnv1a.h"
#include "core/common/run_tasks.h"
#include "core/stats/bootstrap.h"
#include "core/stats/distributions.h"
#include "core/stats/fdr.h"

namespace foldline {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double log_or(double x) {
    if (std::isnan(x)) return kNaN;
    if (x <= 0) return -INFINITY;
    return std::log(x);
}

bool disagree(const stats::Strata& strata) {
    bool pos = false, neg = false;
    for (const auto& s : strata) {
        if (!s.informative()) continue;
        const double rd = s.a / s.n_focal() - s.c / s.n_reference();
        pos |= rd > 0;
        neg |= rd < 0;
    }
    return pos && neg;
}

// The class inputs alone, for bootstrap resamples (no intervals, no tables).
ClassInputs quick_inputs(const stats::Strata& strata, bool need_homogeneity) {
    ClassInputs in{};
    const auto p = stats::pooled(strata);
    in.crude_effect = stats::proportion(p.a, p.n_focal()) - stats::proportion(p.c, p.n_reference());
    in.crude_z = stats::cmh_test(stats::Strata{p}).z;
    const auto orr = stats::mh_odds_ratio(strata);
    in.adjusted_effect = log_or(orr.estimate);
    in.adjusted_z = stats::cmh_test(strata).z;
    in.strata_disagree = disagree(strata);
    const bool homogeneity = need_homogeneity && in.strata_disagree;
    in.p_homogeneity = homogeneity ? stats::breslow_day(strata, orr.estimate).p_tarone : kNaN;
    // The same small-count rules as the finding itself (p-values only).
    const auto sc = assess_small_counts(strata, orr.estimate, 0.05, false, homogeneity);
    use_small_counts(sc, in.p_homogeneity, in);
    if (!homogeneity) in.p_homogeneity = kNaN;
    return in;
}

std::string join_levels(const std::vector<std::string>& v) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? " | " : "") + v[i];
    return s;
}

}  // namespace

std::string FindingHeader::label() const {
    std::string s;
    for (std::size_t i = 0; i < strata.size(); ++i) s += (i ? " \u00d7 " : "") + strata[i];
    return s;
}

RateFinding analyse_strata(const stats::Strata& strata, const std::vector<std::vector<std::string>>& labels,
                           const std::vector<std::string>& names, double alpha) {
    RateFinding f;
    f.strata = names;
    const auto p = stats::pooled(strata);
    f.rows_used = p.total();

    const auto crude = stats::two_by_two(p, alpha);
    auto& c = f.crude;
    c.pos_focal = p.a;
    c.n_focal = p.n_focal();
    c.pos_reference = p.c;
    c.n_reference = p.n_reference();
    c.rate_focal = crude.rate_focal;
    c.rate_reference = crude.rate_reference;
    c.rate_focal_ci = crude.rate_focal_ci;
    c.rate_reference_ci = crude.rate_reference_ci;
    c.rd = crude.rd;
    c.rd_ci = crude.rd_ci;
    c.rr = crude.rr;
    c.odds_ratio = crude.odds_ratio;
    c.selection_ratio = crude.selection_ratio;
    const double lo = std::min(c.rate_focal, c.rate_reference), hi = std::max(c.rate_focal, c.rate_reference);
    c.below_four_fifths = hi > 0 && lo < 0.8 * hi;
    c.z = crude.z;
    c.p = stats::normal_two_sided_p(crude.z);

    f.adjusted.mh_or = stats::mh_odds_ratio(strata, alpha);
    f.adjusted.mh_rr = stats::mh_risk_ratio(strata, alpha);
    f.adjusted.mh_rd = stats::mh_risk_difference(strata, alpha);
    f.adjusted.standardized = stats::standardized_rd(strata, alpha);
    f.cmh = stats::cmh_test(strata);
    f.breslow_day = stats::breslow_day(strata, f.adjusted.mh_or.estimate);
    f.small_counts = assess_small_counts(strata, f.adjusted.mh_or.estimate, alpha);
    f.decomposition = stats::decompose_crude_rd(strata);
    f.e_value = stats::e_value(f.adjusted.mh_rr.estimate, f.adjusted.mh_rr.ci);

    const double n1 = c.n_focal, n0 = c.n_reference, n = n1 + n0;
    f.strata_table.reserve(strata.size());
    for (std::size_t k = 0; k < strata.size(); ++k) {
        const auto& s = strata[k];
        StratumRow r;
        if (k < labels.size()) {
            r.levels = labels[k];
            r.level = join_levels(labels[k]);
        }
        r.pos_focal = s.a;
        r.n_focal = s.n_focal();
        r.pos_reference = s.c;
        r.n_reference = s.n_reference();
        r.rate_focal = stats::proportion(s.a, r.n_focal);
        r.rate_reference = stats::proportion(s.c, r.n_reference);
        r.rate_focal_ci = stats::wilson(s.a, r.n_focal, alpha);
        r.rate_reference_ci = stats::wilson(s.c, r.n_reference, alpha);
        r.rd = r.rate_focal - r.rate_reference;
        r.rd_ci = stats::newcombe_difference(s.a, r.n_focal, s.c, r.n_reference, alpha);
        r.selection_ratio = r.rate_reference > 0 ? r.rate_focal / r.rate_reference : kNaN;
        r.share = n > 0 ? s.total() / n : kNaN;
        r.share_focal = n1 > 0 ? r.n_focal / n1 : kNaN;
        r.share_reference = n0 > 0 ? r.n_reference / n0 : kNaN;
        r.informative = s.informative();
        if (!r.informative) {
            r.reason = r.n_focal > 0 ? "no reference rows" : "no focal rows";
            f.uninformative.push_back(r.level);
        } else {
            ++f.informative_strata;
        }
        f.strata_table.push_back(std::move(r));
    }
    f.strata_disagree = disagree(strata);

    auto& in = f.class_inputs;
    in.crude_effect = c.rd;
    in.crude_z = c.z;
    in.adjusted_effect = log_or(f.adjusted.mh_or.estimate);
    in.adjusted_z = f.cmh.z;
    in.strata_disagree = f.strata_disagree;
    use_small_counts(f.small_counts, f.breslow_day.p_tarone, in);
    f.p_reversal = reversal_p(in);
    f.q_value = f.p_reversal;
    f.direction_flip = direction_flips(in);
    f.cls = classify(in, f.p_reversal, alpha);
    const double mh_rd = f.adjusted.mh_rd.greenland_robins.estimate;
    f.change = std::isnan(mh_rd) || std::isnan(c.rd) ? 0.0 : std::fabs(c.rd - mh_rd);
    return f;
}

double class_stability(const stats::Strata& strata, FindingClass cls, double alpha, int draws, std::uint64_t seed) {
    const bool need_h = cls != FindingClass::Reversal;
    return stats::bootstrap_share(strata, draws, seed, [&](const stats::Strata& s) {
        const auto in = quick_inputs(s, need_h);
        return classify(in, reversal_p(in), alpha) == cls;
    });
}

namespace {

constexpr std::size_t kSingle = static_cast<std::size_t>(-1);

// The cube of stratifier i alone (js empty), or the cubes of the pairs (i, j) for each j in js
// (in that order): a table counts a batch of pairs in one fused pass.
using CubesOf = std::function<std::vector<CountCube>(std::size_t i, const std::vector<std::size_t>& js)>;
// The level labels of stratifier i.
using LevelsOf = std::function<const std::vector<std::string>&(std::size_t i)>;

// Everything after the counting, shared by the scan of a table and the scan of cubes counted
// elsewhere: one finding per cube and comparison, FDR, bootstrap of the cubes, ranking.
Result<ScanResult> scan_cubes(ScanResult result, const Question& q, const CubesOf& cubes_of, const LevelsOf& levels_of,
                              const RateScanOptions& opt, const Work& work, const RateFindingCallback& on_finding,
                              std::vector<SlopeFinding> slope_findings) {
    result.alpha = opt.alpha;
    result.bootstrap = opt.bootstrap;
    result.seed = opt.seed;
    // Cubes in result order: every single stratifier, then every pair (i, j), i < j. A task
    // counts one single cube, or the pairs of stratifier i with up to kPairBatch later ones
    // (one fused pass over a table: column i and the cells are read once per batch).
    constexpr std::size_t kPairBatch = 8;
    struct Cube {
        std::size_t i, j;  // j == kSingle for a single stratifier
    };
    struct Task {
        std::size_t first, count;  // cubes first .. first + count - 1
    };
    constexpr std::size_t single = kSingle;
    std::vector<Cube> cubes;
    std::vector<Task> tasks;
    const std::size_t nc = result.candidates.size();
    for (std::size_t i = 0; i < nc; ++i) {
        tasks.push_back({cubes.size(), 1});
        cubes.push_back({i, single});
    }
    if (opt.pairs)
        for (std::size_t i = 0; i < nc; ++i)
            for (std::size_t j = i + 1; j < nc; j += kPairBatch) {
                const std::size_t m = std::min(kPairBatch, nc - j);
                tasks.push_back({cubes.size(), m});
                for (std::size_t k = 0; k < m; ++k) cubes.push_back({i, j + k});
            }

    const std::size_t ncomp = q.comparisons();
    std::vector<RateFinding> findings(cubes.size() * ncomp);
    std::vector<stats::Strata> cube_strata(cubes.size() * ncomp);
    std::vector<char> done(cubes.size(), 0);
    std::atomic<std::size_t> finished{0};
    std::mutex emit;
    const double total = static_cast<double>(cubes.size());
    work.report(0, total, "counting strata");

    auto analyse = [&](std::size_t t, const CountCube& cube, std::vector<std::size_t>& kept) {
        const auto& c = cubes[t];
        const bool pair = c.j != single;
        const auto& la = levels_of(c.i);
        const auto* lb = pair ? &levels_of(c.j) : nullptr;
        std::vector<std::string> names{result.candidates[c.i]};
        if (pair) names.push_back(result.candidates[c.j]);
        const std::size_t k2 = pair ? lb->size() : 1;
        for (std::size_t comp = 0; comp < ncomp; ++comp) {
            auto strata = comparison_strata(cube, comp + 1, &kept);
            std::vector<std::vector<std::string>> labels;
            labels.reserve(kept.size());
            for (auto s : kept) {
                if (pair) labels.push_back({la[s / k2], (*lb)[s % k2]});
                else labels.push_back({la[s]});
            }
            auto f = analyse_strata(strata, labels, names, opt.alpha);
            f.comparison = comp;
            f.focal = q.focal[comp];
            f.reference = q.reference;
            const std::size_t slot = t * ncomp + comp;
            cube_strata[slot] = std::move(strata);
            findings[slot] = std::move(f);
            if (on_finding) {
                std::lock_guard<std::mutex> lock(emit);
                on_finding(findings[slot]);
            }
        }
        done[t] = 1;
        const auto n = finished.fetch_add(1) + 1;
        work.report(static_cast<double>(n), total, "counting strata");
    };
    // One task per batch of cubes; a stop request skips the batches not yet started.
    const unsigned nthreads = resolve_threads(opt.threads);
    run_tasks(tasks.size(), nthreads, [&](std::size_t t) {
        if (work.cancelled()) return;
        const auto& task = tasks[t];
        const Cube& head = cubes[task.first];
        std::vector<std::size_t> js;
        if (head.j != single)
            for (std::size_t k = 0; k < task.count; ++k) js.push_back(cubes[task.first + k].j);
        const auto built = cubes_of(head.i, js);
        std::vector<std::size_t> kept;
        for (std::size_t k = 0; k < task.count; ++k) analyse(task.first + k, built[k], kept);
    });
    result.cancelled = work.cancelled();

    std::vector<stats::Strata> kept_strata;
    for (std::size_t t = 0; t < cubes.size(); ++t) {
        if (!done[t]) continue;
        for (std::size_t comp = 0; comp < ncomp; ++comp) {
            result.rate_findings.push_back(std::move(findings[t * ncomp + comp]));
            kept_strata.push_back(std::move(cube_strata[t * ncomp + comp]));
        }
    }
    result.slope_findings = std::move(slope_findings);
    apply_fdr(result);

    // Stability of flagged findings: bootstrap the cube, in parallel, seeded per finding.
    if (opt.bootstrap > 0 && !result.cancelled) {
        std::vector<std::size_t> flagged;
        for (std::size_t i = 0; i < result.rate_findings.size(); ++i)
            if (result.rate_findings[i].cls != FindingClass::Stable) flagged.push_back(i);
        std::atomic<std::size_t> nbd{0};
        const double btotal = static_cast<double>(flagged.size());
        run_tasks(flagged.size(), nthreads, [&](std::size_t k) {
            if (work.cancelled()) return;
            auto& f = result.rate_findings[flagged[k]];
            const std::uint64_t seed = fnv1a(f.label() + "\x1f" + f.focal, opt.seed * 0x9E3779B97F4A7C15ull + 1);
            // Resample in a canonical stratum order (by label), so the draws do not depend on the
            // order in which levels first appeared in the file.
            const auto& st = kept_strata[flagged[k]];
            std::vector<std::size_t> order(st.size());
            for (std::size_t z = 0; z < order.size(); ++z) order[z] = z;
            std::sort(order.begin(), order.end(), [&](std::size_t x, std::size_t y) {
                return f.strata_table[x].levels < f.strata_table[y].levels;
            });
            stats::Strata canonical;
            canonical.reserve(st.size());
            for (auto z : order) canonical.push_back(st[z]);
            f.stability = {class_stability(canonical, f.cls, opt.alpha, opt.bootstrap, seed), opt.bootstrap};
            work.report(static_cast<double>(nbd.fetch_add(1) + 1), btotal, "bootstrap");
        });
        result.cancelled = work.cancelled();
    }
    rank_findings(result);
    return result;
}

}  // namespace

Result<ScanResult> rate_scan(const Table& table, const Question& q, const CandidateSet& cands,
                             const RateScanOptions& opt, const Work& work, const RateFindingCallback& on_finding,
                             std::vector<SlopeFinding> slope_findings) {
    if (q.outcome_column >= table.columns.size() || q.exposure_column >= table.columns.size() ||
        table.columns[q.exposure_column].name != q.exposure)
        return make_error("the question does not belong to this table");
    for (const auto& c : cands.candidates)
        if (!c.column || c.column->size() != table.rows)
            return make_error("stratifier '" + c.name + "' does not belong to this table");

    ScanResult result;
    result.question = q;
    result.excluded = cands.excluded;
    result.rows = table.total_weight();
    for (const auto& c : cands.candidates) {
        result.candidates.push_back(c.name);
        result.candidate_origin.push_back(c.origin);
    }
    const RowCells rows = encode_rows(table, q);
    const auto cubes_of = [&](std::size_t i, const std::vector<std::size_t>& js) {
        const Column& a = *cands.candidates[i].column;
        if (js.empty()) return std::vector<CountCube>{build_cube(a, rows, table.weights)};
        std::vector<const Column*> seconds;
        for (auto j : js) seconds.push_back(cands.candidates[j].column);
        return build_pair_cubes(a, seconds, rows, table.weights);
    };
    const auto levels_of = [&](std::size_t i) -> const std::vector<std::string>& {
        return cands.candidates[i].column->levels;
    };
    return scan_cubes(std::move(result), q, cubes_of, levels_of, opt, work, on_finding, std::move(slope_findings));
}

Result<ScanResult> rate_scan(const CubeSet& cubes, const Question& q, const RateScanOptions& opt, const Work& work,
                             const RateFindingCallback& on_finding, std::vector<SlopeFinding> slope_findings) {
    const std::size_t n = cubes.stratifiers.size();
    if (cubes.singles.size() != n) return make_error("one count cube per stratifier expected");
    const bool pairs = opt.pairs && n > 1;
    if (pairs && cubes.pairs.size() != n * (n - 1) / 2)
        return make_error("pair cubes missing: " + std::to_string(n * (n - 1) / 2) + " expected, " +
                          std::to_string(cubes.pairs.size()) + " given");
    auto check = [&](const CountCube& c, std::size_t strata, const std::string& what) -> Status {
        if (c.slots != q.slots() || c.strata != strata || c.counts.size() != strata * q.slots() * 2)
            return make_error("the count cube of " + what + " does not fit the question (" + std::to_string(c.strata) +
                              " strata, " + std::to_string(c.slots) + " exposure slots)");
        return Ok{};
    };
    std::vector<std::size_t> pair_index(n * n, 0);
    std::size_t p = 0;
    for (std::size_t i = 0; i < n; ++i) {
        const auto& si = cubes.stratifiers[i];
        if (auto st = check(cubes.singles[i], si.levels.size(), "'" + si.name + "'"); !st) return st.error();
        if (!pairs) continue;
        for (std::size_t j = i + 1; j < n; ++j, ++p) {
            const auto& sj = cubes.stratifiers[j];
            if (auto st = check(cubes.pairs[p], si.levels.size() * sj.levels.size(),
                                "'" + si.name + "' \u00d7 '" + sj.name + "'");
                !st)
                return st.error();
            pair_index[i * n + j] = p;
        }
    }
    ScanResult result;
    result.question = q;
    result.excluded = cubes.excluded;
    result.rows = cubes.rows;
    for (const auto& s : cubes.stratifiers) {
        result.candidates.push_back(s.name);
        result.candidate_origin.push_back(s.origin);
    }
    const auto cubes_of = [&](std::size_t i, const std::vector<std::size_t>& js) {
        if (js.empty()) return std::vector<CountCube>{cubes.singles[i]};
        std::vector<CountCube> out;
        for (auto j : js) out.push_back(cubes.pairs[pair_index[i * n + j]]);
        return out;
    };
    const auto levels_of = [&](std::size_t i) -> const std::vector<std::string>& { return cubes.stratifiers[i].levels; };
    RateScanOptions o = opt;
    o.pairs = pairs;
    return scan_cubes(std::move(result), q, cubes_of, levels_of, o, work, on_finding, std::move(slope_findings));
}

}  // namespace foldline
