#include "app/cli/outputs.h"

#include <filesystem>

#include "app/cli/command.h"
#include "core/audit/memo_input.h"
#include "core/report/csv_export.h"
#include "core/report/memo_content.h"

#ifdef FOLDLINE_HAVE_UI
#include "ui/memo/memo_writer.h"
#endif

namespace foldline::cli {

int exit_code(const Error& e) {
    switch (e.kind) {
        case ErrorKind::Input: return kInput;
        case ErrorKind::Usage: return kUsage;
        case ErrorKind::Internal: return kInternal;
    }
    return kInternal;
}

int fail(const std::string& command, const Error& e) { return fail(command, exit_code(e), e.to_string()); }

std::string overwrites_input(const std::string& output, const std::vector<std::string>& inputs) {
    if (output.empty() || output == "-") return {};
    namespace fs = std::filesystem;
    for (const auto& in : inputs) {
        std::error_code ec;
        if (!in.empty() && fs::exists(output, ec) && fs::equivalent(output, in, ec))
            return "refusing to write " + output + ": it is an input of this audit (" + in + ")";
    }
    return {};
}

int write_shared_outputs(const std::string& command, const ScanResult& result, const DataInfo& info,
                         const std::string& memo_path, const std::string& csv_prefix, const Table* table,
                         const std::string& memo_detail) {
    std::vector<std::string> outputs = {memo_path};
    if (!csv_prefix.empty())
        for (const auto& f : report::csv_export_paths(result, csv_prefix)) outputs.push_back(f);
    for (const auto& out : outputs)
        if (auto msg = overwrites_input(out, {info.path}); !msg.empty()) return fail(command, kUsage, msg);
    if (!csv_prefix.empty()) {
        if (auto st = report::write_csv_exports(result, nullptr, csv_prefix); !st)
            return fail(command, kInput, st.error().to_string());
    }
    if (!memo_path.empty()) return write_memo(command, result, info, nullptr, {}, memo_path, table, memo_detail);
    return kOk;
}

std::string memo_detail_problem(const std::string& value) {
    if (value == "families" || value == "full") return {};
    return "--memo-detail: expected families (one section per family of findings) or full (one section per "
           "finding), got '" + value + "'";
}

bool memo_available() {
#ifdef FOLDLINE_HAVE_UI
    return true;
#else
    return false;
#endif
}

int write_memo(const std::string& command, const ScanResult& result, const DataInfo& info, const project::Project* p,
               const std::string& data_change, const std::string& out_path, const Table* table,
               const std::string& detail) {
#ifdef FOLDLINE_HAVE_UI
    auto in = audit::memo_input(result, info, p, table, audit::today(), data_change);
    in.detail = detail;
    const auto content = report::build_memo(in);
    if (auto st = ui::write_memo_pdf(content, out_path); !st) return fail(command, kInput, st.error().to_string());
    return kOk;
#else
    (void)result, (void)info, (void)p, (void)data_change, (void)out_path, (void)table, (void)detail;
    return fail(command, kUsage,
                "this build has no PDF memo writer (built with FOLDLINE_BUILD_UI=OFF); rebuild with the Qt "
                "workbench to write memos");
#endif
}

}  // namespace foldline::cli
