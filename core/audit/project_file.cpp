#include "core/audit/project_file.h"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include <nlohmann/json.hpp>

#include "core/table/row_filter.h"

#include "core/causal/diagram_file.h"
#include "core/common/atomic_file.h"
#include "core/common/sha256.h"
#include "core/common/json_text.h"
#include "core/io/csv_reader.h"

namespace foldline::project {

using nlohmann::json;
namespace fs = std::filesystem;

namespace {

fs::path folder_of(const std::string& project_path) {
    fs::path p = fs::absolute(fs::path(project_path)).lexically_normal();
    return p.parent_path();
}

// Stored form: relative to the project's folder (generic '/' separators).
std::string relative_to_project(const std::string& data_path, const std::string& project_path) {
    if (data_path.empty()) return {};
    const fs::path data = fs::absolute(fs::path(data_path)).lexically_normal();
    const fs::path rel = data.lexically_relative(folder_of(project_path));
    if (rel.empty()) return data.generic_string();
    return rel.generic_string();
}

// In-memory form: usable from the current folder. Relative stored paths are taken from the
// project's folder, so moving the folder with its data keeps the project working.
std::string resolve_from_project(const std::string& stored, const std::string& project_path) {
    if (stored.empty()) return {};
    const fs::path s(stored);
    if (s.is_absolute()) return s.lexically_normal().string();
    const fs::path folder = fs::path(project_path).parent_path();
    return (folder / s).lexically_normal().string();
}

std::string_view class_name(FindingClass c) { return to_string(c); }

std::optional<FindingClass> class_from(std::string_view s) {
    for (auto c : {FindingClass::Reversal, FindingClass::Explained, FindingClass::Masked, FindingClass::Heterogeneous,
                   FindingClass::Stable})
        if (to_string(c) == s) return c;
    return std::nullopt;
}

std::optional<Decision> decision_from(std::string_view s) {
    for (auto d : {Decision::Undecided, Decision::Upheld, Decision::SetAside, Decision::FollowUp})
        if (to_string(d) == s) return d;
    return std::nullopt;
}

std::string delimiter_name(char d) {
    switch (d) {
        case 0: return "auto";
        case '\t': return "tab";
        default: return std::string(1, d);
    }
}

// A small reader that names the JSON path of every problem.
class Reader {
public:
    explicit Reader(std::string source) : source_(std::move(source)) {}
    std::optional<Error> error;

