#include "core/scan/slope_scan.h"

#include "core/common/run_tasks.h"
#include "core/stats/fdr.h"
#include "core/stats/mixture.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <random>

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr std::size_t kMaxStrata = std::size_t{1} << 20;
const std::string kMissingLabel = "(missing)";

// Rows of the scan in compact form: only rows with x, y and every covariate present and a
// positive weight.
struct Prepared {
    std::vector<std::size_t> used;  // table row of each compact row; empty when every row is kept
    std::vector<double> x, y, w;    // w empty for row-level data
    std::vector<double> cov;        // compact rows × p, row-major (empty without covariates)
    std::size_t p = 0;
    BivariateMoments pooled;
    MomentMatrix pooled_matrix;     // z = (x, covariates, y) when p > 0
    double hc3 = kNaN;
    bool linear_probability = false;
    const double* wptr() const { return w.empty() ? nullptr : w.data(); }
};

Result<const Column*> numeric_column(const Table& t, const std::string& name, const char* role) {
    const Column* c = t.column(name);
    if (!c) return make_error(std::string(role) + " column '" + name + "' not found", t.source);
    if (!c->is_numeric())
        return make_error(std::string(role) + " column '" + name +
                              "' is categorical; the slope analysis needs numbers",
                          t.source);
    if (c->values.size() != t.rows)
        return make_error(std::string(role) + " column '" + name + "' has the wrong length",
                          t.source);
    return c;
}

Result<Prepared> prepare(const Table& t, const SlopeQuestion& q) {
    auto xc = numeric_column(t, q.x, "exposure");
    if (!xc) return xc.error();
    auto yc = numeric_column(t, q.y, "outcome");
    if (!yc) return yc.error();
    std::vector<const Column*> covs;
    for (const auto& name : q.covariates) {
        auto c = numeric_column(t, name, "covariate");
        if (!c) return c.error();
        if (name == q.x || name == q.y)
            return make_error("covariate '" + name + "' is the exposure or the outcome", t.source);
        covs.push_back(*c);
    }
    if (t.weighted() && t.weights.size() != t.rows)
        return make_error("weight column has the wrong length", t.source);

    Prepared d;
    d.p = covs.size();
    const auto& xv = (*xc)->values;
    const auto& yv = (*yc)->values;
    bool zero_one = true;
    // Reserved for every row: pages are only touched as rows are kept, and growing by doubling
    // held up to twice the rows (and copied them) at the peak of a 10 M-row scan.
    d.used.reserve(t.rows);
    d.x.reserve(t.rows);
    d.y.reserve(t.rows);
    if (t.weighted()) d.w.reserve(t.rows);
    for (std::size_t i = 0; i < t.rows; ++i) {
        const double xi = xv[i], yi = yv[i];
        if (!std::isfinite(xi) || !std::isfinite(yi)) continue;
        if (t.weighted() && !(t.weights[i] > 0)) continue;
        bool ok = true;
        for (const Column* c : covs) ok = ok && std::isfinite(c->values[i]);
        if (!ok) continue;
        d.used.push_back(i);
        d.x.push_back(xi);
        d.y.push_back(yi);
        if (t.weighted()) d.w.push_back(t.weights[i]);
        for (const Column* c : covs) d.cov.push_back(c->values[i]);
        zero_one = zero_one && (yi == 0.0 || yi == 1.0);
    }
    if (d.x.empty())
        return make_error("no row has both '" + q.x + "' and '" + q.y + "'" +
                              (covs.empty() ? std::string() : " and every covariate"),
                          t.source);
    d.linear_probability = zero_one;
    // Every row kept: compact row i is table row i, and the index (8 bytes a row, held beside
    // the gathered codes at the peak of a large scan) is not needed.
    if (d.used.size() == t.rows) std::vector<std::size_t>().swap(d.used);
    StratumMoments acc(1);
    const std::vector<std::uint8_t> zero(d.x.size(), 0);
    acc.add_rows(zero.data(), static_cast<const std::uint8_t*>(nullptr), 1, d.x.data(), d.y.data(),
                 d.wptr(), d.x.size());
    d.pooled = acc.finish()[0];
    d.hc3 = hc3_slope_se(d.x.data(), d.y.data(), d.wptr(), nullptr, d.x.size(), d.pooled);
    if (d.p > 0) {
        d.pooled_matrix = MomentMatrix(static_cast<Eigen::Index>(d.p + 2));
        std::vector<double> z(d.p + 2);
        for (std::size_t i = 0; i < d.x.size(); ++i) {
            z[0] = d.x[i];
            std::copy_n(&d.cov[i * d.p], d.p, z.begin() + 1);
            z[d.p + 1] = d.y[i];
            d.pooled_matrix.add(z.data(), d.w.empty() ? 1.0 : d.w[i]);
        }
    }
    return d;
}

