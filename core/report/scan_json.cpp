#include "core/report/scan_json.h"

#include <cmath>

#include "core/report/slope_json.h"

namespace foldline {

namespace {

using nlohmann::json;

json num(double x) {
    if (!std::isfinite(x)) return nullptr;
    if (x == std::floor(x) && std::fabs(x) < 9.0e15) return static_cast<long long>(x);
    return x;
}

json interval(const stats::Interval& i) { return json::array({num(i.lo), num(i.hi)}); }

}  // namespace

json rate_finding_to_json(const RateFinding& f) {
    json j;
    j["kind"] = "rate";
    j["strata"] = f.strata;
    j["focal"] = f.focal;
    j["reference"] = f.reference;
    j["class"] = std::string(to_string(f.cls));
    j["reversal"] = f.reversal();
    j["direction_flip"] = f.direction_flip;
    j["p_reversal"] = num(f.p_reversal);
    j["q_value"] = num(f.q_value);
    j["stability"] = num(f.stability);
    j["change"] = num(f.change);
    j["rows_used"] = num(f.rows_used);
    const auto& c = f.crude;
    j["crude"] = {{"n_focal", num(c.n_focal)},
                  {"pos_focal", num(c.pos_focal)},
                  {"n_reference", num(c.n_reference)},
                  {"pos_reference", num(c.pos_reference)},
                  {"rate_focal", num(c.rate_focal)},
                  {"rate_focal_ci", interval(c.rate_focal_ci)},
                  {"rate_reference", num(c.rate_reference)},
                  {"rate_reference_ci", interval(c.rate_reference_ci)},
                  {"rd", num(c.rd)},
                  {"rd_ci", interval(c.rd_ci)},
                  {"rr", num(c.rr)},
                  {"or", num(c.odds_ratio)},
                  {"selection_ratio", num(c.selection_ratio)},
                  {"below_four_fifths", c.below_four_fifths},
                  {"z", num(c.z)},
                  {"p", num(c.p)}};
    const auto& a = f.adjusted;
    j["adjusted"] = {{"mh_or", num(a.mh_or.estimate)},
                     {"mh_or_ci", interval(a.mh_or.ci)},
                     {"mh_rr", num(a.mh_rr.estimate)},
                     {"mh_rr_ci", interval(a.mh_rr.ci)},
                     {"mh_rd", num(a.mh_rd.greenland_robins.estimate)},
                     {"mh_rd_ci", interval(a.mh_rd.greenland_robins.ci)},
                     {"mh_rd_se_sato", num(a.mh_rd.se_sato)},
                     {"std_rate_focal", num(a.standardized.rate_focal)},
                     {"std_rate_reference", num(a.standardized.rate_reference)},
                     {"std_rd", num(a.standardized.rd)},
                     {"std_rd_ci", interval(a.standardized.rd_ci)}};
    j["cmh"] = {{"statistic", num(f.cmh.statistic)},
                {"p", num(f.cmh.p)},
                {"statistic_corrected", num(f.cmh.statistic_corrected)},
                {"p_corrected", num(f.cmh.p_corrected)},
                {"z", num(f.cmh.z)}};
    j["breslow_day"] = {{"statistic", num(f.breslow_day.statistic_tarone)},
                        {"p", num(f.breslow_day.p_tarone)},
                        {"statistic_uncorrected", num(f.breslow_day.statistic)},
                        {"p_uncorrected", num(f.breslow_day.p)},
                        {"df", num(f.breslow_day.df)},
                        {"strata_used", f.breslow_day.strata_used}};
    j["decomposition"] = {{"crude_gap", num(f.decomposition.crude_gap)},
                          {"within", num(f.decomposition.within)},
                          {"composition", num(f.decomposition.composition)}};
    j["e_value"] = {{"estimate", num(f.e_value.estimate)}, {"ci_limit", num(f.e_value.ci_limit)}};
    json rows = json::array();
    for (const auto& r : f.strata_table) {
        rows.push_back({{"level", r.level},
                        {"levels", r.levels},
                        {"n_focal", num(r.n_focal)},
                        {"pos_focal", num(r.pos_focal)},
                        {"n_reference", num(r.n_reference)},
                        {"pos_reference", num(r.pos_reference)},
                        {"rate_focal", num(r.rate_focal)},
                        {"rate_focal_ci", interval(r.rate_focal_ci)},
                        {"rate_reference", num(r.rate_reference)},
                        {"rate_reference_ci", interval(r.rate_reference_ci)},
                        {"rd", num(r.rd)},
                        {"rd_ci", interval(r.rd_ci)},
                        {"selection_ratio", num(r.selection_ratio)},
                        {"share", num(r.share)},
                        {"informative", r.informative},
                        {"reason", r.reason}});
    }
    j["strata_table"] = std::move(rows);
    j["uninformative"] = f.uninformative;
    j["informative_strata"] = f.informative_strata;
    j["verdict"] = f.verdict.empty() ? json(nullptr) : json(f.verdict);
    return j;
}

json scan_to_json(const ScanResult& r, const DataInfo& data) {
    json j;
    j["version"] = kScanJsonVersion;
    j["data"] = {{"path", data.path}, {"sha256", data.sha256}, {"rows", num(data.rows)}};
    const auto& q = r.question;
    if (q.outcome.empty() && !r.slope_question.x.empty()) {
        // A slope-only scan: numeric outcome on a numeric exposure.
        j["question"] = {{"outcome", r.slope_question.y}, {"positive", nullptr}, {"exposure", r.slope_question.x},
                         {"focal", nullptr}, {"focal_levels", json::array()}, {"reference", nullptr}};
    } else {
        j["question"] = {{"outcome", q.outcome},
                         {"positive", q.positive},
                         {"exposure", q.exposure},
                         {"focal", q.focal.empty() ? json(nullptr) : json(q.focal[0])},
                         {"focal_levels", q.focal},
                         {"reference", q.reference}};
    }
    j["settings"] = {{"alpha", r.alpha}, {"bootstrap", r.bootstrap}, {"seed", r.seed}};
    json cands = json::array();
    for (std::size_t i = 0; i < r.candidates.size(); ++i)
        cands.push_back({{"column", r.candidates[i]},
                         {"origin", i < r.candidate_origin.size() ? r.candidate_origin[i] : ""}});
    j["candidates"] = std::move(cands);
    json ex = json::array();
    for (const auto& e : r.excluded) ex.push_back({{"column", e.column}, {"reason", e.reason}});
    j["excluded"] = std::move(ex);
    json counts = json::object();
    for (auto c : {FindingClass::Reversal, FindingClass::Explained, FindingClass::Masked,
                   FindingClass::Heterogeneous, FindingClass::Stable})
        counts[std::string(to_string(c))] = 0;
    json reversals = json::array();
    json findings = json::array();
    for (const auto& f : r.rate_findings) {
        counts[std::string(to_string(f.cls))] = counts[std::string(to_string(f.cls))].get<int>() + 1;
        if (f.reversal()) reversals.push_back(f.strata);
        findings.push_back(rate_finding_to_json(f));
    }
    json slope_reversals = json::array();
    for (const auto& f : r.slope_findings) {
        counts[std::string(to_string(f.finding_class))] = counts[std::string(to_string(f.finding_class))].get<int>() + 1;
        if (f.finding_class == FindingClass::Reversal) slope_reversals.push_back(f.strata);
        findings.push_back(to_json(f));
    }
    if (!r.slope_question.x.empty())
        j["slope_question"] = {{"x", r.slope_question.x}, {"y", r.slope_question.y}};
    j["summary"] = {{"checks", r.rate_findings.size() + r.slope_findings.size()},
                    {"rate_checks", r.rate_findings.size()},
                    {"slope_checks", r.slope_findings.size()},
                    {"classes", counts},
                    {"reversals", reversals},
                    {"slope_reversals", slope_reversals},
                    {"cancelled", r.cancelled}};
    j["findings"] = std::move(findings);
    return j;
}

std::string scan_json_text(const ScanResult& r, const DataInfo& data) { return scan_to_json(r, data).dump() + "\n"; }

}  // namespace foldline
