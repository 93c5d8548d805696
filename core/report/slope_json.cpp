#include "core/report/slope_json.h"
#include "core/report/verdict_json.h"

#include <cmath>

#include "core/report/json_number.h"
#include "core/report/scan_json.h"

namespace foldline {
namespace {

using nlohmann::json;

// Estimates stay doubles (null when undefined); counts go through json_number (integers when
// whole, so `"rows": 200`; a fractional weighted count stays fractional).
json num(double v) { return std::isfinite(v) ? json(v) : json(nullptr); }
json interval(double lo, double hi) { return json::array({num(lo), num(hi)}); }

json estimate(const SlopeEstimate& e) {
    return {{"slope", num(e.slope)}, {"slope_ci", interval(e.ci_low, e.ci_high)},
            {"se", num(e.se)},       {"p", num(e.p)},
            {"df", num(e.df)}};
}

}  // namespace

json to_json(const SlopeFinding& f) {
    json j;
    j["kind"] = "slope";
    j["x"] = f.x;
    j["y"] = f.y;
    j["covariates"] = f.covariates;
    j["strata"] = f.strata;
    j["class"] = std::string(to_string(f.cls));
    j["reversal"] = f.reversal;
    j["p_reversal"] = num(f.p_reversal);
    j["q_value"] = num(f.q_value);
    j["stability"] = num(f.stability.share);
    j["stability_draws"] = f.stability.draws;
    j["family"] = family_to_json(f);
    j["linear_probability"] = f.linear_probability;
    if (f.linear_probability)
        j["note"] = "The outcome is 0/1: slopes are linear-probability slopes (change in the "
                    "probability per unit of the exposure).";
    j["rows"] = json_number(f.rows_used);
    j["pooled"] = {{"slope", num(f.pooled.slope)},
                   {"slope_ci", interval(f.pooled.ci_low, f.pooled.ci_high)},
                   {"se", num(f.pooled.se)},
                   {"se_robust", num(f.pooled.se_robust)},
                   {"p", num(f.pooled.p)},
                   {"df", num(f.pooled.df)},
                   {"r", num(f.pooled.r)},
                   {"r_ci", interval(f.pooled.r_ci_low, f.pooled.r_ci_high)},
                   {"n", json_number(f.pooled.n)}};
    const auto& pw = f.within.precision_weighted;
    j["within"] = {{"slope", num(f.within.slope)},
                   {"slope_ci", interval(f.within.ci_low, f.within.ci_high)},
                   {"se", num(f.within.se)},
                   {"p", num(f.within.p)},
                   {"df", num(f.within.df)},
                   {"strata", f.within.strata},
                   {"precision_weighted",
                    {{"slope", num(pw.slope)},
                     {"slope_ci", interval(pw.ci_low, pw.ci_high)},
                     {"se", num(pw.se)},
                     {"strata", pw.strata}}}};
    if (f.adjusted)
        j["adjusted"] = {{"pooled", estimate(f.adjusted_pooled)},
                         {"within", estimate(f.adjusted_within)}};
    j["equal_slopes"] = {{"f", num(f.equal_slopes.f)},
                         {"df1", num(f.equal_slopes.df1)},
                         {"df2", num(f.equal_slopes.df2)},
                         {"p", num(f.equal_slopes.p)}};
    json groups = json::array();
    for (const auto& g : f.groups) {
        json o = {{"level", g.level},
                  {"levels", g.levels},
                  {"n", json_number(g.n)},
                  {"slope", num(g.slope)},
                  {"slope_ci", interval(g.ci_low, g.ci_high)},
                  {"se", num(g.se)},
                  {"p", num(g.p)},
                  {"r", num(g.r)},
                  {"informative", g.informative}};
        if (!g.reason.empty()) o["reason"] = g.reason;
        groups.push_back(std::move(o));
    }
    j["groups"] = std::move(groups);
    j["uninformative"] = f.uninformative;
    j["verdict"] = f.verdict ? report::verdict_to_json(*f.verdict) : json(nullptr);
    return j;
}

json to_json(const LatentFinding& f) {
    json j;
    j["kind"] = "latent";
    j["x"] = f.x;
    j["y"] = f.y;
    j["rows"] = f.rows_used;
    j["rows_fitted"] = f.rows_fitted;
    j["seed"] = f.seed;
    j["k"] = f.k;
    json bic = json::array();
    for (double b : f.bic) bic.push_back(num(b));
    j["bic"] = std::move(bic);
    j["pooled_slope"] = num(f.pooled_slope);
    j["opposite"] = f.opposite;
    json comps = json::array();
    for (const auto& c : f.components)
        comps.push_back({{"weight", num(c.weight)},
                         {"n", json_number(c.n)},
                         {"mean", json::array({num(c.mean_x), num(c.mean_y)})},
                         {"sd", json::array({num(c.sd_x), num(c.sd_y)})},
                         {"correlation", num(c.correlation)},
                         {"slope", num(c.slope)}});
    j["components"] = std::move(comps);
    j["note"] = f.note;
    return j;
}

}  // namespace foldline
