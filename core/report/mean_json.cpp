#include "core/report/mean_json.h"

#include "core/report/json_number.h"
#include "core/report/verdict_json.h"

namespace foldline {
namespace {

using nlohmann::json;

json num(double x) { return json_number(x); }
json interval(double lo, double hi) { return json::array({num(lo), num(hi)}); }

json group(const stats::GroupMean& g) {
    return {{"n", num(g.n)}, {"mean", num(g.mean)}, {"sd", num(g.sd)}, {"ci", interval(g.ci_low, g.ci_high)}};
}

json gap(const stats::GapEstimate& e) {
    return {{"estimate", num(e.estimate)}, {"se", num(e.se)}, {"df", num(e.df)},
            {"stat", num(e.stat)},         {"p", num(e.p)},   {"ci", interval(e.ci_low, e.ci_high)}};
}

json percent(const PercentGap& p) { return {{"estimate", num(p.estimate)}, {"ci", interval(p.ci_low, p.ci_high)}}; }

json pay(const PayGap& g) {
    json strata = json::array();
    for (const auto& s : g.strata)
        strata.push_back({{"level", s.level},
                          {"mean_focal", num(s.mean_focal)},
                          {"mean_reference", num(s.mean_reference)},
                          {"mean_gap_percent", num(s.mean_gap_percent)},
                          {"median_focal", num(s.median_focal)},
                          {"median_reference", num(s.median_reference)},
                          {"median_gap_percent", num(s.median_gap_percent)},
                          {"informative", s.informative},
                          {"reaches_threshold", s.reaches_threshold}});
    return {{"threshold_percent", num(g.threshold_percent)},
            {"mean_focal", num(g.mean_focal)},
            {"mean_reference", num(g.mean_reference)},
            {"mean_gap_percent", num(g.mean_gap_percent)},
            {"median_focal", num(g.median_focal)},
            {"median_reference", num(g.median_reference)},
            {"median_gap_percent", num(g.median_gap_percent)},
            {"medians_from", "rows"},
            {"strata", strata},
            {"flagged", g.flagged}};
}

}  // namespace

json to_json(const MeanFinding& f) {
    json j;
    j["kind"] = "mean";
    j["strata"] = f.strata;
    j["class"] = std::string(to_string(f.cls));
    j["reversal"] = f.reversal();
    j["p_reversal"] = num(f.p_reversal);
    j["q_value"] = num(f.q_value);
    j["stability"] = f.stability.computed() ? json{{"share", num(f.stability.share)}, {"draws", f.stability.draws}}
                                            : json(nullptr);
    j["outcome"] = f.outcome;
    j["focal"] = f.focal;
    j["reference"] = f.reference;
    j["log_outcome"] = f.log_outcome;
    j["n"] = num(f.rows_used);
    j["crude"] = {{"focal", group(f.crude.focal)},
                  {"reference", group(f.crude.reference)},
                  {"difference", gap(f.crude.difference)},
                  {"ratio", num(f.crude.ratio)}};
    const auto& fe = f.fixed_effects;
    j["fixed_effects"] = {{"estimate", num(fe.estimate)},
                          {"se", num(fe.se)},
                          {"se_hc1", num(fe.se_hc1)},
                          {"df", num(fe.df)},
                          {"rss", num(fe.rss)},
                          {"ci", interval(fe.classical.ci_low, fe.classical.ci_high)},
                          {"p", num(fe.classical.p)},
                          {"ci_hc1", interval(fe.robust.ci_low, fe.robust.ci_high)},
                          {"p_hc1", num(fe.robust.p)},
                          {"strata", fe.strata}};
    j["standardised"] = gap(f.standardised);
    j["interaction"] = {{"f", num(f.interaction.f)}, {"df1", num(f.interaction.df1)},
                        {"df2", num(f.interaction.df2)}, {"p", num(f.interaction.p)}};
    j["cochran_q"] = {{"q", num(f.cochran_q.q)},           {"df", num(f.cochran_q.df)},
                      {"p", num(f.cochran_q.p)},           {"pooled", num(f.cochran_q.pooled)},
                      {"i_squared", num(f.cochran_q.i_squared)}, {"strata", f.cochran_q.strata}};
    j["decomposition"] = {{"crude_gap", num(f.decomposition.crude_gap)},
                          {"within", num(f.decomposition.within)},
                          {"composition", num(f.decomposition.composition)}};
    const auto& s = f.sensitivity;
    j["sensitivity"] = {{"smd", num(s.smd)},
                        {"smd_se", num(s.smd_se)},
                        {"rr_approx", num(s.e.rr)},
                        {"rr_ci", interval(s.e.rr_ci.lo, s.e.rr_ci.hi)},
                        {"e_value", num(s.e.e.estimate)},
                        {"e_value_ci", num(s.e.e.ci_limit)},
                        {"method", "VanderWeele & Ding 2017: RR = exp(0.91 d)"}};
    if (f.log_outcome)
        j["percent"] = {{"crude", percent(f.crude_percent)},
                        {"fixed_effects", percent(f.fixed_effects_percent)},
                        {"standardised", percent(f.standardised_percent)}};
    if (f.pay_gap.computed) j["pay_gap"] = pay(f.pay_gap);
    j["strata_disagree"] = f.strata_disagree;
    j["direction_flip"] = f.direction_flip;
    json rows = json::array();
    for (const auto& r : f.strata_table)
        rows.push_back({{"level", r.level},
                        {"levels", r.levels},
                        {"focal", group(r.focal)},
                        {"reference", group(r.reference)},
                        {"difference", gap(r.difference)},
                        {"share", num(r.share)},
                        {"share_focal", num(r.share_focal)},
                        {"share_reference", num(r.share_reference)},
                        {"informative", r.informative},
                        {"reason", r.reason.empty() ? json(nullptr) : json(r.reason)}});
    j["strata_table"] = std::move(rows);
    j["uninformative"] = f.uninformative;
    j["verdict"] = f.verdict ? report::verdict_to_json(*f.verdict) : json(nullptr);
    return j;
}

json mean_question_json(const ScanResult& r) {
    if (r.mean_findings.empty()) return nullptr;
    return {{"outcome", r.mean_findings.front().outcome},
            {"log_outcome", r.log_outcome},
            {"pay_gap", r.mean_findings.front().pay_gap.computed}};
}

}  // namespace foldline
