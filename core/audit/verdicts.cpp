#include "core/audit/verdicts.h"

#include <algorithm>
#include <cmath>

#include "core/causal/missing_columns.h"
#include "core/causal/verdict.h"

namespace foldline::audit {
namespace {

/// Which view a verdict points to for a finding stratified by `strata`; nullopt when none
/// (not identifiable by adjustment).
std::optional<AdjustedEstimate::View> view_of(const causal::Verdict& v, const std::vector<std::string>& strata) {
    if (!v.standardise_over) return std::nullopt;
    if (v.standardise_over->empty()) return AdjustedEstimate::View::Pooled;
    std::vector<std::string> a = *v.standardise_over, b = strata;
    std::sort(a.begin(), a.end());
    std::sort(b.begin(), b.end());
    return a == b ? AdjustedEstimate::View::Stratified : AdjustedEstimate::View::Standardised;
}

/// Error "the diagram lacks the finding's columns ..." when `d` lacks any of the finding's
/// columns (exposure, outcome, stratifiers); Ok otherwise.
Status all_columns_in(const causal::Diagram& d, const std::string& exposure, const std::string& outcome,
                      const std::vector<std::string>& strata) {
    std::vector<std::string> columns = {exposure, outcome};
    columns.insert(columns.end(), strata.begin(), strata.end());
    const auto missing = causal::missing_columns(d, columns);
    if (missing.empty()) return Ok{};
    return make_error(causal::missing_columns_sentence(missing));
}

std::optional<AdjustedEstimate> estimate(AdjustedEstimate::View view, std::vector<std::string> over,
                                         const char* measure, double value, double lo, double hi) {
    if (!std::isfinite(value)) return std::nullopt;
    return AdjustedEstimate{view, std::move(over), measure, value, lo, hi};
}

/// The trend question a slope finding answers (its own x, y and covariates).
SlopeQuestion question_of(const ScanResult& result, const SlopeFinding& f) {
    SlopeQuestion q = result.slope_question;
    q.x = f.x;
    q.y = f.y;
    q.covariates = f.covariates;
    return q;
}

}  // namespace

Result<FindingVerdict> rate_verdict(const causal::CausalGraph& graph, const ScanResult& result, const RateFinding& f,
                                    const Table* table, const EstimateSettings& settings) {
    const auto& q = result.question;
    auto v = causal::decide(graph, q.exposure, q.outcome, f.strata);
    if (!v) return v.error();
    FindingVerdict out;
    const auto view = view_of(*v, f.strata);
    using View = AdjustedEstimate::View;
    if (view == View::Pooled) {
        out.estimate = estimate(View::Pooled, {}, "risk_difference", f.crude.rd, f.crude.rd_ci.lo, f.crude.rd_ci.hi);
    } else if (view == View::Stratified) {
        const auto& s = f.adjusted.standardized;
        out.estimate = estimate(View::Stratified, f.strata, "risk_difference", s.rd, s.rd_ci.lo, s.rd_ci.hi);
    } else if (view == View::Standardised) {
        auto e = estimate_over_set(result, FindingKind::Rate, table, *v->standardise_over, settings, f.comparison);
        if (e)
            out.estimate = estimate(View::Standardised, *v->standardise_over, "risk_difference", e->estimate,
                                    e->ci_low, e->ci_high);
        else
            out.estimate_problem = e.error().message;
    }
    out.verdict = std::move(*v);
    return out;
}

Result<FindingVerdict> slope_verdict(const causal::CausalGraph& graph, const ScanResult& result, const SlopeFinding& f,
                                     const Table* table, const EstimateSettings& settings) {
    auto v = causal::decide(graph, f.x, f.y, f.strata);
    if (!v) return v.error();
    FindingVerdict out;
    const auto view = view_of(*v, f.strata);
    using View = AdjustedEstimate::View;
    // With covariates every view quotes the covariate-adjusted slope, as the class does.
    if (view == View::Pooled) {
        if (f.adjusted)
            out.estimate = estimate(View::Pooled, {}, "slope", f.adjusted_pooled.slope, f.adjusted_pooled.ci_low,
                                    f.adjusted_pooled.ci_high);
        else
            out.estimate = estimate(View::Pooled, {}, "slope", f.pooled.slope, f.pooled.ci_low, f.pooled.ci_high);
    } else if (view == View::Stratified) {
        if (f.adjusted)
            out.estimate = estimate(View::Stratified, f.strata, "slope", f.adjusted_within.slope,
                                    f.adjusted_within.ci_low, f.adjusted_within.ci_high);
        else
            out.estimate = estimate(View::Stratified, f.strata, "slope", f.within.slope, f.within.ci_low,
                                    f.within.ci_high);
    } else if (view == View::Standardised) {
        ScanResult one;
        one.slope_question = question_of(result, f);
        one.alpha = result.alpha;
        auto e = estimate_over_set(one, FindingKind::Slope, table, *v->standardise_over, settings);
        if (e)
            out.estimate = estimate(View::Standardised, *v->standardise_over, "slope", e->estimate, e->ci_low,
                                    e->ci_high);
        else
            out.estimate_problem = e.error().message;
    }
    out.verdict = std::move(*v);
    return out;
}

Result<FindingVerdict> mean_verdict(const causal::CausalGraph& graph, const ScanResult& result, const MeanFinding& f,
                                    const Table* table, const EstimateSettings& settings) {
    auto v = causal::decide(graph, result.question.exposure, f.outcome, f.strata);
    if (!v) return v.error();
    FindingVerdict out;
    const auto view = view_of(*v, f.strata);
    using View = AdjustedEstimate::View;
    constexpr const char* measure = "mean_difference";
    if (view == View::Pooled) {
        const auto& d = f.crude.difference;
        out.estimate = estimate(View::Pooled, {}, measure, d.estimate, d.ci_low, d.ci_high);
    } else if (view == View::Stratified) {
        // The fixed-effects difference with its HC1 interval: the figure the class is decided on.
        const auto& fe = f.fixed_effects;
        out.estimate = estimate(View::Stratified, f.strata, measure, fe.estimate, fe.robust.ci_low, fe.robust.ci_high);
    } else if (view == View::Standardised) {
        auto e = estimate_over_set(result, FindingKind::Mean, table, *v->standardise_over, settings, f.comparison);
        if (e)
            out.estimate = estimate(View::Standardised, *v->standardise_over, measure, e->estimate, e->ci_low,
                                    e->ci_high);
        else
            out.estimate_problem = e.error().message;
    }
    out.verdict = std::move(*v);
    return out;
}

Result<FindingVerdict> judge(const causal::Diagram& diagram, const std::string& exposure, const std::string& outcome,
                             const std::vector<std::string>& strata, const ScanResult* result, const Table* table,
                             const EstimateSettings& settings) {
    auto graph = causal::CausalGraph::build(diagram);
    if (!graph) return graph.error();
    if (auto st = all_columns_in(diagram, exposure, outcome, strata); !st) return st.error();
    if (result) {
        if (result->question.exposure == exposure && result->question.outcome == outcome)
            for (const auto& f : result->rate_findings)
                if (f.strata == strata) return rate_verdict(*graph, *result, f, table, settings);
        if (result->question.exposure == exposure)
            for (const auto& f : result->mean_findings)
                if (f.outcome == outcome && f.strata == strata) return mean_verdict(*graph, *result, f, table, settings);
        for (const auto& f : result->slope_findings)
            if (f.x == exposure && f.y == outcome && f.strata == strata)
                return slope_verdict(*graph, *result, f, table, settings);
    }
    auto v = causal::decide(*graph, exposure, outcome, strata);
    if (!v) return v.error();
    FindingVerdict out;
    out.verdict = std::move(*v);
    return out;
}

std::string attach_verdicts(ScanResult& result, const Table* table, const causal::Diagram& diagram,
                            const EstimateSettings& settings) {
    std::string problem;
    auto clear = [](FindingHeader& f) {
        f.verdict.reset();
        f.verdict_problem.clear();
    };
    for (auto& f : result.rate_findings) clear(f);
    for (auto& f : result.slope_findings) clear(f);
    for (auto& f : result.mean_findings) clear(f);
    if (diagram.nodes.empty()) return problem;
    auto graph = causal::CausalGraph::build(diagram);
    if (!graph) {
        for (auto& f : result.rate_findings) f.verdict_problem = graph.error().message;
        for (auto& f : result.slope_findings) f.verdict_problem = graph.error().message;
        for (auto& f : result.mean_findings) f.verdict_problem = graph.error().message;
        return graph.error().message;
    }
    auto keep = [&](FindingHeader& f, Result<FindingVerdict> v) {
        if (v) {
            f.verdict = std::move(*v);
        } else {
            f.verdict_problem = v.error().message;
            if (problem.empty()) problem = v.error().message;
        }
    };
    // A finding whose columns the diagram lacks says which ones (core/causal/missing_columns).
    for (auto& f : result.rate_findings) {
        if (auto st = all_columns_in(diagram, result.question.exposure, result.question.outcome, f.strata); !st)
            keep(f, st.error());
        else
            keep(f, rate_verdict(*graph, result, f, table, settings));
    }
    for (auto& f : result.slope_findings) {
        if (auto st = all_columns_in(diagram, f.x, f.y, f.strata); !st) keep(f, st.error());
        else keep(f, slope_verdict(*graph, result, f, table, settings));
    }
    for (auto& f : result.mean_findings) {
        if (auto st = all_columns_in(diagram, result.question.exposure, f.outcome, f.strata); !st) keep(f, st.error());
        else keep(f, mean_verdict(*graph, result, f, table, settings));
    }
    return problem;
}

Result<EstimateOver> estimate_over_set(const ScanResult& result, FindingKind kind, const Table* table,
                                       const std::vector<std::string>& set, const EstimateSettings& settings,
                                       std::size_t comparison) {
    if (set.empty()) return make_error("the empty set needs no adjustment: the pooled figure applies");
    if (!table) return make_error("an estimate over another set needs the rows (this source gave only counts)");
    const bool slope = kind == FindingKind::Slope;
    Result<EstimateOver> e = make_error("not computed");
    switch (kind) {
        case FindingKind::Slope:
            e = within_slope_over(*table, result.slope_question, set, settings.bins, settings.max_levels);
            break;
        case FindingKind::Rate:
            e = standardised_rd_over(*table, encode_rows(*table, result.question), set, comparison, settings.alpha,
                                     settings.bins, settings.max_levels);
            break;
        case FindingKind::Mean:
            e = fixed_effects_gap_over(*table, result.question, result.log_outcome, set, comparison, settings.alpha,
                                       settings.bins, settings.max_levels);
            break;
    }
    if (!e) return e;
    if (!std::isfinite(e->estimate))
        return make_error(slope ? "no joint stratum of that set has spread in the exposure"
                                : "no joint stratum of that set holds both groups");
    return e;
}

}  // namespace foldline::audit
