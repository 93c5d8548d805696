#include "core/report/scan_json.h"

#include <charconv>
#include <cstdio>
#include <cmath>

#include "core/report/json_number.h"
#include "core/report/mean_json.h"
#include "core/report/slope_json.h"
#include "core/report/diagram_checks_json.h"
#include "core/report/small_counts_json.h"
#include "core/report/verdict_json.h"

namespace foldline {

namespace {

using nlohmann::json;

json num(double x) { return json_number(x); }

}  // namespace

json candidates_to_json(const std::vector<std::string>& names, const std::vector<std::string>& origins) {
    json cands = json::array();
    for (std::size_t i = 0; i < names.size(); ++i)
        cands.push_back({{"column", names[i]}, {"origin", i < origins.size() ? origins[i] : ""}});
    return cands;
}

json excluded_to_json(const std::vector<Exclusion>& excluded) {
    json ex = json::array();
    for (const auto& e : excluded) ex.push_back({{"column", e.column}, {"reason", e.reason}});
    return ex;
}

json empty_class_counts() {
    json counts = json::object();
    for (auto c : {FindingClass::Reversal, FindingClass::Explained, FindingClass::Masked,
                   FindingClass::Heterogeneous, FindingClass::Stable})
        counts[std::string(to_string(c))] = 0;
    return counts;
}

json scan_to_json_summary(const ScanResult& r) {
    json counts = empty_class_counts();
    json reversals = json::array(), slope_reversals = json::array();
    for (const auto& f : r.rate_findings) {
        counts[std::string(to_string(f.cls))] = counts[std::string(to_string(f.cls))].get<int>() + 1;
        if (f.reversal()) reversals.push_back(f.strata);
    }
    for (const auto& f : r.slope_findings) {
        counts[std::string(to_string(f.cls))] = counts[std::string(to_string(f.cls))].get<int>() + 1;
        if (f.cls == FindingClass::Reversal) slope_reversals.push_back(f.strata);
    }
    json s = {{"checks", r.rate_findings.size() + r.slope_findings.size() + r.mean_findings.size()},
              {"rate_checks", r.rate_findings.size()},
              {"slope_checks", r.slope_findings.size()},
              {"classes", counts},
              {"reversals", reversals},
              {"slope_reversals", slope_reversals},
              {"cancelled", r.cancelled}};
    // Mean-gap keys only in a mean scan, so rate and slope documents keep their bytes.
    if (!r.mean_findings.empty()) {
        json mean_reversals = json::array();
        for (const auto& f : r.mean_findings) {
            counts[std::string(to_string(f.cls))] = counts[std::string(to_string(f.cls))].get<int>() + 1;
            if (f.reversal()) mean_reversals.push_back(f.strata);
        }
        s["classes"] = counts;
        s["mean_checks"] = r.mean_findings.size();
        s["mean_reversals"] = mean_reversals;
    }
    return s;
}

json family_to_json(const FindingHeader& f) {
    return {{"lead", f.family_lead()}, {"role", std::string(to_string(f.family.role))}, {"reason", f.family.reason}};
}

json families_to_json(const ScanResult& r) {
    json out = json::array();
    for (const auto& fam : r.families) {
        const bool rate = fam.kind == FindingKind::Rate;
        out.push_back({{"kind", std::string(to_string(fam.kind))},
                       {"focal", rate && fam.comparison < r.question.focal.size() ? json(r.question.focal[fam.comparison])
                                                                                  : json(nullptr)},
                       {"lead", fam.lead},
                       {"class", std::string(to_string(fam.cls))},
                       {"size", fam.size()},
                       {"proxies", fam.proxies},
                       {"members", fam.members}});
    }
    return out;
}

json scan_to_json(const ScanResult& r, const DataInfo& data) {
    json j;
    j["version"] = kScanJsonVersion;
    j["data"] = {{"path", data.path}, {"sha256", data.sha256}, {"rows", num(data.rows)}};
    if (!data.format.empty()) j["data"]["format"] = data.format;
    if (!data.sheet.empty()) j["data"]["sheet"] = data.sheet;
    if (data.database) {
        const auto& d = *data.database;
        j["data"]["database"] = {{"connection", d.connection}, {"driver", d.driver}, {"database", d.database},
                                 {"table", d.table.empty() ? json(nullptr) : json(d.table)},
                                 {"query", d.query.empty() ? json(nullptr) : json(d.query)},
                                 {"rows", num(d.rows)}, {"queried_at", d.queried_at}};
    }
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
    // Only when a filter was given, so documents of unfiltered scans keep their bytes.
    if (!r.rows_filter.empty()) j["question"]["rows"] = r.rows_filter;
    if (r.rows_kept >= 0) j["data"]["rows_kept"] = num(r.rows_kept);
    j["settings"] = {{"alpha", r.alpha}, {"bootstrap", r.bootstrap}, {"seed", r.seed}};
    j["candidates"] = candidates_to_json(r.candidates, r.candidate_origin);
    j["excluded"] = excluded_to_json(r.excluded);
    json findings = json::array();
    for (const auto& f : r.rate_findings) findings.push_back(rate_finding_to_json(f));
    for (const auto& f : r.slope_findings) findings.push_back(to_json(f));
    if (r.latent) findings.push_back(to_json(*r.latent));
    for (const auto& f : r.mean_findings) findings.push_back(to_json(f));
    if (!r.mean_findings.empty()) j["mean_question"] = mean_question_json(r);
    if (!r.slope_question.x.empty()) {
        j["slope_question"] = {{"x", r.slope_question.x}, {"y", r.slope_question.y}};
        // Only when given, so documents of unadjusted trends keep their bytes.
        if (!r.slope_question.covariates.empty()) j["slope_question"]["covariates"] = r.slope_question.covariates;
    }
    j["summary"] = scan_to_json_summary(r);
    if (r.diagram_checks) j["diagram_checks"] = report::to_json(*r.diagram_checks);
    j["families"] = families_to_json(r);
    j["findings"] = std::move(findings);
    return j;
}

namespace {

// A streaming writer for the bulk of the document (the rate findings and their stratum tables):
// building them as a JSON tree first cost more than the whole scan. Produces exactly the values
// rate_finding_to_json parses what it writes. Numbers in shortest round-trip form.
class Writer {
public:
    explicit Writer(std::string& out) : o_(out) {}
    void raw(std::string_view s) { o_ += s; }
    void key(std::string_view k) {
        str(k);
        o_ += ':';
    }
    void str(std::string_view s) {
        o_ += '"';
        for (unsigned char ch : s) {
            switch (ch) {
                case '"': o_ += "\\\""; break;
                case '\\': o_ += "\\\\"; break;
                case '\n': o_ += "\\n"; break;
                case '\r': o_ += "\\r"; break;
                case '\t': o_ += "\\t"; break;
                default:
                    if (ch < 0x20) {
                        char buf[8];
                        std::snprintf(buf, sizeof buf, "\\u%04x", ch);
                        o_ += buf;
                    } else {
                        o_ += static_cast<char>(ch);
                    }
            }
        }
        o_ += '"';
    }
    void number(double x) {
        if (!std::isfinite(x)) {
            o_ += "null";
            return;
        }
        char buf[32];
        std::to_chars_result r;
        if (json_whole_number(x)) r = std::to_chars(buf, buf + sizeof buf, static_cast<long long>(x));
        else r = std::to_chars(buf, buf + sizeof buf, x);
        o_.append(buf, r.ptr);
    }
    void boolean(bool b) { o_ += b ? "true" : "false"; }
    void interval(const stats::Interval& i) {
        o_ += '[';
        number(i.lo);
        o_ += ',';
        number(i.hi);
        o_ += ']';
    }
    void field(std::string_view k, double v) {
        key(k);
        number(v);
        o_ += ',';
    }
    void field_interval(std::string_view k, const stats::Interval& v) {
        key(k);
        interval(v);
        o_ += ',';
    }
    void strings(const std::vector<std::string>& v) {
        o_ += '[';
        for (std::size_t i = 0; i < v.size(); ++i) {
            if (i) o_ += ',';
            str(v[i]);
        }
        o_ += ']';
    }
    void close_object() {
        if (!o_.empty() && o_.back() == ',') o_.back() = '}';
        else o_ += '}';
    }

private:
    std::string& o_;
};

void write_rate_finding(Writer& w, const RateFinding& f) {
    w.raw("{\"kind\":\"rate\",\"strata\":");
    w.strings(f.strata);
    w.raw(",\"focal\":");
    w.str(f.focal);
    w.raw(",\"reference\":");
    w.str(f.reference);
    w.raw(",\"class\":");
    w.str(to_string(f.cls));
    w.raw(",\"reversal\":");
    w.boolean(f.reversal());
    w.raw(",\"direction_flip\":");
    w.boolean(f.direction_flip);
    w.raw(",");
    w.field("p_reversal", f.p_reversal);
    w.field("q_value", f.q_value);
    w.field("stability", f.stability.share);
    w.field("change", f.change);
    w.field("rows_used", f.rows_used);
    const auto& c = f.crude;
    w.raw("\"crude\":{");
    w.field("n_focal", c.n_focal);
    w.field("pos_focal", c.pos_focal);
    w.field("n_reference", c.n_reference);
    w.field("pos_reference", c.pos_reference);
    w.field("rate_focal", c.rate_focal);
    w.field_interval("rate_focal_ci", c.rate_focal_ci);
    w.field("rate_reference", c.rate_reference);
    w.field_interval("rate_reference_ci", c.rate_reference_ci);
    w.field("rd", c.rd);
    w.field_interval("rd_ci", c.rd_ci);
    w.field("rr", c.rr);
    w.field("or", c.odds_ratio);
    w.field("selection_ratio", c.selection_ratio);
    w.key("below_four_fifths");
    w.boolean(c.below_four_fifths);
    w.raw(",");
    w.field("z", c.z);
    w.field("p", c.p);
    w.close_object();
    const auto& a = f.adjusted;
    w.raw(",\"adjusted\":{");
    w.field("mh_or", a.mh_or.estimate);
    w.field_interval("mh_or_ci", a.mh_or.ci);
    w.field("mh_rr", a.mh_rr.estimate);
    w.field_interval("mh_rr_ci", a.mh_rr.ci);
    w.field("mh_rd", a.mh_rd.greenland_robins.estimate);
    w.field_interval("mh_rd_ci", a.mh_rd.greenland_robins.ci);
    w.field("mh_rd_se_sato", a.mh_rd.se_sato);
    w.field("std_rate_focal", a.standardized.rate_focal);
    w.field("std_rate_reference", a.standardized.rate_reference);
    w.field("std_rd", a.standardized.rd);
    w.field_interval("std_rd_ci", a.standardized.rd_ci);
    w.close_object();
    w.raw(",\"cmh\":{");
    w.field("statistic", f.cmh.statistic);
    w.field("p", f.cmh.p);
    w.field("statistic_corrected", f.cmh.statistic_corrected);
    w.field("p_corrected", f.cmh.p_corrected);
    w.field("z", f.cmh.z);
    w.close_object();
    w.raw(",\"breslow_day\":{");
    w.field("statistic", f.breslow_day.statistic_tarone);
    w.field("p", f.breslow_day.p_tarone);
    w.field("statistic_uncorrected", f.breslow_day.statistic);
    w.field("p_uncorrected", f.breslow_day.p);
    w.field("df", f.breslow_day.df);
    w.field("strata_used", static_cast<double>(f.breslow_day.strata_used));
    w.close_object();
    w.raw(",\"small_counts\":" + report::small_counts_to_json(f.small_counts).dump());
    w.raw(",\"decomposition\":{");
    w.field("crude_gap", f.decomposition.crude_gap);
    w.field("within", f.decomposition.within);
    w.field("composition", f.decomposition.composition);
    w.close_object();
    w.raw(",\"e_value\":{");
    w.field("estimate", f.e_value.estimate);
    w.field("ci_limit", f.e_value.ci_limit);
    w.close_object();
    w.raw(",\"strata_table\":[");
    for (std::size_t i = 0; i < f.strata_table.size(); ++i) {
        const auto& r = f.strata_table[i];
        if (i) w.raw(",");
        w.raw("{\"level\":");
        w.str(r.level);
        w.raw(",\"levels\":");
        w.strings(r.levels);
        w.raw(",");
        w.field("n_focal", r.n_focal);
        w.field("pos_focal", r.pos_focal);
        w.field("n_reference", r.n_reference);
        w.field("pos_reference", r.pos_reference);
        w.field("rate_focal", r.rate_focal);
        w.field_interval("rate_focal_ci", r.rate_focal_ci);
        w.field("rate_reference", r.rate_reference);
        w.field_interval("rate_reference_ci", r.rate_reference_ci);
        w.field("rd", r.rd);
        w.field_interval("rd_ci", r.rd_ci);
        w.field("selection_ratio", r.selection_ratio);
        w.field("share", r.share);
        w.key("informative");
        w.boolean(r.informative);
        w.raw(",\"reason\":");
        w.str(r.reason);
        w.raw("}");
    }
    w.raw("],\"uninformative\":");
    w.strings(f.uninformative);
    w.raw(",");
    w.field("informative_strata", static_cast<double>(f.informative_strata));
    w.key("verdict");
    w.raw(f.verdict ? report::verdict_to_json(*f.verdict).dump() : std::string("null"));
    w.raw(",");
    w.key("family");
    w.raw(family_to_json(f).dump());
    w.raw("}");
}

}  // namespace

json rate_finding_to_json(const RateFinding& f) {
    // One writer per kind: the tree is the streamed text, parsed.
    std::string text;
    Writer w(text);
    write_rate_finding(w, f);
    return json::parse(text);
}

std::string scan_json_text(const ScanResult& r, const DataInfo& data) {
    // Everything but the rate findings through the JSON library, then the findings streamed in.
    ScanResult head;
    head.question = r.question;
    head.candidates = r.candidates;
    head.candidate_origin = r.candidate_origin;
    head.excluded = r.excluded;
    head.rows = r.rows;
    head.rows_filter = r.rows_filter;
    head.rows_kept = r.rows_kept;
    head.alpha = r.alpha;
    head.bootstrap = r.bootstrap;
    head.seed = r.seed;
    head.cancelled = r.cancelled;
    head.slope_question = r.slope_question;
    head.diagram_checks = r.diagram_checks;
    json doc = scan_to_json(head, data);
    // The summary must describe the full result.
    doc["summary"] = scan_to_json_summary(r);
    doc["families"] = families_to_json(r);
    json slopes = json::array();
    for (const auto& f : r.slope_findings) slopes.push_back(to_json(f));
    if (r.latent) slopes.push_back(to_json(*r.latent));
    for (const auto& f : r.mean_findings) slopes.push_back(to_json(f));
    if (!r.mean_findings.empty()) doc["mean_question"] = mean_question_json(r);
    doc.erase("findings");
    std::string out = doc.dump();
    out.pop_back();  // the closing brace
    out.reserve(out.size() + r.rate_findings.size() * 4096);
    out += ",\"findings\":[";
    Writer w(out);
    for (std::size_t i = 0; i < r.rate_findings.size(); ++i) {
        if (i) out += ',';
        write_rate_finding(w, r.rate_findings[i]);
    }
    for (std::size_t i = 0; i < slopes.size(); ++i) {
        if (i || !r.rate_findings.empty()) out += ',';
        out += slopes[i].dump();
    }
    out += "]}\n";
    return out;
}

}  // namespace foldline