// Codes of a stratifier over the compact rows.
template <typename T>
std::vector<T> gather_codes(const Column& c, const Prepared& d) {
    std::vector<T> out(d.x.size());
    visit_codes(c, [&](const auto& codes) {
        if (d.used.empty())
            for (std::size_t i = 0; i < out.size(); ++i) out[i] = static_cast<T>(codes[i]);
        else
            for (std::size_t i = 0; i < out.size(); ++i) out[i] = static_cast<T>(codes[d.used[i]]);
    });
    return out;
}

template <typename T>
std::vector<BivariateMoments> accumulate(const Prepared& d, const T* a, const T* b,
                                         std::size_t kb, std::size_t strata) {
    StratumMoments acc(strata);
    acc.add_rows(a, b, kb, d.x.data(), d.y.data(), d.wptr(), d.x.size());
    return acc.finish();
}

template <typename T>
std::vector<MomentMatrix> accumulate_matrix(const Prepared& d, const T* a, const T* b,
                                            std::size_t kb, std::size_t strata) {
    const Eigen::Index dim = static_cast<Eigen::Index>(d.p + 2);
    std::vector<MomentMatrix> out(strata, MomentMatrix(dim));
    std::vector<double> z(d.p + 2);
    for (std::size_t i = 0; i < d.x.size(); ++i) {
        const std::size_t k = b ? std::size_t{a[i]} * kb + b[i] : std::size_t{a[i]};
        z[0] = d.x[i];
        std::copy_n(&d.cov[i * d.p], d.p, z.begin() + 1);
        z[d.p + 1] = d.y[i];
        out[k].add(z.data(), d.w.empty() ? 1.0 : d.w[i]);
    }
    return out;
}

// Every figure of a finding from per-stratum summaries; labels are added by the caller.
SlopeFinding figures(const std::vector<BivariateMoments>& strata,
                     const std::vector<MomentMatrix>* matrices, const BivariateMoments& pooled,
                     const MomentMatrix* pooled_matrix, double hc3, double alpha) {
    SlopeFinding f;
    f.q_value = kNaN;
    const LineFit pl = fit_line(pooled, alpha);
    f.pooled = PooledSlope{pl.slope.slope, pl.slope.ci_low, pl.slope.ci_high, pl.slope.se,
                           pl.slope.p,     pl.slope.df,     hc3,              pl.r,
                           pl.r_ci_low,    pl.r_ci_high,    pl.n};
    f.n = pooled.w;
    f.rows_used = pooled.rows;
    const WithinFit wf = fit_within(strata, alpha);
    std::vector<LineFit> fits;
    for (std::size_t k = 0; k < strata.size(); ++k) {
        if (strata[k].rows == 0) continue;
        fits.push_back(fit_line(strata[k], alpha));
        const LineFit& g = fits.back();
        SlopeGroup grp;
        grp.n = g.n;
        grp.rows = g.rows;
        grp.slope = g.slope.slope;
        grp.se = g.slope.se;
        grp.ci_low = g.slope.ci_low;
        grp.ci_high = g.slope.ci_high;
        grp.p = g.slope.p;
        grp.r = g.r;
        grp.informative = g.informative;
        grp.reason = g.reason;
        grp.code = k;  // the caller adds the labels
        f.groups.push_back(std::move(grp));
    }
    f.within = WithinSlope{wf.slope.slope, wf.slope.ci_low, wf.slope.ci_high, wf.slope.se,
                           wf.slope.p,     wf.slope.df,     wf.strata,
                           precision_weighted_slope(fits, alpha)};
    f.equal_slopes = equal_slopes_test(strata);
    if (matrices && pooled_matrix) {
        f.adjusted = true;
        f.adjusted_pooled = fit_adjusted(*pooled_matrix, alpha);
        f.adjusted_within = fit_adjusted_within(*matrices, alpha);
    }
    classify(f, alpha);
    return f;
}

