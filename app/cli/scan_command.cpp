// foldline scan: the rate-reversal scan from the command line. Prints a ranked summary and
// writes the JSON document (core/report/scan_json.h).
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <iostream>
#include <sstream>
#include <string>
#include <thread>

#include "app/cli/args.h"
#include "app/cli/audit_run.h"
#include "app/cli/command.h"
#include "core/causal/diagram.h"
#include "core/causal/diagram_file.h"
#include "app/cli/scan_source.h"
#include "core/common/atomic_file.h"
#include "core/common/sha256.h"
#include "core/common/stop_on_signal.h"
#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"
#include "core/scan/candidates.h"
#include "core/scan/grouped_cubes.h"
#include "core/scan/grouped_slopes.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"
#include "core/scan/slope_scan.h"

namespace foldline::cli {
namespace {

const char* kName = "scan";

std::vector<std::string> split_list(const std::string& s) {
    std::vector<std::string> out;
    std::stringstream ss(s);
    std::string item;
    while (std::getline(ss, item, ','))
        if (!item.empty()) out.push_back(item);
    return out;
}

bool parse_number(const std::string& s, double& out) {
    char* end = nullptr;
    out = std::strtod(s.c_str(), &end);
    return end != s.c_str() && !*end && std::isfinite(out);
}

std::string fmt(double x, const char* f = "%.3f") {
    if (!std::isfinite(x)) return "-";
    char buf[64];
    std::snprintf(buf, sizeof buf, f, x);
    return buf;
}

// q-values that underflowed print as a bound, not as a misleading 0.
std::string qfmt(double q) { return std::isfinite(q) && q < 1e-300 ? "<1e-300" : fmt(q, "%.2g"); }

std::string pct(double x) { return std::isfinite(x) ? fmt(100 * x, "%.1f%%") : "-"; }

void print_summary(std::ostream& os, const ScanResult& r, const std::string& path, std::size_t top) {
    const auto& q = r.question;
    os << "Scan of " << path << ": " << fmt(r.rows, "%.0f") << " rows\n";
    if (!q.outcome.empty()) {
        os << "Outcome " << q.outcome << " = " << q.positive << "; exposure " << q.exposure << ": ";
        for (std::size_t i = 0; i < q.focal.size(); ++i) os << (i ? ", " : "") << q.focal[i];
        os << " against " << q.reference << "\n";
    }
    os << "Stratifiers (" << r.candidates.size() << "):";
    for (std::size_t i = 0; i < r.candidates.size(); ++i) os << (i ? ", " : " ") << r.candidates[i];
    os << "\n";
    if (!r.excluded.empty()) {
        os << "Left out:";
        for (std::size_t i = 0; i < r.excluded.size(); ++i)
            os << (i ? ";" : "") << " " << r.excluded[i].column << " (" << r.excluded[i].reason << ")";
        os << "\n";
    }
    int counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.rate_findings) ++counts[rank(f.cls)];
    char line[512];
    if (!q.outcome.empty()) {
    os << r.rate_findings.size() << " comparisons: " << counts[0] << " reversal, " << counts[1] << " explained, "
       << counts[2] << " masked, " << counts[3] << " heterogeneous, " << counts[4] << " stable"
       << " (FDR " << r.alpha << ")\n";
    if (!r.rate_findings.empty()) {
        const auto& f0 = r.rate_findings.front();
        os << "Pooled rates: " << f0.focal << " " << pct(f0.crude.rate_focal) << ", " << f0.reference << " "
           << pct(f0.crude.rate_reference) << " (on the rows of the first finding)\n";
    }
    os << "\n";
    std::snprintf(line, sizeof line, "%-14s %-40s %9s %9s %9s %21s %9s %6s\n", "class", "strata", "crude RD",
                  "MH RD", "std RD", "MH OR (CI)", "q", "stab.");
    os << line;
    std::size_t shown = 0;
    for (const auto& f : r.rate_findings) {
        if (f.cls == FindingClass::Stable || shown >= top) continue;
        ++shown;
        std::string label = f.label();
        if (q.focal.size() > 1) label += " [" + f.focal + "]";
        if (label.size() > 40) label = label.substr(0, 37) + "...";
        const auto& a = f.adjusted;
        const std::string orci = fmt(a.mh_or.estimate, "%.2f") + " (" + fmt(a.mh_or.ci.lo, "%.2f") + "-" +
                                 fmt(a.mh_or.ci.hi, "%.2f") + ")";
        std::snprintf(line, sizeof line, "%-14s %-40s %9s %9s %9s %21s %9s %6s\n",
                      std::string(to_string(f.cls)).c_str(), label.c_str(), fmt(f.crude.rd, "%+.4f").c_str(),
                      fmt(a.mh_rd.greenland_robins.estimate, "%+.4f").c_str(),
                      fmt(a.standardized.rd, "%+.4f").c_str(), orci.c_str(), qfmt(f.q_value).c_str(),
                      fmt(f.stability, "%.2f").c_str());
        os << line;
    }
    if (shown == 0) os << "(no comparison changes under stratification)\n";
    const std::size_t flagged = r.rate_findings.size() - static_cast<std::size_t>(counts[4]);
    if (flagged > shown) os << "... " << flagged - shown << " more flagged (see the JSON)\n";
    }
    if (!r.slope_findings.empty()) {
        int sc[5] = {0, 0, 0, 0, 0};
        for (const auto& f : r.slope_findings) ++sc[rank(f.finding_class)];
        const auto& cov = r.slope_question.covariates;
        std::string adjusted;
        for (std::size_t i = 0; i < cov.size(); ++i) adjusted += (i ? ", " : "") + cov[i];
        os << "\nSlope of " << r.slope_question.y << " on " << r.slope_question.x
           << (adjusted.empty() ? "" : " adjusted for " + adjusted) << ": " << r.slope_findings.size()
           << " checks: " << sc[0] << " reversal, " << sc[1] << " explained, " << sc[2] << " masked, " << sc[3]
           << " heterogeneous, " << sc[4] << " stable\n";
        std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %9s %6s\n", "class", "strata", "pooled",
                      "within", "q", "stab.");
        os << line;
        std::size_t n = 0;
        for (const auto& f : r.slope_findings) {
            if (f.finding_class == FindingClass::Stable || n >= top) continue;
            ++n;
            std::string label;
            for (std::size_t i = 0; i < f.strata.size(); ++i) label += (i ? " \u00d7 " : "") + f.strata[i];
            std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %9s %6s\n",
                          std::string(to_string(f.finding_class)).c_str(), label.c_str(),
                          fmt(f.adjusted ? f.adjusted_pooled.slope : f.pooled.slope, "%+.4g").c_str(),
                          fmt(f.adjusted ? f.adjusted_within.slope : f.within.slope, "%+.4g").c_str(),
                          qfmt(f.q_value).c_str(),
                          f.stability_draws > 0 ? fmt(f.stability, "%.2f").c_str() : "-");
            os << line;
        }
        if (n == 0) os << "(no slope changes under stratification)\n";
    }
    if (r.cancelled) os << "Stopped early: the findings above are incomplete.\n";
    os << "\nA statistical screen, not a legal, lending or clinical determination: defer to local law, "
          "counsel and licensed practice.\n";
}

