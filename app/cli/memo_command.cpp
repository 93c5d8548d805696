// foldline memo PROJECT [--out FILE.pdf] [--data FILE]: re-runs the saved audit and writes its
// PDF memo (with the reviewer's decisions and notes). Needs the Qt build; the Qt application is
// created inside the memo writer only (offscreen), so no display is needed.
#include <filesystem>
#include <iostream>

#include "app/cli/args.h"
#include "app/cli/command.h"
#include "app/cli/outputs.h"
#include "core/audit/run_audit.h"

namespace foldline::cli {
namespace {

const char* kName = "memo";

int run(int argc, char** argv) {
    const std::vector<OptionSpec> specs = {
        {"out", true, "FILE.pdf"}, {"data", true, "FILE"}, {"threads", true, "N"},
        {"memo-detail", true, "families|full"}};
    Args a;
    if (auto err = Args::parse(argc, argv, 1, specs, a)) return fail(kName, kUsage, *err);
    if (a.positional().size() != 1) return fail(kName, kUsage, "expected one PROJECT file (NAME.foldline)");
    if (!memo_available())
        return fail(kName, kUsage, "this build has no PDF memo writer (built with FOLDLINE_BUILD_UI=OFF)");
    const std::string project_path = a.positional()[0];
    std::string out = a.get_or("out", "");
    if (out.empty()) out = std::filesystem::path(project_path).replace_extension(".pdf").string();
    if (a.has("memo-detail"))
        if (auto msg = memo_detail_problem(*a.get("memo-detail")); !msg.empty()) return fail(kName, kUsage, msg);
    auto loaded = project::load_project(project_path);
    if (!loaded) return fail(kName, kInput, loaded.error().to_string());
    if (a.has("memo-detail")) loaded->memo.detail = *a.get("memo-detail");  // this memo only; the file is not written
    if (auto msg = overwrites_input(out, {project_path, loaded->data.path, a.get_or("data", "")}); !msg.empty())
        return fail(kName, kUsage, msg);
    audit::RunOptions options;
    if (a.has("threads")) options.threads = static_cast<unsigned>(std::atoi(a.get("threads")->c_str()));
    auto run = audit::run_audit(*loaded, a.get_or("data", ""), options);
    if (!run) return fail(kName, run.error());
    if (!run->data_change.empty()) std::cerr << "foldline memo: warning: " << run->data_change << "\n";
    if (int rc = write_memo(kName, run->result, run->info, &*loaded, run->data_change, out, &run->table);
        rc != kOk)
        return rc;
    std::cout << "Memo: " << out << "\n";
    return kOk;
}

const CommandRegistration reg{Command{
    .name = "memo",
    .synopsis = "memo PROJECT [--out FILE.pdf] [--data FILE] [--memo-detail families|full]",
    .summary = "write the PDF memo of a saved audit (needs the Qt build)",
    .help = "Usage: foldline memo PROJECT.foldline [--out FILE.pdf] [--data FILE] [--threads N]\n"
            "  [--memo-detail families|full]\n"
            "Writes the audit's PDF memo (default: the project's name with .pdf, beside it).\n"
            "  --out      the PDF to write\n"
            "  --memo-detail  one section per family of findings, or one per finding (default: the\n"
            "             project's memo.detail)\n"
            "  --data     re-run the audit on a new extract with the same columns\n"
            "  --threads  parser and scan threads (default 2)\n"
            "Exit codes: 0 done, 2 usage error (also: a build without the memo writer), 3 input error,\n"
            "            1 internal error.\n",
    .run = run,
}};

}  // namespace
}  // namespace foldline::cli
