#include "core/scan/families.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <functional>
#include <limits>
#include <tuple>
#include <map>
#include <numeric>
#include <utility>

#include "core/scan/scan_result.h"
#include "core/stats/distributions.h"
#include "core/stats/fdr.h"

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string num(const char* f, double x) {
    char b[64];
    std::snprintf(b, sizeof b, f, x);
    return b;
}

std::string q_words(double q) {
    return std::isfinite(q) ? (q < 0.0001 ? "q < 0.0001" : "q = " + num("%.3g", q)) : "q n/a";
}

FurtherStratifying finish(double stat, double df) {
    FurtherStratifying t;
    if (df <= 0) return {kNaN, 0, kNaN};
    t.statistic = stat;
    t.df = df;
    t.p = stats::chi_square_sf(stat, df);
    return t;
}

// Cramér's V and nesting from the cell sizes of two stratifiers.
StrataAssociation associate(const std::vector<std::pair<std::pair<std::string, std::string>, double>>& cells,
                            const std::vector<std::string>& names) {
    StrataAssociation a;
    std::map<std::string, double> rows, cols;
    std::map<std::string, int> row_meets, col_meets;
    double n = 0;
    for (const auto& [k, w] : cells) {
        if (!(w > 0)) continue;
        rows[k.first] += w;
        cols[k.second] += w;
        ++row_meets[k.first];
        ++col_meets[k.second];
        n += w;
    }
    const std::size_t r = rows.size(), c = cols.size();
    if (n <= 0 || r < 2 || c < 2) {
        a.cramers_v = kNaN;
        return a;
    }
    double s = 0;
    for (const auto& [k, w] : cells)
        if (w > 0) s += w * w / (rows[k.first] * cols[k.second]);
    const double chi2 = n * (s - 1);
    a.cramers_v = std::sqrt(std::max(0.0, chi2) / (n * static_cast<double>(std::min(r, c) - 1)));
    // The first stratifier is a function of the second when each level of the second meets one
    // level of the first.
    const bool first_of_second =
        std::all_of(col_meets.begin(), col_meets.end(), [](const auto& m) { return m.second == 1; });
    const bool second_of_first =
        std::all_of(row_meets.begin(), row_meets.end(), [](const auto& m) { return m.second == 1; });
    a.nested = first_of_second || second_of_first;
    if (a.nested && names.size() == 2) a.coarser = first_of_second ? (r <= c ? names[0] : names[1]) : names[1];
    return a;
}

// The rank of a finding by its own figures: class, q, fewer stratifiers, larger change, label.
double rate_change(const RateFinding& f) { return f.change; }
double slope_change(const SlopeFinding& f) {
    const double c = f.adjusted ? f.adjusted_within.slope - f.adjusted_pooled.slope : f.within.slope - f.pooled.slope;
    return std::isnan(c) ? -1.0 : std::abs(c);
}
template <class F>
bool ranks_before(const F& a, const F& b, double ca, double cb) {
    auto qv = [](double q) { return std::isnan(q) ? 2.0 : q; };
    if (rank(a.cls) != rank(b.cls)) return rank(a.cls) < rank(b.cls);
    if (qv(a.q_value) != qv(b.q_value)) return qv(a.q_value) < qv(b.q_value);
    if (a.strata.size() != b.strata.size()) return a.strata.size() < b.strata.size();
    if (ca != cb) return ca > cb;
    return a.label() < b.label();
}
bool before(const RateFinding& a, const RateFinding& b) { return ranks_before(a, b, rate_change(a), rate_change(b)); }
bool before(const SlopeFinding& a, const SlopeFinding& b) {
    return ranks_before(a, b, slope_change(a), slope_change(b));
}

// The adjusted estimate and interval a family compares: the MH odds ratio for rates, the within
// slope (adjusted when there are covariates) for slopes.
struct Adjusted {
    double estimate, lo, hi;
    const char* what;
};
Adjusted adjusted_of(const RateFinding& f) {
    return {f.adjusted.mh_or.estimate, f.adjusted.mh_or.ci.lo, f.adjusted.mh_or.ci.hi, "odds ratio"};
}
Adjusted adjusted_of(const SlopeFinding& f) {
    if (f.adjusted)
        return {f.adjusted_within.slope, f.adjusted_within.ci_low, f.adjusted_within.ci_high, "within slope"};
    return {f.within.slope, f.within.ci_low, f.within.ci_high, "within slope"};
}
std::string estimate_words(double x) { return num("%.3g", x); }