    const json* field(const json& obj, const std::string& where, const char* key, bool required) {
        if (error) return nullptr;
        auto it = obj.find(key);
        if (it == obj.end() || it->is_null()) {
            if (required) fail(where + "." + key + ": missing");
            return nullptr;
        }
        return &*it;
    }
    void str(const json& obj, const std::string& where, const char* key, std::string& out, bool required = false) {
        if (const json* v = field(obj, where, key, required)) {
            if (!v->is_string()) return fail(where + "." + key + ": expected a string");
            out = v->get<std::string>();
        }
    }
    void opt_str(const json& obj, const std::string& where, const char* key, std::optional<std::string>& out) {
        if (const json* v = field(obj, where, key, false)) {
            if (!v->is_string()) return fail(where + "." + key + ": expected a string or null");
            out = v->get<std::string>();
        }
    }
    void boolean(const json& obj, const std::string& where, const char* key, bool& out) {
        if (const json* v = field(obj, where, key, false)) {
            if (!v->is_boolean()) return fail(where + "." + key + ": expected true or false");
            out = v->get<bool>();
        }
    }
    template <typename U>
    void whole(const json& obj, const std::string& where, const char* key, U& out, double lo, double hi) {
        if (const json* v = field(obj, where, key, false)) {
            if (!v->is_number_integer() && !v->is_number_unsigned())
                return fail(where + "." + key + ": expected a whole number");
            if (v->is_number_unsigned()) {
                const auto u = v->get<std::uint64_t>();
                if (static_cast<double>(u) > hi) return fail(where + "." + key + ": number out of range");
                out = static_cast<U>(u);
            } else {
                const auto i = v->get<std::int64_t>();
                if (static_cast<double>(i) < lo || static_cast<double>(i) > hi)
                    return fail(where + "." + key + ": number out of range");
                out = static_cast<U>(i);
            }
        }
    }
    void number(const json& obj, const std::string& where, const char* key, double& out, double lo, double hi) {
        if (const json* v = field(obj, where, key, false)) {
            if (!v->is_number()) return fail(where + "." + key + ": expected a number");
            const double x = v->get<double>();
            if (!(x >= lo && x <= hi)) return fail(where + "." + key + ": number out of range");
            out = x;
        }
    }
    void strings(const json& obj, const std::string& where, const char* key, std::vector<std::string>& out) {
        if (const json* v = field(obj, where, key, false)) {
            if (!v->is_array()) return fail(where + "." + key + ": expected a list of strings");
            std::vector<std::string> items;
            for (const auto& e : *v) {
                if (!e.is_string()) return fail(where + "." + key + ": expected a list of strings");
                items.push_back(e.get<std::string>());
            }
            out = std::move(items);
        }
    }
    const json* object(const json& obj, const std::string& where, const char* key, bool required) {
        const json* v = field(obj, where, key, required);
        if (v && !v->is_object()) {
            fail(where + "." + key + ": expected an object");
            return nullptr;
        }
        return v;
    }
    const json* array(const json& obj, const std::string& where, const char* key) {
        const json* v = field(obj, where, key, false);
        if (v && !v->is_array()) {
            fail(where + "." + key + ": expected a list");
            return nullptr;
        }
        return v;
    }
    void fail(const std::string& message) {
        if (!error) error = make_error(message, source_);
    }

private:
    std::string source_;
};

std::string with_thousands(std::uint64_t n) {
    const std::string digits = std::to_string(n);
    std::string s;
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > 0 && (digits.size() - i) % 3 == 0) s += ',';
        s += digits[i];
    }
    return s;
}

}  // namespace

std::string describe(const FindingKey& key) {
    std::string s = key.kind + ": ";
    for (std::size_t i = 0; i < key.strata.size(); ++i) s += (i ? " × " : "") + key.strata[i];
    return s + " (" + key.comparison + ")";
}

FindingKey rate_key(const std::vector<std::string>& strata, const std::string& focal, const std::string& reference) {
    return FindingKey{"rate", strata, focal + " vs " + reference};
}

FindingKey slope_key(const std::vector<std::string>& strata, const std::string& x, const std::string& y) {
    return FindingKey{"slope", strata, y + " on " + x};
}

std::string_view to_string(PageSize p) { return p == PageSize::Letter ? "Letter" : "A4"; }

std::string_view to_string(QuestionKind k) {
    return k == QuestionKind::Slope ? "slope" : k == QuestionKind::Mean ? "mean" : "rate";
}

FindingKey mean_key(const std::vector<std::string>& strata, const std::string& y, const std::string& focal,
                    const std::string& reference) {
    return FindingKey{"mean", strata, y + ": " + focal + " vs " + reference};
}

int required_version(const Project& p) {
    const bool slopes = p.question.kind == QuestionKind::Slope || !p.question.covariates.empty() ||
                        p.trend.has_value() || p.scan.slope_bootstrap != 0 || p.scan.find_groups;
    // A mean question is a version 3 key: older builds refuse the file rather than read it as a rate.
    if (p.question.kind == QuestionKind::Mean) return 3;
    // A rows filter: an older reader would scan every row. A sheet or a decimal mark: an older
    // reader would read another sheet, or the numbers as text.
    if (!p.question.rows.empty() || !p.data.sheet.empty() || p.data.decimal != DecimalMark::Auto) return 3;
    // A memo detail other than the default: an older reader would print the other memo.
    if (p.memo.detail != "families") return 3;
    // A decision applied from a family lead: an older reader would drop where it came from.
    for (const auto& r : p.reviews)
        if (!r.applied_from.empty()) return 3;
    // A database source has no file path: a version 1 reader would look for a file.
    return slopes || p.data.database ? 2 : 1;
}

const FindingReview* Project::review(const FindingKey& key) const {
    for (const auto& r : reviews)
        if (r.key == key) return &r;
    return nullptr;
}