// FNV-1a: a seed component from the stratifier names that does not depend on the library.
std::uint64_t name_hash(const std::vector<std::string>& names) {
    std::uint64_t h = 1469598103934665603ull;
    for (const auto& s : names) {
        for (unsigned char c : s) h = (h ^ c) * 1099511628211ull;
        h = (h ^ 0xFFu) * 1099511628211ull;
    }
    return h;
}

std::uint64_t mix(std::uint64_t s) {
    s += 0x9E3779B97F4A7C15ull;
    s = (s ^ (s >> 30)) * 0xBF58476D1CE4E5B9ull;
    s = (s ^ (s >> 27)) * 0x94D049BB133111EBull;
    return s ^ (s >> 31);
}

// Share of resamples (rows drawn with replacement within each stratum; frequency-weighted
// data: multinomial counts over the stratum's rows) in which the class stays the same.
void bootstrap_stability(SlopeFinding& f, const Prepared& d, const std::vector<std::uint32_t>& joint,
                         std::size_t strata, const SlopeQuestion& q, const Work& work) {
    const std::size_t n = joint.size();
    std::vector<std::size_t> offset(strata + 1, 0);
    for (auto k : joint) ++offset[k + 1];
    for (std::size_t k = 0; k < strata; ++k) offset[k + 1] += offset[k];
    std::vector<std::uint32_t> order(n);
    {
        std::vector<std::size_t> pos(offset.begin(), offset.end() - 1);
        for (std::size_t i = 0; i < n; ++i) order[pos[joint[i]]++] = static_cast<std::uint32_t>(i);
    }
    std::mt19937_64 rng(mix(q.seed ^ mix(name_hash(f.strata))));
    const Eigen::Index dim = static_cast<Eigen::Index>(d.p + 2);
    std::vector<double> z(d.p + 2);
    int draws = 0;
    for (int b = 0; b < q.bootstrap; ++b) {
        if (work.cancelled()) break;
        StratumMoments acc(strata);
        std::vector<MomentMatrix> mm;
        if (d.p > 0) mm.assign(strata, MomentMatrix(dim));
        auto add_row = [&](std::size_t k, std::size_t i, double weight) {
            if (d.p > 0) {
                z[0] = d.x[i];
                std::copy_n(&d.cov[i * d.p], d.p, z.begin() + 1);
                z[d.p + 1] = d.y[i];
                mm[k].add(z.data(), weight);
            }
            acc.add(k, d.x[i], d.y[i], weight);
        };
        for (std::size_t k = 0; k < strata; ++k) {
            const std::size_t lo = offset[k], m = offset[k + 1] - lo;
            if (m == 0) continue;
            if (d.w.empty()) {
                for (std::size_t j = 0; j < m; ++j) add_row(k, order[lo + rng() % m], 1.0);
            } else {
                double total = 0;
                for (std::size_t j = 0; j < m; ++j) total += d.w[order[lo + j]];
                long long left = std::llround(total);
                double mass = total;
                for (std::size_t j = 0; j < m && left > 0; ++j) {
                    const double wj = d.w[order[lo + j]];
                    long long c = left;
                    if (j + 1 < m && wj < mass) {
                        std::binomial_distribution<long long> bin(left, std::clamp(wj / mass, 0.0, 1.0));
                        c = bin(rng);
                    }
                    mass -= wj;
                    left -= c;
                    if (c > 0) add_row(k, order[lo + j], static_cast<double>(c));
                }
            }
        }
        const std::vector<BivariateMoments> ms = acc.finish();
        BivariateMoments pooled = merge_all(ms);
        MomentMatrix pm;
        if (d.p > 0) {
            pm = MomentMatrix(dim);
            for (const auto& m : mm) pm.merge(m);
        }
        const SlopeFinding r = figures(ms, d.p > 0 ? &mm : nullptr, pooled, d.p > 0 ? &pm : nullptr,
                                       kNaN, q.alpha);
        ++draws;
        ++f.draws_by_class[static_cast<std::size_t>(rank(r.cls))];
    }
    f.stability.draws = draws;
    f.stability.share = draws > 0 ? static_cast<double>(f.draws_by_class[static_cast<std::size_t>(rank(f.cls))]) / draws
                            : kNaN;
}

