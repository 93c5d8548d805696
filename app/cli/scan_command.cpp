// foldline scan: the rate-reversal scan from the command line. Prints a ranked summary and
// writes the JSON document (core/report/scan_json.h).
#include <algorithm>
#include <cerrno>
#include <cstdlib>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <iostream>
#include <sstream>
#include <string>
#include <thread>

#include "app/cli/args.h"
#include "app/cli/command.h"
#include "app/cli/count_warning.h"
#include "app/cli/outputs.h"
#include "core/audit/database_source.h"
#include "core/audit/mean_audit.h"
#include "core/audit/run_audit.h"
#include "core/causal/diagram_file.h"
#include "core/common/atomic_file.h"
#include "core/common/sha256.h"
#include "core/common/stop_on_signal.h"
#include "core/io/csv_reader.h"
#include "core/io/table_reader.h"
#include "core/report/scan_json.h"
#include "core/report/scan_summary.h"

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

void print_summary(std::ostream& os, const ScanResult& r, const std::string& path, std::size_t top) {
    os << scan_summary_text(r, path, top);
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
        {"timings", false, ""},
        {"trend", true, "X:Y"},              {"slope-bootstrap", true, "B"},
        {"memo", true, "FILE.pdf"},          {"csv", true, "PREFIX"},
        {"memo-detail", true, "families|full"},
        {"diagram", true, "DIAGRAM.json"},
        {"source", true, "odbc:CONN"},       {"table", true, "T"},
        {"query", true, "SQL"},
        {"covariates", true, "C1,C2"},      {"find-groups", false, ""},
        {"mean", true, "Y"},                 {"log-outcome", false, ""},
        {"pay-gap", false, ""},
        {"where", true, "EXPR"},
        {"sheet", true, "NAME"},             {"decimal", true, "auto|.|,"},
    };
    Args a;
    if (auto err = Args::parse(argc, argv, 1, specs, a)) return fail(kName, kUsage, *err);
    if (a.has("memo-detail")) {
        if (auto msg = memo_detail_problem(*a.get("memo-detail")); !msg.empty()) return fail(kName, kUsage, msg);
        if (!a.has("memo")) return fail(kName, kUsage, "--memo-detail chooses the memo's sections: give --memo FILE.pdf too");
    }
    const bool from_db = a.has("source");
    if (from_db ? !a.positional().empty() : a.positional().size() != 1)
        return fail(kName, kUsage, from_db ? "give --source or a DATA file, not both"
                                           : "expected one DATA file (CSV/TSV, SAS, SPSS, Stata, xlsx or xls)");
    std::string path = from_db ? std::string() : a.positional()[0];
    if (from_db && a.has("delimiter")) return fail(kName, kUsage, "--delimiter applies to files, not to --source");
    if (from_db && (a.has("sheet") || a.has("decimal")))
        return fail(kName, kUsage, "--sheet and --decimal apply to files, not to --source");
    // A mean-gap question: --mean Y (a numeric outcome) between the --exposure groups.
    const bool mean = a.has("mean");
    if (mean && a.has("outcome"))
        return fail(kName, kUsage, "give --outcome (a rate between groups) or --mean (a mean gap), not both");
    if (!mean && (a.has("log-outcome") || a.has("pay-gap")))
        return fail(kName, kUsage, "--log-outcome and --pay-gap apply to a mean gap: give --mean COLUMN");
    if (mean && from_db) return fail(kName, kUsage, audit::kMeanNeedsRows);
    if (mean && (a.has("trend") || a.has("covariates")))
        return fail(kName, kUsage, "--trend and --covariates do not apply to a mean gap in this version (covariate "
                                   "adjustment and the Oaxaca-Blinder decomposition are not available yet)");
    if (!mean && !a.has("outcome")) return fail(kName, kUsage, "missing --outcome COLUMN[=POSITIVE] (or --mean COLUMN)");
    if (!a.has("exposure")) return fail(kName, kUsage, "missing --exposure COLUMN[=FOCAL[,REFERENCE]]");

    // Everything asked becomes one audit specification (core/audit), the same `foldline run`
    // reads from a project file and the workbench builds from its Question step.
    project::AuditSpec spec;
    {
        QuestionSpec q;
        if (mean) q.outcome = *a.get("mean");
        else parse_outcome_arg(*a.get("outcome"), q);
        parse_exposure_arg(*a.get("exposure"), q);
        spec.question.outcome = q.outcome;
        spec.question.positive = q.positive;
        spec.question.exposure = q.exposure;
        spec.question.focal = q.focal;
        spec.question.reference = q.reference;
        if (mean) {
            spec.question.kind = project::QuestionKind::Mean;
            spec.question.log_outcome = a.flag("log-outcome", false);
            spec.question.pay_gap = a.flag("pay-gap", false);
        }
    }
    if (a.has("where")) {
        auto f = filter::parse(*a.get("where"));
        if (!f) return fail(kName, kUsage, "--where: " + f.error().message);
        spec.question.rows = filter::canonical_text(*f);
    }
    const std::string strata = a.get_or("strata", "auto");
    if (strata != "auto") spec.scan.strata = split_list(strata);
    spec.scan.pairs = a.flag("pairs", true);
    spec.scan.find_groups = a.flag("find-groups", false);
    double v;
    auto number = [&](const char* name, double lo, double hi, double& out) -> bool {
        if (!a.has(name)) return true;
        if (!parse_number(*a.get(name), v) || v < lo || v > hi) return false;
        out = v;
        return true;
    };
    namespace lim = project::limits;
    double bins = spec.scan.bins, max_levels = static_cast<double>(spec.scan.max_levels), boot = spec.scan.bootstrap,
           slope_boot = spec.scan.slope_bootstrap, threads = 2, top = 20;
    if (!number("bins", 0, lim::kMaxBins, bins)) return fail(kName, kUsage, "--bins needs a whole number 0..1000 (0 = off)");
    if (!number("max-levels", lim::kMinMaxLevels, lim::kMaxMaxLevels, max_levels))
        return fail(kName, kUsage, "--max-levels needs a whole number 2..1000000");
    if (!number("alpha", lim::kMinAlpha, lim::kMaxAlpha, spec.scan.alpha))
        return fail(kName, kUsage, "--alpha needs a number in (0, 0.5]");
    if (!number("bootstrap", 0, lim::kMaxBootstrap, boot)) return fail(kName, kUsage, "--bootstrap needs a whole number 0..1000000");
    if (!number("slope-bootstrap", 0, lim::kMaxBootstrap, slope_boot))
        return fail(kName, kUsage, "--slope-bootstrap needs a whole number 0..1000000");
    if (!number("threads", 0, 256, threads)) return fail(kName, kUsage, "--threads needs a number 0..256");
    if (!number("top", 0, 1e9, top)) return fail(kName, kUsage, "--top needs a number >= 0");
    if (a.has("seed")) {
        // Every 64-bit seed is valid (a project may record any); parsed exactly, not through a double.
        const std::string s = *a.get("seed");
        char* end = nullptr;
        errno = 0;
        const unsigned long long seed = std::strtoull(s.c_str(), &end, 10);
        if (s.empty() || s[0] == '-' || *end || errno == ERANGE)
            return fail(kName, kUsage, "--seed needs a whole number 0..18446744073709551615");
        spec.scan.seed = seed;
    }
    spec.scan.bins = static_cast<int>(bins);
    spec.scan.max_levels = static_cast<std::uint64_t>(max_levels);
    spec.scan.bootstrap = static_cast<int>(boot);
    spec.scan.slope_bootstrap = static_cast<int>(slope_boot);
    audit::RunOptions options;
    options.threads = static_cast<unsigned>(threads);
    if (a.has("trend")) {
        const std::string t = *a.get("trend");
        const auto colon = t.find(':');
        if (colon == std::string::npos || colon == 0 || colon + 1 == t.size())
            return fail(kName, kUsage, "--trend needs X:Y (two numeric columns)");
        spec.trend = project::TrendSettings{t.substr(0, colon), t.substr(colon + 1), {}};
    }
    std::vector<std::string> covariates;
    if (a.has("covariates")) {
        covariates = split_list(*a.get("covariates"));
        if (covariates.empty() || a.get("covariates")->find(",,") != std::string::npos ||
            a.get("covariates")->front() == ',' || a.get("covariates")->back() == ',')
            return fail(kName, kUsage, "--covariates needs column names separated by commas (an empty name in '" +
                                           *a.get("covariates") + "')");
        for (const auto& c : covariates)
            if (std::find(spec.scan.strata.begin(), spec.scan.strata.end(), c) != spec.scan.strata.end())
                return fail(kName, kUsage, "column '" + c + "' is in both --strata and --covariates: a column either "
                                               "stratifies the trend or adjusts it");
    }
    if (a.has("diagram")) {
        auto diagram = causal::read_diagram(*a.get("diagram"));
        if (!diagram) return fail(kName, kInput, diagram.error().to_string());
        spec.diagrams.push_back({"as drawn", std::move(*diagram)});
    }

    using clock = std::chrono::steady_clock;
    const auto t0 = clock::now();
    // The file's digest goes in the JSON; compute it beside the parse.
    Result<std::string> digest = std::string();
    std::thread hasher([&] {
        if (!from_db) digest = sha256_file(path);
    });
    ReadOptions ropt;
    ropt.sheet = a.get_or("sheet", "");
    if (auto d = a.get("decimal")) {
        auto m = parse_decimal_mark(*d);
        if (!m) return fail(kName, kUsage, "--decimal expects auto, . or , (got '" + *d + "')");
        ropt.decimal = *m;
    }
    ropt.count_column = a.get_or("count-column", "");
    ropt.threads = options.threads;
    if (a.has("delimiter")) {
        const auto d = *a.get("delimiter");
        ropt.delimiter = d == "\\t" || d == "tab" ? '\t' : d.empty() ? 0 : d[0];
    }
    audit::DatabaseInfo db;
    std::optional<audit::DatabaseCounts> counted;
    ReadReport read;
    auto table = from_db ? Result<Table>(make_error("")) : read_table(path, ropt, &read);
    for (const auto& w : read.warnings) std::cerr << "foldline scan: warning: " << w << "\n";
    for (const auto& n : read.numbers) std::cerr << "foldline scan: column '" << n.column << "' " << n.describe() << "\n";
    if (from_db) {
        audit::DatabaseRequest req;
        req.source = *a.get("source");
        req.table = a.get_or("table", "");
        req.query = a.get_or("query", "");
        req.count_column = ropt.count_column;
        // Ctrl-C (or a TERM signal) during the counting cancels the statement running in the
        // engine (the driver's SQLCancel, through the stop token) instead of leaving it there.
        Work work;
        const StopOnSignal interrupts(work.stop);
        auto loaded = audit::load_for_audit(req, spec, covariates, work);
        if (!loaded) {
            table = loaded.error();
        } else {
            db = loaded->info;
            path = db.description;
            counted = std::move(loaded->counts);
            table = counted ? counted->counts.pooled : std::move(loaded->cells);
        }
    }
    hasher.join();
    if (!table) return fail(kName, table.error());  // input, or usage for a filter the source does not fit
    if (!digest) return fail(kName, kInput, digest.error().to_string());
    // The file as read, before any rows filter: a forgotten count column is a property of the file.
    if (!from_db) warn_if_count_column_forgotten(std::cerr, "scan", *table, ropt.count_column);
    const double rows_read = static_cast<double>(table->rows);
    if (!from_db && !spec.question.rows.empty()) {
        // The rows the filter keeps are the audit's rows: its kind, diagram check, outputs.
        auto kept = audit::filter_rows(*table, spec);
        if (!kept) return fail(kName, kept.error());
        table = std::move(*kept);
    }
    const auto t1 = clock::now();

    // A numeric outcome on a numeric exposure with many values is a slope question; covariates
    // adjust that trend, or the --trend checks of a rate question.
    const bool from_cubes = counted.has_value();
    if (!from_cubes && !mean)
        spec.question.kind = audit::infer_kind(*table, spec.question, static_cast<std::size_t>(spec.scan.max_levels));
    const bool slope_only = spec.question.kind == project::QuestionKind::Slope;
    if (!from_cubes)
        if (auto st = audit::add_combined_groups(*table, spec); !st) return fail(kName, kUsage, st.error().to_string());
    if (!covariates.empty()) {
        if (slope_only) spec.question.covariates = covariates;
        else if (spec.trend) spec.trend->covariates = covariates;
        else
            return fail(kName, kUsage,
                        "--covariates adjusts a trend: give a numeric --outcome and --exposure, or --trend X:Y");
    }
    if (!spec.diagrams.empty())
        if (auto st = audit::check_diagram_columns(spec.diagrams.front().diagram, *table, *a.get("diagram")); !st)
            return fail(kName, kInput, st.error().to_string());
    auto result = from_cubes ? audit::scan_groups(counted->counts, counted->moments, spec, options)
                             : audit::scan_table(*table, spec, options);
    if (!result) return fail(kName, result.error());
    if (!spec.diagrams.empty()) {
        std::string problem;
        for (const auto& f : result->rate_findings)
            if (problem.empty()) problem = f.verdict_problem;
        for (const auto& f : result->slope_findings)
            if (problem.empty()) problem = f.verdict_problem;
        if (!problem.empty()) std::cerr << "foldline scan: the diagram cannot judge every finding: " << problem << '\n';
    }
    if (from_db) audit::merge_left_out(result->excluded, db.left_out, db.columns);
    const auto t2 = clock::now();

    DataInfo info{path, *digest, from_db ? db.source_rows : rows_read, std::nullopt};
    if (!from_db && read.format != FileFormat::Csv) info.format = std::string(format_key(read.format));
    if (!from_db) info.sheet = ropt.sheet;
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
                                      from_db ? nullptr : &*table, a.get_or("memo-detail", ""));
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
    .name = "scan",
    .synopsis = "scan DATA --outcome C[=LEVEL] --exposure C[=FOCAL[,REF]] [--strata auto|C1,C2] [--no-pairs] [--bins N] "
                "[--count-column C] [--alpha A] [--bootstrap B] [--seed S] [--json FILE|-] [--diagram DIAGRAM.json] "
                "[--memo FILE.pdf] [--trend X:Y] [--covariates C1,C2] [--where EXPR] [--sheet NAME] [--decimal M]",
    .summary = "search every stratifier and pair for reversals of the outcome rate between groups",
    .help = "Usage: foldline scan DATA --outcome C[=LEVEL] --exposure C[=FOCAL[,REF]] [--strata auto|C1,C2]\n"
            "  [--pairs|--no-pairs] [--bins N] [--max-levels N] [--count-column C] [--alpha 0.05]\n"
            "  [--bootstrap B] [--seed S] [--json FILE|-] [--threads N] [--top N] [--timings]\n"
            "  [--delimiter CHAR]   field delimiter of DATA (tab or \\t for a tab; default: detected)\n"
            "  --exposure A+B=a1+b1,a2+b2   compared groups formed by two or more columns joined by '+'\n"
            "      (each combination is a group; its parts never stratify)\n"
            "  [--sheet NAME]   workbooks (.xlsx, .xls): the sheet to read (default: the first)\n"
            "  [--decimal auto|.|,]   decimal mark of numbers written as text (default auto: a column\n"
            "      written consistently with decimal commas is read so, ambiguous columns are listed)\n"
            "DATA is CSV/TSV text, a SAS (.xpt, .sas7bdat), SPSS (.sav, .zsav) or Stata (.dta) file, or an\n"
            ".xlsx or .xls workbook.\n"
            "  [--where EXPR]   rows to include, e.g. \"year >= 2024 and region in ('north', 'east')\"\n"
            "      (=, <>, <, <=, >, >=, in (...), is missing, not, and, or; text in single quotes;\n"
            "      docs/filter.md). Pushed down to a database as a WHERE condition.\n"
            "  [--trend X:Y]   also check the slope of numeric Y on numeric X within each single stratifier\n"
            "  [--covariates C1,C2]   numeric columns the trend's pooled and within slopes are adjusted for\n"
            "  [--slope-bootstrap B]   resamples for the stability of flagged slope findings (default 0)\n"
            "  [--memo FILE.pdf] [--csv PREFIX]   (PDF memo; PREFIX-findings.csv and PREFIX-strata.csv, and\n"
            "      PREFIX-slope-findings.csv and PREFIX-slope-strata.csv when slopes are checked)\n"
            "  [--memo-detail families|full]   the memo's sections: one per family of findings (default) or\n"
            "      one per finding\n"
            "  [--diagram DIAGRAM.json]   add each finding's verdict: which view answers the question\n"
            "  [--find-groups]   trend questions: also fit the hidden-group hint (mixtures of x and y; a hint,\n"
            "      never a finding: JSON kind \"latent\")\n"
            "Usage: foldline scan --source odbc:DSN=NAME; --table T | --query \"SELECT ...\" ...   (counts pushed down to "
            "the database)\n"
            "With a numeric outcome and a numeric exposure the scan checks slopes instead of rates.\n"
            "Usage: foldline scan DATA --mean Y --exposure C[=FOCAL[,REF]] [--log-outcome] [--pay-gap] ...\n"
            "  the mean of numeric Y between groups, pooled and within strata (JSON kind \"mean\");\n"
            "  --log-outcome analyses log(Y) (every Y must be above 0) and adds exp(d) - 1 percentages;\n"
            "  --pay-gap adds pay-reporting figures: gap as % of the reference mean, median gap, strata\n"
            "      whose gap reaches 5% flagged (a statistical screen, not a legal determination)\n"
            "Exit codes: 0 done, 2 usage error, 3 input error, 1 internal error.\n",
    .run = run,
}};

}  // namespace
}  // namespace foldline::cli
