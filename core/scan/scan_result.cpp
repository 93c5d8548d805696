#include "core/scan/scan_result.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <utility>

#include "core/stats/fdr.h"

namespace foldline {

void apply_fdr(ScanResult& r) {
    std::vector<double> p;
    p.reserve(r.rate_findings.size() + r.slope_findings.size());
    for (const auto& f : r.rate_findings) p.push_back(f.p_reversal);
    for (const auto& f : r.slope_findings) p.push_back(f.p_reversal);
    for (const auto& f : r.mean_findings) p.push_back(f.p_reversal);
    const auto q = stats::benjamini_hochberg(p);
    const std::size_t nr = r.rate_findings.size();
    for (std::size_t i = 0; i < nr; ++i) {
        auto& f = r.rate_findings[i];
        f.q_value = std::isnan(q[i]) ? 1.0 : q[i];
        f.cls = classify(f.class_inputs, f.q_value, r.alpha);
    }
    for (std::size_t i = 0; i < r.slope_findings.size(); ++i) {
        auto& f = r.slope_findings[i];
        f.q_value = q[nr + i];
        classify(f, r.alpha);
        // The stability is the share of resamples that kept the class the finding has now.
        if (f.stability.draws > 0)
            f.stability.share =
                static_cast<double>(f.draws_by_class[static_cast<std::size_t>(rank(f.cls))]) / f.stability.draws;
    }
    const std::size_t nm = nr + r.slope_findings.size();
    for (std::size_t i = 0; i < r.mean_findings.size(); ++i) {
        auto& f = r.mean_findings[i];
        f.q_value = std::isnan(q[nm + i]) ? 1.0 : q[nm + i];
        f.cls = classify(f.class_inputs, f.q_value, r.alpha);
    }
}

namespace {

// Orders a list by family: the own-figures order first (`own`), then a stable sort that keeps
// every family together behind its lead, lead, proxies, members.
template <class F, class Own>
void order_by_family(std::vector<F>& fs, Own own, auto comparison) {
    std::stable_sort(fs.begin(), fs.end(), own);
    std::map<std::pair<std::size_t, std::string>, std::size_t> lead_at;
    for (std::size_t i = 0; i < fs.size(); ++i)
        if (fs[i].family.role == FamilyRole::Lead) lead_at.try_emplace({comparison(fs[i]), fs[i].label()}, i);
    std::vector<std::size_t> key(fs.size());
    for (std::size_t i = 0; i < fs.size(); ++i) {
        auto it = lead_at.find({comparison(fs[i]), fs[i].family_lead()});
        key[i] = it == lead_at.end() ? i : it->second;
    }
    std::vector<std::size_t> order(fs.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
        if (key[a] != key[b]) return key[a] < key[b];
        auto place = [](FamilyRole role) { return role == FamilyRole::Lead ? 0 : role == FamilyRole::Proxy ? 1 : 2; };
        return place(fs[a].family.role) < place(fs[b].family.role);
    });
    std::vector<F> sorted;
    sorted.reserve(fs.size());
    for (std::size_t i : order) sorted.push_back(std::move(fs[i]));
    fs = std::move(sorted);
}

}  // namespace

void rank_findings(ScanResult& r) {
    assign_families(r);
    order_by_family(
        r.rate_findings,
        [](const RateFinding& a, const RateFinding& b) {
            if (rank(a.cls) != rank(b.cls)) return rank(a.cls) < rank(b.cls);
            if (a.q_value != b.q_value) return a.q_value < b.q_value;
            if (a.strata.size() != b.strata.size()) return a.strata.size() < b.strata.size();
            if (a.change != b.change) return a.change > b.change;
            return a.label() < b.label();
        },
        [](const RateFinding& f) { return f.comparison; });
    // The size of a slope finding's change is measured on the figures its class was decided on:
    // the covariate-adjusted slopes when there are covariates.
    auto change = [](const SlopeFinding& f) {
        const double c = f.adjusted ? f.adjusted_within.slope - f.adjusted_pooled.slope : f.within.slope - f.pooled.slope;
        return std::isnan(c) ? -1.0 : std::abs(c);
    };
    auto qv = [](const SlopeFinding& f) { return std::isnan(f.q_value) ? 2.0 : f.q_value; };
    order_by_family(
        r.slope_findings,
        [&](const SlopeFinding& a, const SlopeFinding& b) {
            if (rank(a.cls) != rank(b.cls)) return rank(a.cls) < rank(b.cls);
            if (qv(a) != qv(b)) return qv(a) < qv(b);
            if (a.strata.size() != b.strata.size()) return a.strata.size() < b.strata.size();
            if (change(a) != change(b)) return change(a) > change(b);
            return a.strata < b.strata;
        },
        [](const SlopeFinding&) { return std::size_t{0}; });
    std::stable_sort(r.mean_findings.begin(), r.mean_findings.end(), [](const MeanFinding& a, const MeanFinding& b) {
        if (rank(a.cls) != rank(b.cls)) return rank(a.cls) < rank(b.cls);
        if (a.q_value != b.q_value) return a.q_value < b.q_value;
        if (a.change != b.change) return a.change > b.change;
        if (a.strata.size() != b.strata.size()) return a.strata.size() < b.strata.size();
        if (a.label() != b.label()) return a.label() < b.label();
        return a.comparison < b.comparison;
    });
    r.families = list_families(r);
}

}  // namespace foldline