/// Reads --covariates C1,C2 into q.covariates (q.x and q.y set): an error message naming the
/// column when one is empty, repeated, x or y, missing from the data or not numeric; empty = fine.
std::string parse_covariates(const std::string& list, const Table& table, SlopeQuestion& q) {
    std::vector<std::string> names;
    std::size_t start = 0;
    while (true) {
        const std::size_t comma = list.find(',', start);
        names.push_back(list.substr(start, comma == std::string::npos ? std::string::npos : comma - start));
        if (comma == std::string::npos) break;
        start = comma + 1;
    }
    for (const auto& name : names) {
        if (name.empty()) return "--covariates needs column names separated by commas (an empty name in '" + list + "')";
        if (name == q.x || name == q.y)
            return "--covariates column '" + name + "' is the trend's " + (name == q.x ? "exposure (x)" : "outcome (y)") +
                   "; a covariate must be another column";
        if (std::count(names.begin(), names.end(), name) > 1)
            return "--covariates names column '" + name + "' twice";
        const Column* c = table.column(name);
        if (!c) return "--covariates column '" + name + "' not found in the data";
        if (!c->is_numeric())
            return "--covariates column '" + name + "' is not numeric (a covariate enters the regression as a number)";
    }
    q.covariates = std::move(names);
    return {};
}