// The question's names and each group's labels ("(missing)" for the spare code).
void name_groups(SlopeFinding& f, const SlopeQuestion& q, const std::string& name_a,
                 const std::vector<std::string>& levels_a, const std::string* name_b,
                 const std::vector<std::string>* levels_b) {
    f.x = q.x;
    f.y = q.y;
    f.covariates = q.covariates;
    f.strata.push_back(name_a);
    if (name_b) f.strata.push_back(*name_b);
    const std::size_t kb = levels_b ? levels_b->size() + 1 : 1;
    auto label = [](const std::vector<std::string>& levels, std::size_t code) {
        return code < levels.size() ? levels[code] : kMissingLabel;
    };
    for (auto& g : f.groups) {
        const std::size_t k = g.code;
        g.levels.push_back(label(levels_a, k / kb));
        if (levels_b) g.levels.push_back(label(*levels_b, k % kb));
        g.level = g.levels[0];
        for (std::size_t j = 1; j < g.levels.size(); ++j) g.level += " / " + g.levels[j];
        if (!g.informative) f.uninformative.push_back(g.level);
    }
}

struct Scan {
    const Table& table;
    const SlopeQuestion& q;
    const Prepared& d;
};

Status check_stratifier(const Table& t, const Column* c) {
    if (!c) return make_error("stratifier is null", t.source);
    if (!c->is_categorical())
        return make_error("stratifier '" + c->name + "' is numeric; bin it first", t.source);
    if (c->size() != t.rows)
        return make_error("stratifier '" + c->name + "' has " + std::to_string(c->size()) +
                              " rows; the table has " + std::to_string(t.rows),
                          t.source);
    return Ok{};
}

Status check_strata_count(const Table& t, const Column* ca, const Column* cb) {
    const std::size_t ka = ca->levels.size() + 1;
    const std::size_t kb = cb ? cb->levels.size() + 1 : 1;
    if (ka > kMaxStrata / kb)
        return make_error("too many joint strata for '" + ca->name + "'" +
                              (cb ? " × '" + cb->name + "'" : std::string()) + ": " +
                              std::to_string(ka) + " × " + std::to_string(kb),
                          t.source);
    return Ok{};
}

// The finding of one check from its per-stratum moments (computed by the caller, or here when
// `given` is null).
template <typename T>
Result<SlopeFinding> run_check(const Scan& s, const Column* ca, const Column* cb,
                               const std::vector<T>& codes_a, const std::vector<T>* codes_b,
                               std::vector<BivariateMoments>* given = nullptr) {
    if (auto st = check_strata_count(s.table, ca, cb); !st) return st.error();
    const std::size_t ka = ca->levels.size() + 1;
    const std::size_t kb = cb ? cb->levels.size() + 1 : 1;
    const std::size_t strata = ka * kb;
    const T* b = codes_b ? codes_b->data() : nullptr;
    const auto moments = given ? std::move(*given) : accumulate(s.d, codes_a.data(), b, kb, strata);
    std::vector<MomentMatrix> matrices;
    if (s.d.p > 0) matrices = accumulate_matrix(s.d, codes_a.data(), b, kb, strata);
    SlopeFinding f = figures(moments, s.d.p > 0 ? &matrices : nullptr, s.d.pooled,
                             s.d.p > 0 ? &s.d.pooled_matrix : nullptr, s.d.hc3, s.q.alpha);
    f.linear_probability = s.d.linear_probability;
    name_groups(f, s.q, ca->name, ca->levels, cb ? &cb->name : nullptr, cb ? &cb->levels : nullptr);
    if (s.q.bootstrap > 0 && f.cls != FindingClass::Stable) {
        std::vector<std::uint32_t> joint(codes_a.size());
        for (std::size_t i = 0; i < joint.size(); ++i)
            joint[i] = static_cast<std::uint32_t>(b ? std::size_t{codes_a[i]} * kb + b[i]
                                                    : std::size_t{codes_a[i]});
        bootstrap_stability(f, s.d, joint, strata, s.q, {});
    }
    return f;
}