// Same comparison (rates) — slopes of one scan always share theirs.
std::size_t comparison_of(const RateFinding& f) { return f.comparison; }
std::size_t comparison_of(const SlopeFinding&) { return 0; }

struct Candidate {
    std::size_t pair, single;  ///< finding index; which of the pair's stratifiers is S (0 or 1)
    bool inside;               ///< the pair's adjusted estimate lies inside S's interval
    FurtherStratifying test;
    double q = kNaN;           ///< BH over every family test of the scan
};

// One comparison's findings, with its singles by name.
template <class F>
struct Group {
    std::vector<F>& fs;
    std::vector<std::size_t> idx;
    std::map<std::string, std::size_t> single;
    bool flagged(std::size_t i) const { return fs[i].cls != FindingClass::Stable; }
    /// The flagged single of that name, or -1.
    std::ptrdiff_t flagged_single(const std::string& s) const {
        auto it = single.find(s);
        return it == single.end() || !flagged(it->second) ? -1 : static_cast<std::ptrdiff_t>(it->second);
    }
};

template <class F>
std::vector<Group<F>> groups_of(std::vector<F>& fs) {
    std::map<std::size_t, std::vector<std::size_t>> by;
    for (std::size_t i = 0; i < fs.size(); ++i) by[comparison_of(fs[i])].push_back(i);
    std::vector<Group<F>> out;
    for (auto& [cmp, idx] : by) {
        (void)cmp;
        Group<F> g{fs, idx, {}};
        for (std::size_t i : idx)
            if (fs[i].strata.size() == 1) g.single[fs[i].strata[0]] = i;
        out.push_back(std::move(g));
    }
    return out;
}

// Every (flagged pair, flagged single of the same class) a family test is run for.
template <class F>
std::vector<Candidate> family_tests(std::vector<F>& fs) {
    std::vector<Candidate> out;
    for (const auto& g : groups_of(fs))
        for (std::size_t i : g.idx) {
            const F& f = fs[i];
            if (f.strata.size() != 2 || !g.flagged(i)) continue;
            for (std::size_t s = 0; s < 2; ++s) {
                const auto si = g.flagged_single(f.strata[s]);
                if (si < 0 || fs[si].cls != f.cls) continue;
                const Adjusted a = adjusted_of(f), b = adjusted_of(fs[si]);
                out.push_back({i, s, a.estimate >= b.lo && a.estimate <= b.hi, further_stratifying(f, s)});
            }
        }
    return out;
}

// Proxies: unions of flagged singles linked through their pair's association; each union's
// lead is its best-ranked single.
template <class F>
struct Proxies {
    std::map<std::size_t, std::size_t> lead;                          ///< single -> its union's lead
    std::map<std::pair<std::size_t, std::size_t>, std::string> link;  ///< why two singles are linked

    std::size_t lead_of(std::size_t s) const {
        auto it = lead.find(s);
        return it == lead.end() ? s : it->second;
    }
};

template <class F>
Proxies<F> proxies_of(const Group<F>& g) {
    const auto& fs = g.fs;
    Proxies<F> px;
    std::map<std::size_t, std::size_t> parent;
    std::function<std::size_t(std::size_t)> root = [&](std::size_t x) -> std::size_t {
        auto it = parent.find(x);
        if (it == parent.end() || it->second == x) return x;
        return it->second = root(it->second);
    };
    for (std::size_t i : g.idx) {
        const F& f = fs[i];
        if (f.strata.size() != 2) continue;
        const auto s0 = g.flagged_single(f.strata[0]), s1 = g.flagged_single(f.strata[1]);
        if (s0 < 0 || s1 < 0) continue;
        const StrataAssociation a = association(f);
        if (!a.nested && !(a.cramers_v >= kProxyCramersV)) continue;
        const std::string other = a.coarser == f.strata[0] ? f.strata[1] : f.strata[0];
        const std::string why =
            a.nested ? (a.coarser.empty() ? f.strata[0] + " and " + f.strata[1] + " have nested levels"
                                          : a.coarser + " is a function of " + other + " (nested levels)")
                     : "Cramér's V " + num("%.2f", a.cramers_v) + " between " + f.strata[0] + " and " + f.strata[1] +
                           " (at least " + num("%.1f", kProxyCramersV) + ")";
        const auto u = static_cast<std::size_t>(s0), v = static_cast<std::size_t>(s1);
        px.link[{u, v}] = why;
        px.link[{v, u}] = why;
        parent.try_emplace(u, u);
        parent.try_emplace(v, v);
        const std::size_t ru = root(u), rv = root(v);
        if (ru != rv) parent[std::max(ru, rv)] = std::min(ru, rv);
    }
    std::map<std::size_t, std::size_t> best;
    for (const auto& [x, p] : parent) {
        (void)p;
        const std::size_t r = root(x);
        auto it = best.find(r);
        if (it == best.end() || before(fs[x], fs[it->second])) best[r] = x;
    }
    for (const auto& [x, p] : parent) {
        (void)p;
        px.lead[x] = best[root(x)];
    }
    return px;
}

