#include "core/report/csv_export.h"

#include <cmath>
#include <cstdio>
#include <vector>

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
              "verdict", "decision", "note"});
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
                  csv_number(f.p_reversal), csv_number(f.q_value), csv_number(f.stability),
                  csv_number(f.decomposition.within), csv_number(f.decomposition.composition),
                  csv_number(f.e_value.estimate), csv_number(f.e_value.ci_limit),
                  std::to_string(f.informative_strata), csv_field(f.verdict), csv_field(decision), csv_field(note)});
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

Status write_csv_exports(const ScanResult& result, const project::Project* project, const std::string& prefix) {
    if (auto st = write_file_atomically(prefix + "-findings.csv", findings_csv(result, project)); !st) return st;
    return write_file_atomically(prefix + "-strata.csv", strata_csv(result));
}

}  // namespace foldline::report