// The checks of a scan share passes over the rows in chunks: each chunk of x and y stays in
// cache while every check of the batch folds it into its own per-stratum sums, so the rows are
// read from memory once per batch rather than once per check. (With covariates each check
// runs on its own.)
template <typename T>
Result<std::vector<SlopeFinding>> run_scan(const Scan& s, const std::vector<const Column*>& cands,
                                           bool pairs, const Work& work) {
    std::vector<std::vector<T>> codes;
    codes.reserve(cands.size());
    for (const Column* c : cands) codes.push_back(gather_codes<T>(*c, s.d));
    const std::size_t m = cands.size();
    struct Check {
        std::size_t a, b;  // b == a: single
    };
    std::vector<Check> checks;
    for (std::size_t i = 0; i < m; ++i) checks.push_back({i, i});
    if (pairs)
        for (std::size_t i = 0; i < m; ++i)
            for (std::size_t j = i + 1; j < m; ++j) checks.push_back({i, j});
    for (const auto& c : checks)
        if (auto st = check_strata_count(s.table, cands[c.a], c.b != c.a ? cands[c.b] : nullptr); !st)
            return st.error();
    const double total = static_cast<double>(checks.size());

    auto strata_of = [&](const Check& c) {
        const std::size_t kb = c.b != c.a ? cands[c.b]->levels.size() + 1 : 1;
        return (cands[c.a]->levels.size() + 1) * kb;
    };
    // Checks run in batches whose accumulators fit a memory budget; each batch reads the rows
    // once, and its findings are built before the next batch starts.
    constexpr std::size_t kBudgetBytes = std::size_t{64} << 20;
    constexpr std::size_t kBytesPerStratum = 5 * 9 * sizeof(double);  // 4 lanes + the total
    const std::size_t n = s.d.x.size(), chunk = 16384;
    const double* w = s.d.wptr();
    std::vector<SlopeFinding> out;
    out.reserve(checks.size());
    for (std::size_t c0 = 0; c0 < checks.size();) {
        std::size_t c1 = c0 + 1, bytes = strata_of(checks[c0]) * kBytesPerStratum;
        while (c1 < checks.size() && bytes + strata_of(checks[c1]) * kBytesPerStratum <= kBudgetBytes)
            bytes += strata_of(checks[c1++]) * kBytesPerStratum;
        std::vector<std::vector<BivariateMoments>> moments(c1 - c0);
        if (s.d.p == 0) {
            std::vector<StratumMoments> acc;
            acc.reserve(c1 - c0);
            for (std::size_t c = c0; c < c1; ++c) acc.emplace_back(strata_of(checks[c]));
            // The batch's checks are shared out in nt parts (check c in part c mod nt), each
            // folding the chunks into its own checks' sums (no sharing, so the sums are the same
            // for any thread count); part 0 reports progress.
            const std::size_t nt = std::min<std::size_t>(c1 - c0, resolve_threads(s.q.threads));
            std::atomic<bool> stopped{false};
            auto fold_checks = [&](std::size_t part) {
                for (std::size_t i0 = 0; i0 < n; i0 += chunk) {
                    if (work.cancelled()) {
                        stopped = true;
                        return;
                    }
                    const std::size_t len = std::min(chunk, n - i0);
                    for (std::size_t c = c0 + part; c < c1; c += nt) {
                        const bool pair = checks[c].b != checks[c].a;
                        const std::size_t kb = pair ? cands[checks[c].b]->levels.size() + 1 : 1;
                        acc[c - c0].add_rows(codes[checks[c].a].data() + i0,
                                             pair ? codes[checks[c].b].data() + i0 : static_cast<const T*>(nullptr),
                                             kb, s.d.x.data() + i0, s.d.y.data() + i0, w ? w + i0 : nullptr, len);
                    }
                    if (part == 0)
                        work.report(static_cast<double>(c0) + 0.5 * static_cast<double>(c1 - c0) *
                                                                  static_cast<double>(i0 + len) / static_cast<double>(n),
                                    total, "slope checks");
                }
            };
            run_tasks(nt, static_cast<unsigned>(nt), fold_checks);
            if (stopped) return make_error("cancelled");
            for (std::size_t c = c0; c < c1; ++c) moments[c - c0] = acc[c - c0].finish();
        }
        for (std::size_t c = c0; c < c1; ++c) {
            if (work.cancelled()) return make_error("cancelled");
            const bool pair = checks[c].b != checks[c].a;
            auto r = run_check<T>(s, cands[checks[c].a], pair ? cands[checks[c].b] : nullptr,
                                  codes[checks[c].a], pair ? &codes[checks[c].b] : nullptr,
                                  s.d.p == 0 ? &moments[c - c0] : nullptr);
            if (!r) return r.error();
            out.push_back(std::move(r.value()));
            moments[c - c0] = {};
            work.report(static_cast<double>(c + 1), total, "slope checks");
        }
        c0 = c1;
    }
    return out;
}

}  // namespace

