#include "core/report/csv_export.h"

#include "core/report/mean_csv.h"

#include <cmath>
#include <cstdio>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/common/atomic_file.h"

namespace foldline::report {

namespace {

void row(std::string& out, const std::vector<std::string>& fields) {
    for (std::size_t i = 0; i < fields.size(); ++i) {
        if (i) out += ',';
        out += fields[i];
    }
    out += "\r\n";
}

std::string joined(const std::vector<std::string>& v, const char* sep) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? sep : "") + v[i];
    return s;
}

// The answer a diagram gave for a finding ("pooled", "stratified", ...); empty when none judged it.
std::string verdict_answer(const FindingHeader& f) {
    return f.verdict ? std::string(causal::to_string(f.verdict->verdict.answer)) : std::string();
}

}  // namespace

std::string csv_field(std::string_view s) {
    if (s.find_first_of(",\"\r\n") == std::string_view::npos) return std::string(s);
    std::string out = "\"";
    for (char c : s) {
        if (c == '"') out += '"';
        out += c;
    }
    out += '"';
    return out;
}

std::string csv_number(double x) {
    if (!std::isfinite(x)) return {};
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.10g", x);
    return buf;
}

std::string findings_csv(const ScanResult& r, const project::Project* project) {
    std::string out;
    row(out, {"finding", "kind", "class", "strata", "focal", "reference", "rows_used", "crude_rate_focal",
              "crude_rate_reference", "crude_rd", "crude_rd_ci_low", "crude_rd_ci_high", "mh_rd", "mh_rd_ci_low",
              "mh_rd_ci_high", "mh_or", "mh_or_ci_low", "mh_or_ci_high", "mh_rr", "standardised_rd",
              "standardised_rd_ci_low", "standardised_rd_ci_high", "cmh_p", "breslow_day_p", "p_reversal", "q_value",
              "stability", "within_part", "composition_part", "e_value", "e_value_ci", "informative_strata",
              "verdict", "decision", "note", "family_lead", "family_role", "family_reason"});
    std::size_t n = 0;
    for (const auto& f : r.rate_findings) {
        const auto& c = f.crude;
        const auto& a = f.adjusted;
        std::string decision = "undecided", note;
        if (project) {
            if (const auto* rv = project->review(project::rate_key(f.strata, f.focal, f.reference))) {
                decision = std::string(to_string(rv->decision));
                note = rv->note;
            }
        }
        row(out, {std::to_string(++n), "rate", std::string(to_string(f.cls)), csv_field(joined(f.strata, " × ")),
                  csv_field(f.focal), csv_field(f.reference), csv_number(f.rows_used), csv_number(c.rate_focal),
                  csv_number(c.rate_reference), csv_number(c.rd), csv_number(c.rd_ci.lo), csv_number(c.rd_ci.hi),
                  csv_number(a.mh_rd.greenland_robins.estimate), csv_number(a.mh_rd.greenland_robins.ci.lo),
                  csv_number(a.mh_rd.greenland_robins.ci.hi), csv_number(a.mh_or.estimate),
                  csv_number(a.mh_or.ci.lo), csv_number(a.mh_or.ci.hi), csv_number(a.mh_rr.estimate),
                  csv_number(a.standardized.rd), csv_number(a.standardized.rd_ci.lo),
                  csv_number(a.standardized.rd_ci.hi), csv_number(f.cmh.p), csv_number(f.breslow_day.p_tarone),
                  csv_number(f.p_reversal), csv_number(f.q_value), csv_number(f.stability.share),
                  csv_number(f.decomposition.within), csv_number(f.decomposition.composition),
                  csv_number(f.e_value.estimate), csv_number(f.e_value.ci_limit),
                  std::to_string(f.informative_strata), csv_field(verdict_answer(f)), csv_field(decision), csv_field(note),
                  csv_field(f.family_lead()), std::string(to_string(f.family.role)), csv_field(f.family.reason)});
    }
    return out;
}

std::string strata_csv(const ScanResult& r) {
    std::string out;
    row(out, {"finding", "strata", "stratum", "focal", "reference", "positives_focal", "n_focal",
              "positives_reference", "n_reference", "rate_focal", "rate_focal_ci_low", "rate_focal_ci_high",
              "rate_reference", "rate_reference_ci_low", "rate_reference_ci_high", "rd", "rd_ci_low", "rd_ci_high",
              "share", "share_focal", "share_reference", "informative", "reason"});
    std::size_t n = 0;
    for (const auto& f : r.rate_findings) {
        ++n;
        for (const auto& s : f.strata_table) {
            row(out, {std::to_string(n), csv_field(joined(f.strata, " × ")), csv_field(s.level), csv_field(f.focal),
                      csv_field(f.reference), csv_number(s.pos_focal), csv_number(s.n_focal),
                      csv_number(s.pos_reference), csv_number(s.n_reference), csv_number(s.rate_focal),
                      csv_number(s.rate_focal_ci.lo), csv_number(s.rate_focal_ci.hi), csv_number(s.rate_reference),
                      csv_number(s.rate_reference_ci.lo), csv_number(s.rate_reference_ci.hi), csv_number(s.rd),
                      csv_number(s.rd_ci.lo), csv_number(s.rd_ci.hi), csv_number(s.share),
                      csv_number(s.share_focal), csv_number(s.share_reference), s.informative ? "yes" : "no",
                      csv_field(s.reason)});
        }
    }
    return out;
}

