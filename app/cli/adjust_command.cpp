// foldline adjust DIAGRAM.json [--exposure X --outcome Y] [--stratify COLUMN] [--data FILE]
//                              [--json FILE|-] [--dot FILE|-]
// Prints the roles of the diagram's variables for the total effect of X on Y, whether the
// pooled comparison is valid, all minimal adjustment sets, the smallest, and identifiability;
// with --data, the diagram's testable claims checked against the rows of FILE.
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>

#include "app/cli/args.h"
#include "app/cli/command.h"
#include "core/audit/diagram_checks.h"
#include "core/audit/run_audit.h"
#include "core/causal/diagram_file.h"
#include "core/causal/verdict.h"
#include "core/common/atomic_file.h"
#include "core/io/csv_reader.h"
#include "core/report/causal_json.h"
#include "core/report/diagram_checks_json.h"

namespace foldline::cli {
namespace {

using namespace foldline::causal;

std::string braces(const std::vector<std::string>& set) {
    std::string out = "{";
    for (std::size_t i = 0; i < set.size(); ++i) out += (i ? ", " : "") + quote_name(set[i]);
    return out + "}";
}

void print_checks(std::ostream& os, const std::string& data, const DiagramChecks& c) {
    os << "\nThe diagram's claims checked against " << data << " (" << c.checks.size() << " claims, " << c.tested
       << " tested, " << c.contradicted << " contradicted at q < " << c.alpha << "):\n";
    if (c.checks.empty()) os << "  (every pair of observed columns is joined by an arrow: nothing to check)\n";
    for (const auto& k : c.checks) {
        os << "  " << (k.contradicted ? "CONTRADICTED  " : k.form == ClaimForm::Untestable ? "untestable    "
                                                       : std::isnan(k.q)               ? "not assessed  "
                                                                                       : "consistent    ");
        if (k.method == CheckMethod::GSquared) {
            char buf[96];
            std::snprintf(buf, sizeof buf, "G² %.4g, df %.0f, p %.3g, q %.3g: ", k.test.statistic, k.test.df, k.test.p, k.q);
            os << buf;
        } else if (k.method == CheckMethod::PartialCorrelation && !std::isnan(k.test.p)) {
            char buf[96];
            std::snprintf(buf, sizeof buf, "partial r %.3f, z %.3g, p %.3g, q %.3g: ", k.test.partial_r,
                          k.test.statistic, k.test.p, k.q);
            os << buf;
        }
        os << k.sentence << "\n";
    }
}

void print_text(std::ostream& os, const std::string& path, const CausalGraph& cg, const AdjustmentReport& r,
                const Verdict* v) {
    os << "Diagram: " << path << " (" << cg.size() << " variables, " << cg.graph().edge_count() << " edges)\n";
    os << "Question: total effect of " << quote_name(r.exposure) << " on " << quote_name(r.outcome) << "\n\n";
    os << "Roles:\n";
    std::size_t width = 0;
    for (const auto& nr : r.roles) width = std::max(width, quote_name(nr.name).size() + (nr.observed ? 0 : 13));
    for (const auto& nr : r.roles) {
        std::string label = quote_name(nr.name) + (nr.observed ? "" : " (unobserved)");
        os << "  " << label << std::string(width - label.size() + 2, ' ') << to_string(nr.role) << "\n";
    }
    if (r.roles.empty()) os << "  (no other variables)\n";
    os << "\nPooled comparison (empty set) valid: " << (r.empty_set_valid ? "yes" : "no") << "\n";
    os << "Minimal valid adjustment sets of observed columns:";
    if (r.minimal_sets.empty()) os << " none";
    os << "\n";
    for (const auto& s : r.minimal_sets) os << "  " << braces(s) << "\n";
    if (r.truncated) os << "  (listing stopped at the cap; more sets exist)\n";
    os << "Smallest valid set: " << (r.smallest ? braces(*r.smallest) : std::string("none")) << "\n";
    os << "Identifiable by adjustment: " << (r.identifiable ? "yes" : "no");
    if (!r.unobserved_needed.empty()) os << " (would need the unobserved " << braces(r.unobserved_needed) << ")";
    os << "\n\n" << r.summary << "\n";
    if (v) {
        os << "\nVerdict for stratifying by " << braces(v->stratifier) << ": " << to_string(v->answer) << "\n  "
           << v->reason << "\n";
        if (v->direct_effect.applies) os << "  " << v->direct_effect.reason << "\n";
    }
}

int run_adjust(int argc, char** argv) {
    const std::string name = "adjust";
    const std::vector<OptionSpec> specs = {
        {"exposure", true, "exposure column (overrides the file)"},
        {"outcome", true, "outcome column (overrides the file)"},
        {"stratify", true, "also give the verdict for a finding stratified by this column"},
        {"data", true, "check the diagram's testable claims against this CSV file"},
        {"json", true, "write JSON to FILE, or to standard output with -"},
        {"dot", true, "write the diagram as Graphviz DOT to FILE, or to standard output with -"},
    };
    Args args;
    if (auto err = Args::parse(argc, argv, 1, specs, args)) return fail(name, kUsage, *err);
    if (args.get_or("json", "") == "-" && args.get_or("dot", "") == "-")
        return fail(name, kUsage, "--json - and --dot - cannot both write to standard output");
    if (args.positional().size() != 1)
        return fail(name, kUsage, "expected one diagram file: foldline adjust DIAGRAM.json [--exposure X --outcome Y]");
    const std::string path = args.positional()[0];
    for (const char* opt : {"json", "dot"}) {
        std::error_code ec;
        const std::string target = args.get_or(opt, "");
        if (!target.empty() && target != "-" && std::filesystem::equivalent(target, path, ec))
            return fail(name, kUsage, std::string("--") + opt + " would overwrite the diagram file " + path);
        const std::string data = args.get_or("data", "");
        if (!target.empty() && target != "-" && !data.empty() && std::filesystem::equivalent(target, data, ec))
            return fail(name, kUsage, std::string("--") + opt + " would overwrite the data file " + data);
    }
    auto diagram = read_diagram(path);
    if (!diagram) return fail(name, kInput, diagram.error().to_string());
    if (auto x = args.get("exposure")) diagram->exposure = *x;
    if (auto y = args.get("outcome")) diagram->outcome = *y;
    if (diagram->exposure.empty() || diagram->outcome.empty())
        return fail(name, kUsage,
                    path + ": the diagram sets no " + std::string(diagram->exposure.empty() ? "exposure" : "outcome") +
                        "; give --exposure and --outcome");
    auto cg = CausalGraph::build(*diagram, path);
    if (!cg) return fail(name, kInput, cg.error().to_string());
    auto report = analyse_adjustment(*cg, diagram->exposure, diagram->outcome);
    if (!report) {
        Error e = report.error();
        if (e.file.empty()) e.file = path;
        return fail(name, kInput, e.to_string());
    }
    std::optional<Verdict> verdict;
    if (auto s = args.get("stratify")) {
        auto v = decide(*cg, diagram->exposure, diagram->outcome, {*s});
        if (!v) return fail(name, kInput, path + ": " + v.error().message);
        verdict = std::move(*v);
    }
    std::optional<DiagramChecks> checks;
    const std::string data_path = args.get_or("data", "");
    if (!data_path.empty()) {
        auto table = read_csv(data_path);
        if (!table) return fail(name, kInput, table.error().to_string());
        if (auto st = audit::check_diagram_columns(*diagram, *table, path); !st)
            return fail(name, kInput, st.error().to_string());
        auto c = audit::check_diagram(*diagram, *table, {});
        if (!c) return fail(name, kInput, path + ": " + c.error().message);
        checks = std::move(*c);
    }
    const std::string dot_target = args.get_or("dot", "");
    if (dot_target == "-") {
        std::cout << diagram_to_dot(*diagram);
    } else if (!dot_target.empty()) {
        if (auto st = write_file_atomically(dot_target, diagram_to_dot(*diagram)); !st)
            return fail(name, kInput, st.error().to_string());
    }
    const std::string json_target = args.get_or("json", "");
    if (!json_target.empty()) {
        nlohmann::json doc = report::to_json(*report);
        doc["diagram"] = path;
        if (verdict) doc["verdict"] = report::to_json(*verdict);
        if (checks) {
            doc["data"] = data_path;
            doc["diagram_checks"] = report::to_json(*checks);
        }
        const std::string text = doc.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) + "\n";
        if (json_target == "-") {
            std::cout << text;
            return kOk;
        }
        if (auto st = write_file_atomically(json_target, text); !st) return fail(name, kInput, st.error().to_string());
    }
    if (dot_target != "-") {
        print_text(std::cout, path, *cg, *report, verdict ? &*verdict : nullptr);
        if (checks) print_checks(std::cout, data_path, *checks);
    }
    return kOk;
}

const CommandRegistration registration{Command{
    .name = "adjust",
    .synopsis = "adjust DIAGRAM.json [--exposure X --outcome Y] [--stratify COLUMN] [--data FILE] [--json FILE|-] "
                "[--dot FILE|-]",
    .summary = "Roles, valid and minimal adjustment sets, and identifiability for the total effect in a causal diagram.",
    .help = "Usage: foldline adjust DIAGRAM.json [--exposure X --outcome Y] [--stratify COLUMN] [--json FILE|-]\n"
            "  [--data FILE] [--dot FILE|-]\n"
            "Prints the roles of the diagram's variables for the total effect of X on Y, whether the pooled\n"
            "comparison is valid, the minimal adjustment sets, the smallest, and identifiability. With --data,\n"
            "also tests each conditional independence the diagram implies on the file's rows.\n"
            "  --exposure X       exposure column (overrides the file)\n"
            "  --outcome Y        outcome column (overrides the file)\n"
            "  --stratify COLUMN  also give the verdict for a finding stratified by this column\n"
            "  --data FILE        check the diagram's testable claims against this CSV file\n"
            "  --json FILE|-      write JSON to FILE, or to standard output with -\n"
            "  --dot FILE|-       write the diagram as Graphviz DOT to FILE, or to standard output with -\n"
            "Exit codes: 0 done, 2 usage error, 3 input error (the diagram's file, line and column), 1 internal\n"
            "error.\n",
    .run = run_adjust,
}};

}  // namespace
}  // namespace foldline::cli