FindingClass classify(SlopeFinding& f, double alpha) {
    double ps = f.pooled.slope, pse = f.pooled.se, pdf = f.pooled.df, pp = f.pooled.p;
    double ws = f.within.slope, wse = f.within.se, wdf = f.within.df, wp = f.within.p;
    if (f.adjusted) {
        ps = f.adjusted_pooled.slope, pse = f.adjusted_pooled.se, pdf = f.adjusted_pooled.df;
        pp = f.adjusted_pooled.p;
        ws = f.adjusted_within.slope, wse = f.adjusted_within.se, wdf = f.adjusted_within.df;
        wp = f.adjusted_within.p;
    }
    f.p_reversal = kNaN;
    if (ps > 0 || ps < 0) {
        const int sign = ps > 0 ? 1 : -1;
        const double a = one_sided_p(ps, pse, pdf, sign), b = one_sided_p(ws, wse, wdf, -sign);
        if (!std::isnan(a) && !std::isnan(b)) f.p_reversal = std::max(a, b);
    }
    const bool q_ok = std::isnan(f.q_value) || f.q_value <= alpha;
    f.reversal = f.p_reversal <= alpha && q_ok;
    bool up = false, down = false;
    for (const auto& g : f.groups) {
        if (!g.informative || !(g.p <= alpha)) continue;
        up = up || g.slope > 0;
        down = down || g.slope < 0;
    }
    const bool pooled_sig = pp <= alpha, within_sig = wp <= alpha;
    if (f.reversal) f.cls = FindingClass::Reversal;
    else if (up && down && f.equal_slopes.p <= alpha) f.cls = FindingClass::Heterogeneous;
    else if (pooled_sig && !within_sig) f.cls = FindingClass::Explained;
    else if (!pooled_sig && within_sig) f.cls = FindingClass::Masked;
    else f.cls = FindingClass::Stable;
    return f.cls;
}

Result<SlopeFinding> check_slope(const Table& table, const SlopeQuestion& q,
                                 const std::vector<const Column*>& strata, const Work& work) {
    if (strata.empty() || strata.size() > 2)
        return make_error("a slope check takes one or two stratifiers; got " +
                          std::to_string(strata.size()));
    for (const Column* c : strata)
        if (auto st = check_stratifier(table, c); !st) return st.error();
    auto d = prepare(table, q);
    if (!d) return d.error();
    if (work.cancelled()) return make_error("cancelled");
    const Scan s{table, q, d.value()};
    using T = std::uint32_t;
    const auto a = gather_codes<T>(*strata[0], *d);
    if (strata.size() == 1) return run_check<T>(s, strata[0], nullptr, a, nullptr);
    const auto b = gather_codes<T>(*strata[1], *d);
    return run_check<T>(s, strata[0], strata[1], a, &b);
}

Result<std::vector<SlopeFinding>> scan_slopes(const Table& table, const SlopeQuestion& q,
                                              const std::vector<const Column*>& candidates,
                                              bool pairs, const Work& work) {
    if (candidates.empty()) return std::vector<SlopeFinding>{};
    std::size_t widest = 0;
    for (const Column* c : candidates) {
        if (auto st = check_stratifier(table, c); !st) return st.error();
        widest = std::max(widest, c->levels.size() + 1);
    }
    auto d = prepare(table, q);
    if (!d) return d.error();
    const Scan s{table, q, d.value()};
    if (widest <= 0xFFu) return run_scan<std::uint8_t>(s, candidates, pairs, work);
    if (widest <= 0xFFFFu) return run_scan<std::uint16_t>(s, candidates, pairs, work);
    return run_scan<std::uint32_t>(s, candidates, pairs, work);
}