FindingReview& Project::review_for(const FindingKey& key) {
    for (auto& r : reviews)
        if (r.key == key) return r;
    reviews.push_back(FindingReview{key, std::nullopt, Decision::Undecided, {}, std::nullopt, {}});
    return reviews.back();
}

std::string project_to_json_text(const Project& p, const std::string& project_path) {
    json doc = json::object();
    doc["format"] = kProjectFormat;
    const int version = required_version(p);
    doc["version"] = version;

    json data = json::object();
    data["path"] = relative_to_project(p.data.path, project_path);
    data["size"] = p.data.size;
    data["sha256"] = p.data.sha256;
    data["rows"] = p.data.rows;
    data["columns"] = p.data.columns;
    data["count_column"] = p.data.count_column.empty() ? json(nullptr) : json(p.data.count_column);
    data["delimiter"] = delimiter_name(p.data.delimiter);
    data["missing_markers"] = p.data.missing_markers;
    json types = json::object();
    for (const auto& [name, type] : p.data.type_overrides)
        types[name] = type == ColumnType::Numeric ? "numeric" : "categorical";
    data["type_overrides"] = types;
    // Version 3 keys, written only when set, so other files keep their bytes and version.
    if (!p.data.sheet.empty()) data["sheet"] = p.data.sheet;
    if (p.data.decimal != DecimalMark::Auto) data["decimal"] = std::string(to_string(p.data.decimal));
    if (const auto& d = p.data.database) {
        // Only the masked connection string is ever written (save paths cannot add a password).
        data["database"] = {{"connection", d->connection}, {"driver", d->driver}, {"database", d->database},
                            {"table", d->table},           {"query", d->query},   {"rows", d->rows},
                            {"queried_at", d->queried_at}};
    }
    doc["data"] = data;

    json q = json::object();
    q["outcome"] = p.question.outcome;
    q["positive"] = p.question.positive ? json(*p.question.positive) : json(nullptr);
    q["exposure"] = p.question.exposure;
    q["focal"] = p.question.focal;
    q["reference"] = p.question.reference ? json(*p.question.reference) : json(nullptr);
    // Version 2 keys are written only in version 2 files, so a rate audit keeps its version 1
    // bytes and stays readable by builds that know only version 1.
    if (version >= 2) {
        q["kind"] = to_string(p.question.kind);
        q["covariates"] = p.question.covariates;
    }
    if (p.question.kind == QuestionKind::Mean) {
        q["log_outcome"] = p.question.log_outcome;
        q["pay_gap"] = p.question.pay_gap;
    }
    if (version >= 3 && !p.question.rows.empty()) {
        q["rows"] = p.question.rows;
    }
    doc["question"] = q;
    if (version >= 2) {
        json t = nullptr;
        if (p.trend) t = json{{"x", p.trend->x}, {"y", p.trend->y}, {"covariates", p.trend->covariates}};
        doc["trend"] = t;
    }

    json s = json::object();
    s["strata"] = p.scan.strata.empty() ? json("auto") : json(p.scan.strata);
    s["pairs"] = p.scan.pairs;
    s["bins"] = p.scan.bins;
    s["max_levels"] = p.scan.max_levels;
    s["alpha"] = p.scan.alpha;
    s["bootstrap"] = p.scan.bootstrap;
    s["seed"] = p.scan.seed;
    if (version >= 2) s["slope_bootstrap"] = p.scan.slope_bootstrap;
    if (p.scan.find_groups) s["find_groups"] = true;  // only when asked: older projects keep their bytes
    doc["scan"] = s;

    json diagrams = json::array();
    for (const auto& d : p.diagrams) {
        json jd = json::object();
        jd["name"] = d.name;
        jd["diagram"] = json::parse(causal::diagram_to_json_text(d.diagram));
        diagrams.push_back(jd);
    }
    doc["diagrams"] = diagrams;
    doc["active_diagram"] = p.active_diagram;

    std::vector<const FindingReview*> sorted;
    for (const auto& r : p.reviews) sorted.push_back(&r);
    std::stable_sort(sorted.begin(), sorted.end(), [](auto* a, auto* b) { return a->key < b->key; });
    json reviews = json::array();
    for (const auto* r : sorted) {
        json jr = json::object();
        jr["kind"] = r->key.kind;
        jr["strata"] = r->key.strata;
        jr["comparison"] = r->key.comparison;
        jr["class"] = r->saved_class ? json(class_name(*r->saved_class)) : json(nullptr);
        jr["decision"] = to_string(r->decision);
        jr["note"] = r->note;
        jr["in_memo"] = r->in_memo ? json(*r->in_memo) : json(nullptr);
        if (!r->applied_from.empty()) jr["applied_from"] = r->applied_from;  // version 3
        reviews.push_back(jr);
    }
    doc["findings"] = reviews;

    json m = json::object();
    m["title"] = p.memo.title;
    m["analyst"] = p.memo.analyst;
    m["page_size"] = to_string(p.memo.page_size);
    m["findings"] = p.memo.findings;
    if (version >= 3 && p.memo.detail != "families") m["detail"] = p.memo.detail;
    doc["memo"] = m;

    // nlohmann's default object keeps keys sorted, so the text is deterministic.
    return doc.dump(2) + "\n";
}