std::string slope_findings_csv(const ScanResult& r, const project::Project* project) {
    std::string out;
    row(out, {"finding", "kind", "class", "strata", "x", "y", "covariates", "rows_used", "n", "pooled_slope",
              "pooled_slope_ci_low", "pooled_slope_ci_high", "pooled_se", "pooled_se_robust", "pooled_p", "pooled_r",
              "within_slope", "within_slope_ci_low", "within_slope_ci_high", "within_se", "within_p", "strata_count",
              "adjusted_pooled_slope", "adjusted_pooled_ci_low", "adjusted_pooled_ci_high",
              "adjusted_within_slope", "adjusted_within_ci_low", "adjusted_within_ci_high", "equal_slopes_f",
              "equal_slopes_p", "p_reversal", "q_value", "stability", "stability_draws", "linear_probability",
              "uninformative_strata", "verdict", "decision", "note", "family_lead", "family_role",
              "family_reason"});
    std::size_t n = 0;
    for (const auto& f : r.slope_findings) {
        std::string decision = "undecided", note;
        if (project) {
            if (const auto* rv = project->review(project::slope_key(f.strata, f.x, f.y))) {
                decision = std::string(to_string(rv->decision));
                note = rv->note;
            }
        }
        const double nan = std::nan("");
        const auto& ap = f.adjusted_pooled;
        const auto& aw = f.adjusted_within;
        row(out, {std::to_string(++n), "slope", std::string(to_string(f.cls)),
                  csv_field(joined(f.strata, " × ")), csv_field(f.x), csv_field(f.y),
                  csv_field(joined(f.covariates, "; ")), csv_number(f.rows_used), csv_number(f.n),
                  csv_number(f.pooled.slope), csv_number(f.pooled.ci_low), csv_number(f.pooled.ci_high),
                  csv_number(f.pooled.se), csv_number(f.pooled.se_robust), csv_number(f.pooled.p),
                  csv_number(f.pooled.r), csv_number(f.within.slope), csv_number(f.within.ci_low),
                  csv_number(f.within.ci_high), csv_number(f.within.se), csv_number(f.within.p),
                  std::to_string(f.within.strata), csv_number(f.adjusted ? ap.slope : nan),
                  csv_number(f.adjusted ? ap.ci_low : nan), csv_number(f.adjusted ? ap.ci_high : nan),
                  csv_number(f.adjusted ? aw.slope : nan), csv_number(f.adjusted ? aw.ci_low : nan),
                  csv_number(f.adjusted ? aw.ci_high : nan), csv_number(f.equal_slopes.f),
                  csv_number(f.equal_slopes.p), csv_number(f.p_reversal), csv_number(f.q_value),
                  f.stability.draws > 0 ? csv_number(f.stability.share) : std::string(), std::to_string(f.stability.draws),
                  f.linear_probability ? "yes" : "no", std::to_string(f.uninformative.size()),
                  csv_field(verdict_answer(f)), csv_field(decision), csv_field(note), csv_field(f.family_lead()),
                  std::string(to_string(f.family.role)), csv_field(f.family.reason)});
    }
    return out;
}

std::string slope_strata_csv(const ScanResult& r) {
    std::string out;
    row(out, {"finding", "strata", "stratum", "x", "y", "rows", "n", "slope", "slope_ci_low", "slope_ci_high", "se",
              "p", "r", "informative", "reason"});
    std::size_t n = 0;
    for (const auto& f : r.slope_findings) {
        ++n;
        for (const auto& g : f.groups)
            row(out, {std::to_string(n), csv_field(joined(f.strata, " × ")), csv_field(g.level), csv_field(f.x),
                      csv_field(f.y), csv_number(g.rows), csv_number(g.n), csv_number(g.slope), csv_number(g.ci_low),
                      csv_number(g.ci_high), csv_number(g.se), csv_number(g.p), csv_number(g.r),
                      g.informative ? "yes" : "no", csv_field(g.reason)});
    }
    return out;
}

std::vector<std::string> csv_export_paths(const ScanResult& result, const std::string& prefix) {
    if (result.mean_scan) return {prefix + "-mean-findings.csv", prefix + "-mean-strata.csv"};
    const bool slopes = !result.slope_question.x.empty() || !result.slope_findings.empty();
    const bool rates = !slopes || !result.question.outcome.empty() || !result.rate_findings.empty();
    std::vector<std::string> paths;
    if (rates) paths = {prefix + "-findings.csv", prefix + "-strata.csv"};
    if (slopes) {
        paths.push_back(prefix + "-slope-findings.csv");
        paths.push_back(prefix + "-slope-strata.csv");
    }
    return paths;
}

Status write_csv_exports(const ScanResult& result, const project::Project* project, const std::string& prefix) {
    for (const auto& path : csv_export_paths(result, prefix)) {
        const std::string name = path.substr(prefix.size());
        const std::string text = name == "-mean-findings.csv"    ? mean_findings_csv(result, project)
                                 : name == "-mean-strata.csv"    ? mean_strata_csv(result)
                                 : name == "-findings.csv"       ? findings_csv(result, project)
                                 : name == "-strata.csv"         ? strata_csv(result)
                                 : name == "-slope-findings.csv" ? slope_findings_csv(result, project)
                                                                 : slope_strata_csv(result);
        if (auto st = write_file_atomically(path, text); !st) return st;
    }
    return Ok{};
}

}  // namespace foldline::report