template <class F>
void decide(std::vector<F>& fs, const std::vector<Candidate>& tests, double alpha) {
    for (auto& g : groups_of(fs)) {
        const Proxies<F> px = proxies_of(g);
        for (std::size_t i : g.idx) {
            F& f = fs[i];
            f.family = {f.label(), FamilyRole::Lead, {}};
            if (!g.flagged(i)) {
                f.family.reason = "not flagged";
                continue;
            }
            if (f.strata.size() == 1) {
                const std::size_t l = px.lead_of(i);
                if (l == i) {
                    f.family.reason = "single column";
                    continue;
                }
                f.family.role = FamilyRole::Proxy;
                f.family.lead = fs[l].label();
                auto direct = px.link.find({i, l});
                if (direct != px.link.end()) {
                    f.family.reason = "proxy of " + fs[l].label() + ": " + direct->second;
                } else {
                    for (const auto& [k, why] : px.link)
                        if (k.first == i) {
                            f.family.reason = "proxy of " + fs[l].label() + " through " + fs[k.second].label() + ": " + why;
                            break;
                        }
                }
                continue;
            }
            if (f.strata.size() != 2) continue;
            // This pair's tests, the better-ranked single first.
            std::vector<const Candidate*> mine;
            for (const auto& c : tests)
                if (c.pair == i) mine.push_back(&c);
            std::sort(mine.begin(), mine.end(), [&](const Candidate* a, const Candidate* b) {
                return before(fs[g.flagged_single(f.strata[a->single])], fs[g.flagged_single(f.strata[b->single])]);
            });
            std::string why_not;
            bool joined = false;
            for (const Candidate* c : mine) {
                const std::string& s = f.strata[c->single];
                const std::string& t = f.strata[1 - c->single];
                const auto si = static_cast<std::size_t>(g.flagged_single(s));
                const Adjusted a = adjusted_of(f), b = adjusted_of(fs[si]);
                const bool rejects = std::isfinite(c->q) && c->q <= alpha;
                if (c->inside && !rejects) {
                    const std::size_t l = px.lead_of(si);
                    f.family.role = FamilyRole::Member;
                    f.family.lead = fs[l].label();
                    f.family.reason = "adds nothing beyond " + s + ": " + a.what + " " + estimate_words(a.estimate) +
                                      " inside " + s + "'s interval " + estimate_words(b.lo) + " to " +
                                      estimate_words(b.hi) + "; further stratifying " + s + " by " + t +
                                      (std::isfinite(c->q) ? " does not change the effect (" + q_words(c->q) + ")"
                                                           : " cannot be tested (too few usable strata)") +
                                      (l != si ? "; " + s + " is a proxy of " + fs[l].label() : "");
                    joined = true;
                    break;
                }
                why_not += (why_not.empty() ? "" : "; ") + std::string("adds to ") + s + ": " +
                           (!c->inside ? std::string(a.what) + " " + estimate_words(a.estimate) + " outside " + s +
                                             "'s interval " + estimate_words(b.lo) + " to " + estimate_words(b.hi)
                                       : "further stratifying " + s + " by " + t + " changes the effect (" +
                                             q_words(c->q) + ")");
            }
            if (joined) continue;
            if (!why_not.empty()) {
                f.family.reason = why_not;
            } else {
                const bool any = g.flagged_single(f.strata[0]) >= 0 || g.flagged_single(f.strata[1]) >= 0;
                f.family.reason = any ? "its flagged single has another class: the joint strata tell their own story"
                                      : "neither single is flagged: the joint strata are the explanation";
            }
        }
    }
}

}  // namespace

FurtherStratifying further_stratifying(const RateFinding& pair, std::size_t s_index) {
    std::map<std::string, stats::Strata> by_level;
    for (const auto& row : pair.strata_table) {
        if (!row.informative || row.levels.size() != 2 || s_index > 1) continue;
        by_level[row.levels[s_index]].push_back(
            {row.pos_focal, row.n_focal - row.pos_focal, row.pos_reference, row.n_reference - row.pos_reference});
    }
    double stat = 0, df = 0;
    for (const auto& [level, st] : by_level) {
        (void)level;
        if (st.size() < 2) continue;
        const double psi = stats::mh_odds_ratio(st).estimate;
        const auto bd = stats::breslow_day(st, psi);
        if (!std::isfinite(bd.statistic_tarone) || !(bd.df > 0)) continue;
        stat += bd.statistic_tarone;
        df += bd.df;
    }
    return finish(stat, df);
}