Result<Project> parse_project(std::string_view text, const std::string& project_path) {
    const std::string& src = project_path;
    if (text.empty()) return make_error("empty file (expected a Foldline project, JSON)", src);
    auto parsed = parse_json_text(text, src, "not a readable project (damaged or not JSON): ");
    if (!parsed) return parsed.error();
    json doc = std::move(*parsed);
    if (!doc.is_object()) return make_error("expected a JSON object (a Foldline project)", src, 1, 1);
    auto fmt = doc.find("format");
    if (fmt == doc.end() || !fmt->is_string() || fmt->get<std::string>() != kProjectFormat)
        return make_error("not a Foldline project (expected \"format\": \"foldline-project\")", src);
    auto ver = doc.find("version");
    if (ver == doc.end() || !ver->is_number_integer())
        return make_error("\"version\": expected a whole number", src);
    const auto version = ver->get<std::int64_t>();
    if (version > kProjectVersion)
        return make_error("written by a newer Foldline (project version " + std::to_string(version) +
                              "; this build reads up to version " + std::to_string(kProjectVersion) +
                              "); open it with that version or newer. The file was not changed.",
                          src);
    if (version < 1) return make_error("\"version\": expected 1 or more", src);

    Reader r(src);
    Project p;
    if (const json* d = r.object(doc, "", "data", true)) {
        r.str(*d, "data", "path", p.data.path, true);
        r.whole(*d, "data", "size", p.data.size, 0, 1.8446744073709552e19);
        r.str(*d, "data", "sha256", p.data.sha256);
        r.whole(*d, "data", "rows", p.data.rows, 0, 1.8446744073709552e19);
        r.strings(*d, "data", "columns", p.data.columns);
        r.str(*d, "data", "count_column", p.data.count_column);
        std::string delim = "auto";
        r.str(*d, "data", "delimiter", delim);
        if (delim == "auto") p.data.delimiter = 0;
        else if (delim == "tab") p.data.delimiter = '\t';
        else if (delim.size() == 1) p.data.delimiter = delim[0];
        else r.fail("data.delimiter: expected \"auto\", \"tab\" or one character");
        r.strings(*d, "data", "missing_markers", p.data.missing_markers);
        r.str(*d, "data", "sheet", p.data.sheet);
        std::string decimal = "auto";
        r.str(*d, "data", "decimal", decimal);
        if (auto m = parse_decimal_mark(decimal)) p.data.decimal = *m;
        else r.fail("data.decimal: expected \"auto\", \".\" or \",\"");
        if (const json* t = r.object(*d, "data", "type_overrides", false)) {
            for (auto it = t->begin(); it != t->end(); ++it) {
                const std::string v = it->is_string() ? it->get<std::string>() : "";
                if (v == "numeric") p.data.type_overrides[it.key()] = ColumnType::Numeric;
                else if (v == "categorical") p.data.type_overrides[it.key()] = ColumnType::Categorical;
                else r.fail("data.type_overrides." + it.key() + ": expected \"numeric\" or \"categorical\"");
            }
        }
        if (const json* b = r.object(*d, "data", "database", false)) {
            DatabaseRecord rec;
            r.str(*b, "data.database", "connection", rec.connection);
            r.str(*b, "data.database", "driver", rec.driver);
            r.str(*b, "data.database", "database", rec.database);
            r.str(*b, "data.database", "table", rec.table);
            r.str(*b, "data.database", "query", rec.query);
            r.number(*b, "data.database", "rows", rec.rows, 0, 1e300);
            r.str(*b, "data.database", "queried_at", rec.queried_at);
            p.data.database = rec;
        }
        p.data.path = resolve_from_project(p.data.path, project_path);
    }
    if (const json* q = r.object(doc, "", "question", true)) {
        r.str(*q, "question", "outcome", p.question.outcome, true);
        r.opt_str(*q, "question", "positive", p.question.positive);
        r.str(*q, "question", "exposure", p.question.exposure, true);
        r.strings(*q, "question", "focal", p.question.focal);
        r.opt_str(*q, "question", "reference", p.question.reference);
        std::string kind = "rate";
        r.str(*q, "question", "kind", kind);
        if (kind == "slope") p.question.kind = QuestionKind::Slope;
        else if (kind == "mean" && version >= 3) p.question.kind = QuestionKind::Mean;
        else if (kind != "rate") r.fail("question.kind: expected \"rate\", \"slope\" or (version 3) \"mean\"");
        if (p.question.kind == QuestionKind::Mean) {
            r.boolean(*q, "question", "log_outcome", p.question.log_outcome);
            r.boolean(*q, "question", "pay_gap", p.question.pay_gap);
            if (p.question.positive) r.fail("question: a mean question has no positive level (numeric outcome)");
        }
        r.strings(*q, "question", "covariates", p.question.covariates);
        r.str(*q, "question", "rows", p.question.rows);
        if (!r.error && !p.question.rows.empty()) {
            if (auto f = filter::parse(p.question.rows); !f) r.fail("question.rows: " + f.error().message);
            else p.question.rows = filter::canonical_text(*f);
        }
        if (p.question.kind == QuestionKind::Slope &&
            (p.question.positive || !p.question.focal.empty() || p.question.reference))
            r.fail("question: a slope question has no positive, focal or reference level (numeric outcome and "
                   "exposure)");
    }
    if (const json* t = r.object(doc, "", "trend", false)) {
        TrendSettings trend;
        r.str(*t, "trend", "x", trend.x, true);
        r.str(*t, "trend", "y", trend.y, true);
        r.strings(*t, "trend", "covariates", trend.covariates);
        if (!r.error && (trend.x.empty() || trend.y.empty())) r.fail("trend: x and y must name numeric columns");
        p.trend = std::move(trend);
    }
    if (const json* s = r.object(doc, "", "scan", false)) {
        if (const json* st = r.field(*s, "scan", "strata", false)) {
            if (st->is_string() && st->get<std::string>() == "auto") p.scan.strata.clear();
            else r.strings(*s, "scan", "strata", p.scan.strata);
        }
        r.boolean(*s, "scan", "pairs", p.scan.pairs);
        r.whole(*s, "scan", "bins", p.scan.bins, 0, limits::kMaxBins);
        r.whole(*s, "scan", "max_levels", p.scan.max_levels, limits::kMinMaxLevels, limits::kMaxMaxLevels);
        r.number(*s, "scan", "alpha", p.scan.alpha, limits::kMinAlpha, limits::kMaxAlpha);
        r.whole(*s, "scan", "bootstrap", p.scan.bootstrap, 0, limits::kMaxBootstrap);
        r.whole(*s, "scan", "seed", p.scan.seed, 0, 1.8446744073709552e19);
        r.whole(*s, "scan", "slope_bootstrap", p.scan.slope_bootstrap, 0, limits::kMaxBootstrap);
        r.boolean(*s, "scan", "find_groups", p.scan.find_groups);
    }
    if (const json* ds = r.array(doc, "", "diagrams")) {
        for (std::size_t i = 0; i < ds->size() && !r.error; ++i) {
            const std::string where = "diagrams[" + std::to_string(i) + "]";
            const json& jd = (*ds)[i];
            if (!jd.is_object()) {
                r.fail(where + ": expected an object {\"name\", \"diagram\"}");
                break;
            }
            NamedDiagram nd;
            r.str(jd, where, "name", nd.name);
            if (const json* body = r.object(jd, where, "diagram", true)) {
                auto parsed = causal::parse_diagram(body->dump(), src);
                if (!parsed) {
                    r.fail(where + ".diagram: " + parsed.error().message);
                    break;
                }
                nd.diagram = std::move(*parsed);
            }
            p.diagrams.push_back(std::move(nd));
        }
    }
    r.str(doc, "", "active_diagram", p.active_diagram);
    if (const json* fs_ = r.array(doc, "", "findings")) {
        for (std::size_t i = 0; i < fs_->size() && !r.error; ++i) {
            const std::string where = "findings[" + std::to_string(i) + "]";
            const json& jr = (*fs_)[i];
            if (!jr.is_object()) {
                r.fail(where + ": expected an object");
                break;
            }
            FindingReview rv;
            r.str(jr, where, "kind", rv.key.kind);
            r.strings(jr, where, "strata", rv.key.strata);
            r.str(jr, where, "comparison", rv.key.comparison);
            std::optional<std::string> cls;
            r.opt_str(jr, where, "class", cls);
            if (cls) {
                rv.saved_class = class_from(*cls);
                if (!rv.saved_class)
                    r.fail(where + ".class: expected reversal, explained, masked, heterogeneous or stable");
            }
            std::string decision = "undecided";
            r.str(jr, where, "decision", decision);
            if (auto d = decision_from(decision)) rv.decision = *d;
            else r.fail(where + ".decision: expected undecided, upheld, set aside or follow up");
            r.str(jr, where, "note", rv.note);
            r.str(jr, where, "applied_from", rv.applied_from);
            if (const json* im = r.field(jr, where, "in_memo", false)) {
                if (!im->is_boolean()) r.fail(where + ".in_memo: expected true, false or null");
                else rv.in_memo = im->get<bool>();
            }
            p.reviews.push_back(std::move(rv));
        }
    }
    if (const json* m = r.object(doc, "", "memo", false)) {
        r.str(*m, "memo", "title", p.memo.title);
        r.str(*m, "memo", "analyst", p.memo.analyst);
        std::string page = "A4";
        r.str(*m, "memo", "page_size", page);
        if (page == "A4") p.memo.page_size = PageSize::A4;
        else if (page == "Letter") p.memo.page_size = PageSize::Letter;
        else r.fail("memo.page_size: expected \"A4\" or \"Letter\"");
        r.str(*m, "memo", "findings", p.memo.findings);
        if (p.memo.findings != "flagged" && p.memo.findings != "chosen")
            r.fail("memo.findings: expected \"flagged\" or \"chosen\"");
        if (m->contains("detail")) {
            r.str(*m, "memo", "detail", p.memo.detail);
            if (p.memo.detail != "families" && p.memo.detail != "full")
                r.fail("memo.detail: expected \"families\" or \"full\"");
        }
    }
    if (r.error) {
        Error e = *r.error;
        if (e.message.rfind('.', 0) == 0) e.message.erase(0, 1);  // "" root: ".data" → "data"
        return e;
    }
    return p;
}

