#include "core/report/verdict_json.h"

#include <algorithm>
#include <cmath>

#include "core/report/causal_json.h"
#include "core/scan/estimate_over.h"

namespace foldline::report {
namespace {

using nlohmann::json;

json num(double x) { return std::isfinite(x) ? json(x) : json(nullptr); }

json estimate(const char* view, const std::vector<std::string>& over, const char* measure, double value,
              double lo, double hi) {
    if (!std::isfinite(value)) return nullptr;
    return {{"view", view}, {"over", over}, {"measure", measure}, {"estimate", value},
            {"ci", json::array({num(lo), num(hi)})}};
}

/// Which view the verdict points to: "pooled", "stratified" (the finding's own strata),
/// "standardised" (another set), or "" when none.
std::string view_of(const causal::Verdict& v, const std::vector<std::string>& strata) {
    if (!v.standardise_over) return "";
    if (v.standardise_over->empty()) return "pooled";
    std::vector<std::string> a = *v.standardise_over, b = strata;
    std::sort(a.begin(), a.end());
    std::sort(b.begin(), b.end());
    return a == b ? "stratified" : "standardised";
}

}  // namespace

json rate_verdict_json(const Table& table, const RowCells& rows,
                       const RateFinding& f, const causal::Verdict& v, double alpha) {
    json j = to_json(v);
    const std::string view = view_of(v, f.strata);
    json est = nullptr;
    if (view == "pooled") {
        est = estimate("pooled", {}, "risk_difference", f.crude.rd, f.crude.rd_ci.lo, f.crude.rd_ci.hi);
    } else if (view == "stratified") {
        const auto& s = f.adjusted.standardized;
        est = estimate("stratified", f.strata, "risk_difference", s.rd, s.rd_ci.lo, s.rd_ci.hi);
    } else if (view == "standardised") {
        auto s = standardised_rd_over(table, rows, *v.standardise_over, f.comparison, alpha);
        if (s)
            est = estimate("standardised", *v.standardise_over, "risk_difference", s->estimate, s->ci_low, s->ci_high);
        else
            j["estimate_problem"] = s.error().message;
    }
    j["adjusted_estimate"] = std::move(est);
    return j;
}

json slope_verdict_json(const Table& table, const SlopeQuestion& question, const SlopeFinding& f,
                        const causal::Verdict& v) {
    json j = to_json(v);
    const std::string view = view_of(v, f.strata);
    json est = nullptr;
    // With covariates every view quotes the covariate-adjusted slope, as the class does.
    if (view == "pooled") {
        if (f.adjusted)
            est = estimate("pooled", {}, "slope", f.adjusted_pooled.slope, f.adjusted_pooled.ci_low,
                           f.adjusted_pooled.ci_high);
        else
            est = estimate("pooled", {}, "slope", f.pooled.slope, f.pooled.ci_low, f.pooled.ci_high);
    } else if (view == "stratified") {
        if (f.adjusted)
            est = estimate("stratified", f.strata, "slope", f.adjusted_within.slope, f.adjusted_within.ci_low,
                           f.adjusted_within.ci_high);
        else
            est = estimate("stratified", f.strata, "slope", f.within.slope, f.within.ci_low, f.within.ci_high);
    } else if (view == "standardised") {
        auto other = within_slope_over(table, question, *v.standardise_over);
        if (other)
            est = estimate("standardised", *v.standardise_over, "slope", other->estimate, other->ci_low, other->ci_high);
        else
            j["estimate_problem"] = other.error().message;
    }
    j["adjusted_estimate"] = std::move(est);
    return j;
}

}  // namespace foldline::report