FurtherStratifying further_stratifying(const SlopeFinding& pair, std::size_t s_index) {
    struct Sums {
        double w = 0, wb = 0, wbb = 0;
        int k = 0;
    };
    std::map<std::string, Sums> by_level;
    for (const auto& g : pair.groups) {
        if (!g.informative || g.levels.size() != 2 || s_index > 1) continue;
        if (!std::isfinite(g.slope) || !(g.se > 0) || !std::isfinite(g.se)) continue;
        Sums& s = by_level[g.levels[s_index]];
        const double w = 1 / (g.se * g.se);
        s.w += w;
        s.wb += w * g.slope;
        s.wbb += w * g.slope * g.slope;
        ++s.k;
    }
    double stat = 0, df = 0;
    for (const auto& [level, s] : by_level) {
        (void)level;
        if (s.k < 2) continue;
        stat += std::max(0.0, s.wbb - s.wb * s.wb / s.w);  // Σ w (b - b̄)², b̄ the weighted mean
        df += s.k - 1;
    }
    return finish(stat, df);
}

StrataAssociation association(const RateFinding& pair) {
    std::vector<std::pair<std::pair<std::string, std::string>, double>> cells;
    for (const auto& row : pair.strata_table)
        if (row.levels.size() == 2) cells.push_back({{row.levels[0], row.levels[1]}, row.n_focal + row.n_reference});
    return associate(cells, pair.strata);
}

StrataAssociation association(const SlopeFinding& pair) {
    std::vector<std::pair<std::pair<std::string, std::string>, double>> cells;
    for (const auto& g : pair.groups)
        if (g.levels.size() == 2) cells.push_back({{g.levels[0], g.levels[1]}, g.n});
    return associate(cells, pair.strata);
}

void assign_families(ScanResult& r) {
    auto rate_tests = family_tests(r.rate_findings);
    auto slope_tests = family_tests(r.slope_findings);
    std::vector<double> p;
    for (const auto& c : rate_tests) p.push_back(c.test.p);
    for (const auto& c : slope_tests) p.push_back(c.test.p);
    const auto q = stats::benjamini_hochberg(p);
    for (std::size_t i = 0; i < rate_tests.size(); ++i) rate_tests[i].q = q[i];
    for (std::size_t i = 0; i < slope_tests.size(); ++i) slope_tests[i].q = q[rate_tests.size() + i];
    decide(r.rate_findings, rate_tests, r.alpha);
    decide(r.slope_findings, slope_tests, r.alpha);
}

std::vector<FindingFamilySummary> list_families(const ScanResult& r) {
    std::vector<FindingFamilySummary> out;
    std::map<std::tuple<int, std::size_t, std::string>, std::size_t> at;
    auto add = [&](const auto& f, FindingKind kind, std::size_t cmp) {
        if (f.cls == FindingClass::Stable && f.family.role == FamilyRole::Lead) return;
        const auto key = std::make_tuple(static_cast<int>(kind), cmp, f.family_lead());
        auto it = at.find(key);
        if (f.family.role == FamilyRole::Lead) {
            if (it != at.end()) return;
            at[key] = out.size();
            out.push_back({kind, cmp, f.label(), f.cls, {}, {}});
            return;
        }
        if (it == at.end()) return;
        auto& fam = out[it->second];
        (f.family.role == FamilyRole::Proxy ? fam.proxies : fam.members).push_back(f.label());
    };
    // Leads first so members that rank above their lead (never after rank_findings) still land.
    for (const auto& f : r.rate_findings)
        if (f.family.role == FamilyRole::Lead) add(f, FindingKind::Rate, f.comparison);
    for (const auto& f : r.slope_findings)
        if (f.family.role == FamilyRole::Lead) add(f, FindingKind::Slope, 0);
    for (const auto& f : r.rate_findings)
        if (f.family.role != FamilyRole::Lead) add(f, FindingKind::Rate, f.comparison);
    for (const auto& f : r.slope_findings)
        if (f.family.role != FamilyRole::Lead) add(f, FindingKind::Slope, 0);
    return out;
}

}  // namespace foldline