Result<Project> load_project(const std::string& project_path) {
    std::ifstream in(project_path, std::ios::binary);
    if (!in) return make_error("cannot open the project file (missing or unreadable)", project_path);
    std::ostringstream ss;
    ss << in.rdbuf();
    if (in.bad()) return make_error("cannot read the project file", project_path);
    return parse_project(ss.str(), project_path);
}

Status save_project(const Project& p, const std::string& project_path) {
    const fs::path folder = fs::path(project_path).parent_path();
    std::error_code ec;
    if (!folder.empty() && !fs::is_directory(folder, ec))
        return make_error("cannot save: the folder " + folder.string() + " does not exist", project_path);
    auto st = write_file_atomically(project_path, project_to_json_text(p, project_path));
    if (!st) {
        Error e = st.error();
        e.message = "cannot save the project (" + e.message + "); the previous file, if any, is unchanged";
        return e;
    }
    return st;
}

DataChange compare_data(const DataSource& saved, const std::string& sha256_now, std::uint64_t size_now,
                        const Table* table) {
    DataChange c;
    c.sha256_before = saved.sha256;
    c.sha256_now = sha256_now;
    c.size_before = saved.size;
    c.size_now = size_now;
    c.rows_before = saved.rows;
    c.changed = !saved.sha256.empty() && (saved.sha256 != sha256_now || saved.size != size_now);
    if (table) {
        c.rows_known = true;
        c.rows_now = table->rows;
        std::set<std::string> before(saved.columns.begin(), saved.columns.end());
        std::set<std::string> now;
        for (const auto& col : table->columns) now.insert(col.name);
        for (const auto& col : table->columns)
            if (!before.count(col.name) && !saved.columns.empty()) c.columns_added.push_back(col.name);
        for (const auto& name : saved.columns)
            if (!now.count(name)) c.columns_removed.push_back(name);
    }
    if (!c.changed) {
        c.message = "unchanged";
        return c;
    }
    std::string m = "the data file changed since the project was saved (SHA-256 " + c.sha256_before.substr(0, 12) +
                    "… → " + c.sha256_now.substr(0, 12) + "…";
    if (c.size_before != c.size_now)
        m += ", " + with_thousands(c.size_before) + " → " + with_thousands(c.size_now) + " bytes";
    m += ")";
    if (c.rows_known) {
        if (c.rows_before != c.rows_now)
            m += "; rows: " + with_thousands(c.rows_before) + " → " + with_thousands(c.rows_now);
        else
            m += "; same number of rows (" + with_thousands(c.rows_now) + ")";
        auto list = [](const std::vector<std::string>& v) {
            std::string s;
            for (std::size_t i = 0; i < v.size(); ++i) s += (i ? ", " : "") + causal::quote_name(v[i]);
            return s;
        };
        if (!c.columns_added.empty()) m += "; new columns: " + list(c.columns_added);
        if (!c.columns_removed.empty()) m += "; missing columns: " + list(c.columns_removed);
        if (c.columns_added.empty() && c.columns_removed.empty()) m += "; same columns";
    }
    c.message = m;
    return c;
}