int run(int argc, char** argv) {
    const std::vector<OptionSpec> specs = {
        {"outcome", true, "C[=LEVEL]"},      {"exposure", true, "C[=FOCAL[,REF]]"},
        {"strata", true, "auto|C1,C2"},      {"pairs", false, ""},
        {"bins", true, "N"},                 {"max-levels", true, "N"},
        {"count-column", true, "C"},         {"alpha", true, "A"},
        {"bootstrap", true, "B"},            {"seed", true, "S"},
        {"json", true, "FILE|-"},            {"threads", true, "N"},
        {"top", true, "N"},                  {"delimiter", true, "CHAR"},
        {"timings", false, ""},              {"help", false, ""},
        {"trend", true, "X:Y"},              {"slope-bootstrap", true, "B"},
        {"memo", true, "FILE.pdf"},          {"csv", true, "PREFIX"},
        {"diagram", true, "DIAGRAM.json"},
        {"source", true, "odbc:CONN"},       {"table", true, "T"},
        {"query", true, "SQL"},
        {"covariates", true, "C1,C2"},
    };
    Args a;
    if (auto err = Args::parse(argc, argv, 1, specs, a)) return fail(kName, kUsage, *err);
    if (a.flag("help", false)) {
        std::cout << "foldline scan DATA --outcome C[=LEVEL] --exposure C[=FOCAL[,REF]] [--strata auto|C1,C2]\n"
                     "  [--pairs|--no-pairs] [--bins N] [--max-levels N] [--count-column C] [--alpha 0.05]\n"
                     "  [--bootstrap B] [--seed S] [--json FILE|-] [--threads N] [--top N] [--timings]\n"
                     "  [--trend X:Y]   also check the slope of numeric Y on numeric X within each single stratifier\n"
                     "  [--covariates C1,C2]   numeric columns the trend's pooled and within slopes are adjusted for\n"
                     "  [--slope-bootstrap B]   resamples for the stability of flagged slope findings (default 0)\n"
                     "  [--memo FILE.pdf] [--csv PREFIX]   (PDF memo; PREFIX-findings.csv and PREFIX-strata.csv, and\n"
                     "      PREFIX-slope-findings.csv and PREFIX-slope-strata.csv when slopes are checked)\n"
                     "  [--diagram DIAGRAM.json]   add each finding's verdict: which view answers the question\n"
                     "foldline scan --source odbc:DSN=NAME; --table T | --query \"SELECT ...\" ...   (counts pushed down to the database)\n"
                     "With a numeric outcome and a numeric exposure the scan checks slopes instead of rates.\n";
        return kOk;
    }
    const bool from_db = a.has("source");
    if (from_db ? !a.positional().empty() : a.positional().size() != 1)
        return fail(kName, kUsage, from_db ? "give --source or a DATA file, not both" : "expected one DATA file (CSV or TSV)");
    std::string path = from_db ? std::string() : a.positional()[0];
    if (from_db && a.has("delimiter")) return fail(kName, kUsage, "--delimiter applies to files, not to --source");
    if (!a.has("outcome")) return fail(kName, kUsage, "missing --outcome COLUMN[=POSITIVE]");
    if (!a.has("exposure")) return fail(kName, kUsage, "missing --exposure COLUMN[=FOCAL[,REFERENCE]]");

    QuestionSpec spec;
    parse_outcome_arg(*a.get("outcome"), spec);
    parse_exposure_arg(*a.get("exposure"), spec);
    CandidateOptions copt;
    const std::string strata = a.get_or("strata", "auto");
    if (strata != "auto") copt.columns = split_list(strata);
    RateScanOptions sopt;
    sopt.pairs = a.flag("pairs", true);
    double v;
    auto number = [&](const char* name, double lo, double hi, double& out) -> bool {
        if (!a.has(name)) return true;
        if (!parse_number(*a.get(name), v) || v < lo || v > hi) return false;
        out = v;
        return true;
    };
    double bins = copt.bins, max_levels = static_cast<double>(copt.max_levels), boot = sopt.bootstrap,
           seed = static_cast<double>(sopt.seed), threads = 2, top = 20;
    if (!number("bins", 0, 1000, bins)) return fail(kName, kUsage, "--bins needs a whole number 0..1000 (0 = off)");
    if (!number("max-levels", 2, 100000, max_levels)) return fail(kName, kUsage, "--max-levels needs a number >= 2");
    if (!number("alpha", 1e-12, 0.5, sopt.alpha)) return fail(kName, kUsage, "--alpha needs a number in (0, 0.5]");
    if (!number("bootstrap", 0, 1e6, boot)) return fail(kName, kUsage, "--bootstrap needs a whole number >= 0");
    if (!number("seed", 0, 9e15, seed)) return fail(kName, kUsage, "--seed needs a whole number >= 0");
    if (!number("threads", 0, 256, threads)) return fail(kName, kUsage, "--threads needs a number 0..256");
    if (!number("top", 0, 1e9, top)) return fail(kName, kUsage, "--top needs a number >= 0");
    copt.bins = static_cast<int>(bins);
    copt.max_levels = static_cast<std::size_t>(max_levels);
    sopt.bootstrap = static_cast<int>(boot);
    sopt.seed = static_cast<std::uint64_t>(seed);
    sopt.threads = static_cast<unsigned>(threads);

    using clock = std::chrono::steady_clock;
    const auto t0 = clock::now();
    // The file's digest goes in the JSON; compute it beside the parse.
    Result<std::string> digest = std::string();
    std::thread hasher([&] {
        if (!from_db) digest = sha256_file(path);
    });
    CsvOptions ropt;
    ropt.count_column = a.get_or("count-column", "");
    ropt.threads = sopt.threads;
    copt.threads = sopt.threads;
    if (a.has("delimiter")) {
        const auto d = *a.get("delimiter");
        ropt.delimiter = d == "\\t" || d == "tab" ? '\t' : d.empty() ? 0 : d[0];
    }
    DatabaseInfo db;
    DatabaseCounts counted;
    bool from_cubes = false;
    auto table = from_db ? Result<Table>(make_error("")) : read_csv(path, ropt);
    if (from_db) {
        DatabaseRequest req;
        req.source = *a.get("source");
        req.table = a.get_or("table", "");
        req.query = a.get_or("query", "");
        req.required = {spec.outcome, spec.exposure};
        for (const auto& c : copt.columns) req.required.push_back(c);
        if (a.has("covariates"))
            for (const auto& c : split_list(*a.get("covariates"))) req.required.push_back(c);
        req.all_columns = copt.columns.empty();
        req.count_column = ropt.count_column;
        // A rate question runs on the cubes of one GROUPING SETS query, and its trend checks
        // on per-stratum moment sums. The diagram's verdicts (joint strata of any set), slope
        // stability (resampled rows) and trends of a pre-counted source need rows, so those
        // scans load the joint cells instead.
        std::string tx, ty;
        if (a.has("trend")) {
            const std::string t = *a.get("trend");
            const auto colon = t.find(':');
            if (colon == std::string::npos) return fail(kName, kUsage, "--trend needs X:Y (two numeric columns)");
            tx = t.substr(0, colon);
            ty = t.substr(colon + 1);
        }
        // Ctrl-C (or a TERM signal) during the counting cancels the statement running in the
        // engine (the driver's SQLCancel, through the stop token) instead of leaving it there.
        Work work;
        const StopOnSignal interrupts(work.stop);
        const bool cells = a.has("diagram") || (!tx.empty() && (a.has("slope-bootstrap") || !ropt.count_column.empty()));
        if (!cells) {
            for (const auto& c : {tx, ty})
                if (!c.empty() && std::find(req.required.begin(), req.required.end(), c) == req.required.end())
                    req.required.push_back(c);
            auto c = load_database_counts(req, copt, spec, sopt.pairs, !spec.positive, tx, ty, work);
            if (!c) {
                table = c.error();
            } else if (!c->numeric_question) {
                counted = std::move(*c);
                db = counted;
                path = db.description;
                table = counted.counts.pooled;
                from_cubes = true;
            }
        }
        if (!from_cubes && (cells || table.error().message.empty())) {
            auto loaded = load_database_source(req, copt, work);
            if (loaded) {
                db = *loaded;
                path = db.description;
                table = std::move(loaded->table);
            } else {
                table = loaded.error();
            }
        }
    }
    hasher.join();
    if (!table) return fail(kName, kInput, table.error().to_string());
    if (!digest) return fail(kName, kInput, digest.error().to_string());
    const auto t1 = clock::now();

    // Slope checks: a numeric outcome on a numeric exposure (with many values) is a slope
    // question; --trend X:Y adds slope checks of Y on X to a rate scan.
    const Column* oc = table->column(spec.outcome);
    const Column* ec = table->column(spec.exposure);
    const bool slope_only = oc && ec && oc->is_numeric() && ec->is_numeric() && !spec.positive &&
                            ec->distinct_count() > copt.max_levels;
    SlopeQuestion sq;
    sq.alpha = sopt.alpha;
    // Slope stability resamples rows (cost grows with the row count), so it is opt-in.
    double slope_boot = 0;
    if (!number("slope-bootstrap", 0, 1e6, slope_boot))
        return fail(kName, kUsage, "--slope-bootstrap needs a whole number >= 0");
    sq.bootstrap = static_cast<int>(slope_boot);
    sq.seed = sopt.seed;
    sq.threads = sopt.threads;
    if (slope_only) {
        sq.x = spec.exposure;
        sq.y = spec.outcome;
    } else if (a.has("trend")) {
        const std::string t = *a.get("trend");
        const auto colon = t.find(':');
        if (colon == std::string::npos) return fail(kName, kUsage, "--trend needs X:Y (two numeric columns)");
        sq.x = t.substr(0, colon);
        sq.y = t.substr(colon + 1);
        // (A database source checked the trend columns when it summed their moments.)
        for (const auto& c : from_cubes ? std::vector<std::string>{} : std::vector<std::string>{sq.x, sq.y}) {
            const Column* col = table->column(c);
            if (!col) return fail(kName, kUsage, "--trend column '" + c + "' not found");
            if (!col->is_numeric()) return fail(kName, kUsage, "--trend column '" + c + "' is not numeric");
        }
    }
    if (a.has("covariates")) {
        if (sq.x.empty())
            return fail(kName, kUsage,
                        "--covariates adjusts a trend: give a numeric --outcome and --exposure, or --trend X:Y");
        if (auto msg = parse_covariates(*a.get("covariates"), *table, sq); !msg.empty())
            return fail(kName, kUsage, msg);
        for (const auto& c : sq.covariates)
            if (std::find(copt.columns.begin(), copt.columns.end(), c) != copt.columns.end())
                return fail(kName, kUsage, "column '" + c + "' is in both --strata and --covariates: a column either "
                                           "stratifies the trend or adjusts it");
    }
    // A slope-only scan honours --pairs; --trend checks each single stratifier. Both go through
    // the helpers `foldline run` uses, so a saved trend audit re-runs to the same findings.
    Result<ScanResult> result = make_error("not run");
    if (slope_only) {
        int code = kOk;
        result = slope_audit(*table, sq, copt, sopt.pairs, code);
        if (!result) return fail(kName, code, result.error().to_string());
        result->bootstrap = sopt.bootstrap;
    } else if (from_cubes) {
        auto in = cubes_from_groups(counted.counts, spec, copt, sopt.pairs);
        if (!in) return fail(kName, kUsage, in.error().to_string());
        if (in->cubes.stratifiers.empty())
            return fail(kName, kInput, "no column qualifies as a stratifier (see --strata)");
        std::vector<SlopeFinding> slopes;
        if (counted.moments) {
            auto s = slope_checks_from_groups(*counted.moments, counted.counts, *in, sq);
            if (!s) return fail(kName, kInput, s.error().to_string());
            slopes = std::move(*s);
        }
        result = rate_scan(in->cubes, in->question, sopt, {}, {}, std::move(slopes));
        if (!result) return fail(kName, kInternal, result.error().to_string());
        if (!sq.x.empty()) result->slope_question = sq;
    } else {
        auto q = resolve_question(*table, spec);
        if (!q) return fail(kName, kUsage, q.error().to_string());
        auto cands = select_candidates(*table, {spec.outcome, spec.exposure}, copt, ec);
        if (!cands) return fail(kName, kUsage, cands.error().to_string());
        if (cands->candidates.empty()) return fail(kName, kInput, "no column qualifies as a stratifier (see --strata)");
        std::vector<SlopeFinding> slopes;
        if (!sq.x.empty()) {
            int code = kOk;
            auto checks = trend_checks(*table, sq, *cands, code);
            if (!checks) return fail(kName, code, checks.error().to_string());
            slopes = std::move(*checks);
        }
        result = rate_scan(*table, *q, *cands, sopt, {}, {}, std::move(slopes));
        if (!result) return fail(kName, kInternal, result.error().to_string());
        if (!sq.x.empty()) result->slope_question = sq;
    }
    if (a.has("diagram")) {
        // Diagram nodes are matched to data columns by name; an observed node missing from the
        // data is an input error that names it.
        const std::string dpath = *a.get("diagram");
        auto diagram = causal::read_diagram(dpath);
        if (!diagram) return fail(kName, kInput, diagram.error().to_string());
        auto graph = causal::CausalGraph::build(*diagram, dpath);
        if (!graph) return fail(kName, kInput, graph.error().to_string());
        std::vector<std::string> names;
        for (const auto& c : table->columns) names.push_back(c.name);
        if (auto st = causal::check_columns(*graph, names, dpath); !st) return fail(kName, kInput, st.error().to_string());
        std::string problem;
        attach_verdicts(*result, *table, *diagram, problem);
        if (!problem.empty()) std::cerr << "foldline scan: the diagram cannot judge every finding: " << problem << '\n';
    }
    if (from_db) merge_left_out(result->excluded, db.left_out, db.columns);
    const auto t2 = clock::now();

    DataInfo info{path, *digest, from_db ? db.source_rows : static_cast<double>(table->rows), std::nullopt};
    if (from_db) info.database = db.record;
    const std::string json_dest = a.get_or("json", "");
    std::ostream& human = json_dest == "-" ? std::cerr : std::cout;
    if (!json_dest.empty()) {
        const std::string text = scan_json_text(*result, info);
        if (json_dest == "-") {
            std::cout << text;
        } else if (auto st = write_file_atomically(json_dest, text); !st) {
            return fail(kName, kInput, st.error().to_string());
        }
    }
    if (int rc = write_shared_outputs(kName, *result, info, a.get_or("memo", ""), a.get_or("csv", ""),
                                      from_db ? nullptr : &*table);
        rc != kOk)
        return rc;
    const auto t3 = clock::now();
    print_summary(human, *result, path, static_cast<std::size_t>(top));
    if (a.flag("timings", false)) {
        auto s = [](auto d) { return std::chrono::duration<double>(d).count(); };
        std::fprintf(stderr, "timing_s load=%.3f scan=%.3f json=%.3f total=%.3f\n", s(t1 - t0), s(t2 - t1),
                     s(t3 - t2), s(clock::now() - t0));
        if (from_db) std::fprintf(stderr, "fetched_bytes=%.0f\n", db.bytes_fetched);
    }
    return kOk;
}

const CommandRegistration reg{Command{
    "scan",
    "scan DATA --outcome C[=LEVEL] --exposure C[=FOCAL[,REF]] [--strata auto|C1,C2] [--no-pairs] [--bins N] "
    "[--count-column C] [--alpha A] [--bootstrap B] [--seed S] [--json FILE|-] [--diagram DIAGRAM.json] [--memo FILE.pdf] "
    "[--trend X:Y] [--covariates C1,C2]",
    "search every stratifier and pair for reversals of the outcome rate between groups",
    run}};

}  // namespace
}  // namespace foldline::cli
