// foldline run PROJECT: re-runs a saved audit (same question, settings, seed and diagram),
// optionally on a new extract with the same columns, writes the shareable outputs, and exits
// with 4 when a finding's class differs from the one saved in the project — so a scheduled
// re-audit can gate on it.
#include <iostream>

#include "app/cli/args.h"
#include "app/cli/command.h"
#include "app/cli/outputs.h"
#include "core/audit/class_changes.h"
#include "core/audit/run_audit.h"
#include "core/common/atomic_file.h"
#include "core/report/csv_export.h"

namespace foldline::cli {
namespace {

const char* kName = "run";

std::string class_or(const std::optional<FindingClass>& c, const char* none) {
    return c ? std::string(to_string(*c)) : std::string(none);
}

int run(int argc, char** argv) {
    const std::vector<OptionSpec> specs = {
        {"data", true, "FILE"}, {"json", true, "FILE|-"}, {"memo", true, "FILE.pdf"}, {"csv", true, "PREFIX"},
        {"threads", true, "N"}, {"update", false, ""}, {"where", true, "EXPR"},
    };
    Args a;
    if (auto err = Args::parse(argc, argv, 1, specs, a)) return fail(kName, kUsage, *err);
    if (a.positional().size() != 1) return fail(kName, kUsage, "expected one PROJECT file (NAME.foldline)");
    const std::string project_path = a.positional()[0];
    auto loaded = project::load_project(project_path);
    if (!loaded) return fail(kName, kInput, loaded.error().to_string());
    project::Project p = std::move(*loaded);
    if (a.has("where")) {
        // Replaces the saved rows filter for this run (an empty EXPR removes it); --update saves it.
        auto f = filter::parse(*a.get("where"));
        if (!f) return fail(kName, kUsage, "--where: " + f.error().message);
        p.question.rows = filter::canonical_text(*f);
    }
    const std::string override_data = a.get_or("data", "");
    const std::string memo_path = a.get_or("memo", "");
    if (!memo_path.empty() && !memo_available())
        return fail(kName, kUsage, "this build has no PDF memo writer (built with FOLDLINE_BUILD_UI=OFF)");
    audit::RunOptions options;
    if (a.has("threads")) options.threads = static_cast<unsigned>(std::atoi(a.get("threads")->c_str()));

    {
        const std::string prefix = a.get_or("csv", "");
        const std::vector<std::string> inputs = {project_path, p.data.path, override_data};
        std::vector<std::string> outputs = {a.get_or("json", ""), memo_path};
        if (!prefix.empty())
            for (const char* suffix : {"-findings.csv", "-strata.csv", "-slope-findings.csv", "-slope-strata.csv"})
                outputs.push_back(prefix + suffix);
        for (const auto& out : outputs)
            if (auto msg = overwrites_input(out, inputs); !msg.empty()) return fail(kName, kUsage, msg);
    }
    auto run = audit::run_audit(p, override_data, options);
    if (!run) return fail(kName, run.error());
    // How the file was read, as `scan` says it: warnings, and which columns' numbers were read
    // with which decimal mark (an ambiguous column is named, never guessed).
    for (const auto& w : run->read_warnings) std::cerr << "foldline run: warning: " << w << "\n";
    for (const auto& n : run->numbers) std::cerr << "foldline run: column '" << n.column << "' " << n.describe() << "\n";
    const ScanResult& r = run->result;
    std::ostream& out = a.get_or("json", "") == "-" ? std::cerr : std::cout;

    out << "Re-ran " << project_path << " on " << run->info.path << " (" << static_cast<long long>(run->info.rows)
        << " rows, SHA-256 " << run->info.sha256.substr(0, 16) << "…)\n";
    if (!r.rows_filter.empty())
        out << "Rows to include: " << r.rows_filter << " (" << static_cast<long long>(run->table.rows) << " rows kept)\n";
    if (!run->data_change.empty()) out << "Warning: " << run->data_change << "\n";
    if (!run->diagram_problem.empty()) out << "Diagram not used for some findings: " << run->diagram_problem << "\n";
    if (p.question.kind == project::QuestionKind::Rate) {
        int counts[5] = {0, 0, 0, 0, 0};
        for (const auto& f : r.rate_findings) ++counts[rank(f.cls)];
        out << r.rate_findings.size() << " comparisons: " << counts[0] << " reversal, " << counts[1] << " explained, "
            << counts[2] << " masked, " << counts[3] << " heterogeneous, " << counts[4] << " stable (FDR " << r.alpha
            << ", seed " << r.seed << ")\n";
    }
    if (p.question.kind == project::QuestionKind::Mean) {
        int counts[5] = {0, 0, 0, 0, 0};
        for (const auto& f : r.mean_findings) ++counts[rank(f.cls)];
        out << "Mean of " << p.question.outcome << (r.log_outcome ? " (log scale)" : "") << ": "
            << r.mean_findings.size() << " comparisons: " << counts[0] << " reversal, " << counts[1] << " explained, "
            << counts[2] << " masked, " << counts[3] << " heterogeneous, " << counts[4] << " stable (FDR " << r.alpha
            << ")\n";
    }
    if (!r.slope_question.x.empty()) {
        int counts[5] = {0, 0, 0, 0, 0};
        for (const auto& f : r.slope_findings) ++counts[rank(f.cls)];
        out << "Slope of " << r.slope_question.y << " on " << r.slope_question.x << ": " << r.slope_findings.size()
            << " checks: " << counts[0] << " reversal, " << counts[1] << " explained, " << counts[2] << " masked, "
            << counts[3] << " heterogeneous, " << counts[4] << " stable (FDR " << r.alpha << ", seed " << r.seed
            << ")\n";
    }

    const auto changes = audit::class_changes(p, r);
    if (changes.empty()) {
        out << "Classes: as saved in the project.\n";
    } else {
        out << "Classes that differ from the saved ones (" << changes.size() << "):\n";
        for (const auto& c : changes)
            out << "  " << project::describe(c.key) << ": " << class_or(c.before, "(not saved)") << " -> "
                << class_or(c.after, "(no longer produced)") << "\n";
    }

    if (a.has("json")) {
        const std::string dest = *a.get("json");
        const std::string text = scan_json_text(r, run->info);
        if (dest == "-") std::cout << text;
        else if (auto st = write_file_atomically(dest, text); !st) return fail(kName, kInput, st.error().to_string());
        else out << "JSON: " << dest << "\n";
    }
    if (a.has("csv")) {
        const std::string prefix = *a.get("csv");
        if (auto st = report::write_csv_exports(r, &p, prefix); !st) return fail(kName, kInput, st.error().to_string());
        const auto files = report::csv_export_paths(r, prefix);
        out << "CSV:";
        for (std::size_t i = 0; i < files.size(); ++i) out << (i ? ", " : " ") << files[i];
        out << "\n";
    }
    if (!memo_path.empty()) {
        if (int rc = write_memo(kName, r, run->info, &p, run->data_change, memo_path, &run->table);
            rc != kOk)
            return rc;
        out << "Memo: " << memo_path << "\n";
    }
    if (a.flag("update", false)) {
        if (!override_data.empty()) p.data.path = override_data;
        if (auto st = project::record_data(p.data, run->table); !st) return fail(kName, kInput, st.error().to_string());
        p.data.rows = static_cast<std::uint64_t>(run->info.rows);  // rows read, not the rows the filter kept
        audit::record_classes(p, r);
        if (auto st = project::save_project(p, project_path); !st) return fail(kName, kInput, st.error().to_string());
        out << "Project updated: " << project_path << "\n";
    }
    out << "A statistical screen, not a legal or clinical determination: read it with local law, counsel and "
           "licensed practice.\n";
    return changes.empty() ? kOk : kClassChanged;
}

const CommandRegistration reg{Command{
    .name = "run",
    .synopsis = "run PROJECT [--data NEWFILE] [--where EXPR] [--json FILE|-] [--memo FILE.pdf] [--csv PREFIX] [--update]",
    .summary = "re-run a saved audit (same question, settings, seed, diagram); exit 4 when a finding's class changed",
    .help = "Usage: foldline run PROJECT.foldline [--data NEWFILE] [--where EXPR] [--json FILE|-] [--memo FILE.pdf]\n"
            "  [--csv PREFIX] [--threads N] [--update]\n"
            "Re-runs the saved audit with its question, settings, seed and diagram (rate or trend audits).\n"
            "  --data    a new extract with the same columns (the quarterly re-audit)\n"
            "  --where   rows to include for this run, replacing the saved filter ('' removes it; docs/filter.md)\n"
            "  --update  record the new classes and the data's size, digest, rows and columns in the project\n"
            "Exit codes: 0 done (no class changed), 4 a finding's class differs from the saved one,\n"
            "            2 usage error, 3 input error, 1 internal error.\n",
    .run = run,
}};

}  // namespace
}  // namespace foldline::cli