ReadOptions reading_options(const DataSource& d) {
    ReadOptions o;
    o.sheet = d.sheet;
    o.decimal = d.decimal;
    o.delimiter = d.delimiter;
    o.missing_markers = d.missing_markers;
    o.count_column = d.count_column;
    o.type_overrides = d.type_overrides;
    return o;
}

DataChange check_data_file(const DataSource& saved) {
    auto digest = sha256_file(saved.path);
    std::error_code ec;
    const auto size = fs::file_size(saved.path, ec);
    if (!digest || ec) {
        DataChange c;
        c.missing = true;
        c.sha256_before = saved.sha256;
        c.size_before = saved.size;
        c.rows_before = saved.rows;
        c.message = "the data file " + saved.path + " cannot be read (moved or deleted?)";
        return c;
    }
    DataChange c = compare_data(saved, *digest, size, nullptr);
    if (!c.changed) return c;
    auto table = read_table(saved.path, reading_options(saved));
    if (!table) {
        c.message += "; it no longer reads as before: " + table.error().to_string();
        return c;
    }
    return compare_data(saved, *digest, size, &*table);
}

Status record_data(DataSource& data, const Table& table) {
    auto digest = sha256_file(data.path);
    if (!digest) return digest.error();
    std::error_code ec;
    const auto size = fs::file_size(data.path, ec);
    if (ec) return make_error("cannot read the file size: " + ec.message(), data.path);
    data.sha256 = *digest;
    data.size = size;
    data.rows = table.rows;
    data.columns.clear();
    for (const auto& c : table.columns) data.columns.push_back(c.name);
    return Ok{};
}

}  // namespace foldline::project