Result<std::vector<SlopeFinding>> scan_slopes(const Table& table, const SlopeQuestion& q,
                                              const CandidateSet& candidates, bool pairs,
                                              const Work& work) {
    std::vector<const Column*> columns;
    for (const auto& c : candidates.candidates) columns.push_back(c.column);
    return scan_slopes(table, q, columns, pairs, work);
}

SlopeFinding slope_finding_from_moments(const SlopeQuestion& q, const std::string& stratifier,
                                        const std::vector<std::string>& levels,
                                        const std::vector<BivariateMoments>& strata,
                                        const BivariateMoments& pooled, double hc3,
                                        bool linear_probability) {
    SlopeFinding f = figures(strata, nullptr, pooled, nullptr, hc3, q.alpha);
    f.linear_probability = linear_probability;
    name_groups(f, q, stratifier, levels, nullptr, nullptr);
    return f;
}


Result<LatentFinding> find_groups(const Table& table, const SlopeQuestion& q, std::uint64_t seed,
                                  const Work& work) {
    auto xc = numeric_column(table, q.x, "exposure");
    if (!xc) return xc.error();
    auto yc = numeric_column(table, q.y, "outcome");
    if (!yc) return yc.error();
    std::vector<double> x, y;
    BivariateMoments pooled;
    for (std::size_t i = 0; i < table.rows; ++i) {
        const double xi = (*xc)->values[i], yi = (*yc)->values[i];
        if (!std::isfinite(xi) || !std::isfinite(yi)) continue;
        x.push_back(xi);
        y.push_back(yi);
        pooled.add(xi, yi);
    }
    MixtureOptions opt;
    opt.seed = seed;
    auto sel = select_gaussian_mixture(x, y, opt, work);
    if (!sel) return sel.error();
    LatentFinding f;
    f.x = q.x;
    f.y = q.y;
    f.seed = seed;
    f.rows_used = x.size();
    f.rows_fitted = sel->points;
    f.k = sel->best_k;
    f.pooled_slope = fit_line(pooled).slope.slope;
    for (const auto& fit : sel->fits) f.bic.push_back(fit.ok ? fit.bic : kNaN);
    if (f.k > 0) {
        bool all_opposite = f.k >= 2;
        for (const auto& g : sel->fits[f.k - 1].components) {
            LatentComponent c;
            c.weight = g.weight;
            c.n = g.weight * static_cast<double>(f.rows_fitted);
            c.mean_x = g.mean[0];
            c.mean_y = g.mean[1];
            c.sd_x = std::sqrt(g.cov[0]);
            c.sd_y = std::sqrt(g.cov[2]);
            c.correlation = g.cov[1] / std::sqrt(g.cov[0] * g.cov[2]);
            c.slope = g.cov[0] > 0 ? g.cov[1] / g.cov[0] : kNaN;
            all_opposite = all_opposite && (c.slope * f.pooled_slope < 0);
            f.components.push_back(c);
        }
        f.opposite = all_opposite;
    }
    const std::string k = std::to_string(f.k);
    if (f.k <= 1) {
        f.note = "A single group describes the (" + q.x + ", " + q.y +
                 ") cloud best (BIC); there is no hint of hidden groups.";
    } else if (f.opposite) {
        f.note = "The (" + q.x + ", " + q.y + ") cloud is better described as " + k +
                 " overlapping groups than as one, and within each of them the trend runs "
                 "against the pooled one. This is a hint to look for a variable that separates "
                 "such groups; the groups are a statistical construction, not records of real "
                 "groups.";
    } else {
        f.note = "The (" + q.x + ", " + q.y + ") cloud is better described as " + k +
                 " overlapping groups than as one, but their trends do not all run against the "
                 "pooled one. The groups are a statistical construction, not records of real "
                 "groups.";
    }
    return f;
}

}  // namespace foldline
