#include "app/cli/audit_run.h"

#include <algorithm>
#include <chrono>
#include <filesystem>
#include <cstdlib>
#include <ctime>
#include <map>
#include <thread>

#include "app/cli/command.h"
#include "core/causal/diagram.h"
#include "core/common/sha256.h"
#include "core/io/csv_reader.h"
#include "core/report/csv_export.h"
#include "core/report/memo_content.h"
#include "core/report/verdict_json.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"
#include "core/scan/slope_scan.h"

#ifdef FOLDLINE_HAVE_UI
#include "ui/memo/memo_writer.h"
#endif

namespace foldline::cli {

Result<AuditRun> run_audit(const project::Project& p, const std::string& data_override, unsigned threads,
                           int& exit_code) {
    exit_code = kInput;
    AuditRun run;
    const std::string path = data_override.empty() ? p.data.path : data_override;
    if (path.empty()) return make_error("the project names no data file");
    if (data_override.empty()) {
        auto change = project::check_data_file(p.data);
        if (change.missing) return make_error(change.message);
        if (change.changed) run.data_change = change.message;
    }
    Result<std::string> digest = std::string();
    std::thread hasher([&] { digest = sha256_file(path); });
    CsvOptions ropt = project::reading_options(p.data);
    ropt.threads = threads;
    auto table = read_csv(path, ropt);
    hasher.join();
    if (!table) return table.error();
    if (!digest) return digest.error();
    run.table = std::move(*table);

    CandidateOptions copt;
    copt.columns = p.scan.strata;
    copt.bins = p.scan.bins;
    copt.max_levels = static_cast<std::size_t>(p.scan.max_levels);
    copt.threads = threads;
    SlopeQuestion sq;
    sq.alpha = p.scan.alpha;
    sq.bootstrap = p.scan.slope_bootstrap;
    sq.seed = p.scan.seed;
    sq.threads = threads;
    if (p.question.kind == project::QuestionKind::Slope) {
        sq.x = p.question.exposure;
        sq.y = p.question.outcome;
        sq.covariates = p.question.covariates;
        auto result = slope_audit(run.table, sq, copt, p.scan.pairs, exit_code);
        if (!result) return result.error();
        run.result = std::move(*result);
        run.result.bootstrap = p.scan.bootstrap;
    } else {
        QuestionSpec spec;
        spec.outcome = p.question.outcome;
        spec.positive = p.question.positive;
        spec.exposure = p.question.exposure;
        spec.focal = p.question.focal;
        spec.reference = p.question.reference;
        exit_code = kUsage;
        auto q = resolve_question(run.table, spec);
        if (!q) return q.error();
        auto cands = select_candidates(run.table, {spec.outcome, spec.exposure}, copt, run.table.column(spec.exposure));
        if (!cands) return cands.error();
        exit_code = kInput;
        if (cands->candidates.empty()) return make_error("no column qualifies as a stratifier", path);
        std::vector<SlopeFinding> trend;
        if (p.trend) {
            sq.x = p.trend->x;
            sq.y = p.trend->y;
            sq.covariates = p.trend->covariates;
            auto checks = trend_checks(run.table, sq, *cands, exit_code);
            if (!checks) return checks.error();
            trend = std::move(*checks);
        }
        RateScanOptions sopt;
        sopt.pairs = p.scan.pairs;
        sopt.alpha = p.scan.alpha;
        sopt.bootstrap = p.scan.bootstrap;
        sopt.seed = p.scan.seed;
        sopt.threads = threads;
        auto result = rate_scan(run.table, *q, *cands, sopt, {}, {}, std::move(trend));
        exit_code = kInternal;
        if (!result) return result.error();
        run.result = std::move(*result);
        if (p.trend) run.result.slope_question = sq;
    }
    run.info = DataInfo{path, *digest, static_cast<double>(run.table.rows)};
    if (const auto* d = p.diagram()) run.verdicts = attach_verdicts(run.result, run.table, *d, run.diagram_problem);
    exit_code = kOk;
    return run;
}

namespace {

// The trend columns must exist and be numeric; a usage error names the one that is not.
Status check_slope_columns(const Table& table, const SlopeQuestion& q) {
    auto check = [&](const std::string& name, const char* role) -> Status {
        const Column* c = table.column(name);
        if (!c) return make_error(std::string(role) + " column '" + name + "' not found in the data");
        if (!c->is_numeric()) return make_error(std::string(role) + " column '" + name + "' is not numeric");
        return Ok{};
    };
    if (auto st = check(q.x, "exposure (x)"); !st) return st;
    if (auto st = check(q.y, "outcome (y)"); !st) return st;
    for (const auto& c : q.covariates)
        if (auto st = check(c, "covariate"); !st) return st;
    return Ok{};
}

std::vector<std::string> slope_columns(const SlopeQuestion& q) {
    std::vector<std::string> cols = {q.x, q.y};
    cols.insert(cols.end(), q.covariates.begin(), q.covariates.end());
    return cols;
}

}  // namespace

Result<ScanResult> slope_audit(const Table& table, const SlopeQuestion& q, const CandidateOptions& options,
                               bool pairs, int& exit_code) {
    exit_code = kUsage;
    if (auto st = check_slope_columns(table, q); !st) return st.error();
    const auto skip = slope_columns(q);
    auto cands = select_candidates(table, skip, options, nullptr);
    if (!cands) return cands.error();
    std::vector<const Column*> cols;
    for (const auto& c : cands->candidates) cols.push_back(c.column);
    exit_code = kInput;
    auto slopes = scan_slopes(table, q, cols, pairs);
    if (!slopes) return slopes.error();
    ScanResult r;
    r.slope_question = q;
    r.excluded = cands->excluded;
    for (const auto& c : cands->candidates) {
        r.candidates.push_back(c.name);
        r.candidate_origin.push_back(c.origin);
    }
    r.rows = table.total_weight();
    r.alpha = q.alpha;
    r.seed = q.seed;
    r.slope_findings = std::move(*slopes);
    apply_fdr(r);
    rank_findings(r);
    exit_code = kOk;
    return r;
}

Result<std::vector<SlopeFinding>> trend_checks(const Table& table, const SlopeQuestion& q,
                                               const CandidateSet& candidates, int& exit_code) {
    exit_code = kUsage;
    if (auto st = check_slope_columns(table, q); !st) return st.error();
    const auto skip = slope_columns(q);
    std::vector<const Column*> cols;
    for (const auto& c : candidates.candidates)
        if (std::find(skip.begin(), skip.end(), c.name) == skip.end()) cols.push_back(c.column);
    exit_code = kInput;
    auto slopes = scan_slopes(table, q, cols, false);
    if (!slopes) return slopes.error();
    exit_code = kOk;
    return slopes;
}

std::vector<std::optional<causal::Verdict>> attach_verdicts(ScanResult& result, const Table& table,
                                                            const causal::Diagram& diagram, std::string& problem) {
    std::vector<std::optional<causal::Verdict>> out;
    if (diagram.nodes.empty()) return out;
    auto cg = causal::CausalGraph::build(diagram);
    if (!cg) {
        problem = cg.error().message;
        return out;
    }
    const auto& q = result.question;
    const RowCells rows = q.outcome.empty() ? RowCells{} : encode_rows(table, q);
    out.resize(result.rate_findings.size());
    for (std::size_t i = 0; i < result.rate_findings.size(); ++i) {
        auto& f = result.rate_findings[i];
        auto v = causal::decide(*cg, q.exposure, q.outcome, f.strata);
        if (!v) {
            if (problem.empty()) problem = v.error().message;
            continue;
        }
        f.verdict = std::string(causal::to_string(v->answer));
        f.verdict_detail = report::rate_verdict_json(table, rows, f, *v, result.alpha).dump();
        out[i] = std::move(*v);
    }
    for (auto& f : result.slope_findings) {
        auto v = causal::decide(*cg, f.x, f.y, f.strata);
        if (!v) {
            if (problem.empty()) problem = v.error().message;
            continue;
        }
        f.verdict_detail = report::slope_verdict_json(table, result.slope_question, f, *v).dump();
    }
    return out;
}

std::vector<ClassChange> class_changes(const project::Project& p, const ScanResult& result) {
    std::vector<ClassChange> changes;
    bool any_saved = false;
    for (const auto& r : p.reviews) any_saved = any_saved || r.saved_class.has_value();
    if (!any_saved) return changes;
    std::map<project::FindingKey, FindingClass> now;
    for (const auto& f : result.rate_findings) now[project::rate_key(f.strata, f.focal, f.reference)] = f.cls;
    for (const auto& f : result.slope_findings) now[project::slope_key(f.strata, f.x, f.y)] = f.finding_class;
    for (const auto& r : p.reviews) {
        if (!r.saved_class) continue;
        auto it = now.find(r.key);
        if (it == now.end()) changes.push_back({r.key, r.saved_class, std::nullopt});
        else if (it->second != *r.saved_class) changes.push_back({r.key, r.saved_class, it->second});
    }
    for (const auto& [key, cls] : now) {
        const auto* r = p.review(key);
        if (cls != FindingClass::Stable && (!r || !r->saved_class)) changes.push_back({key, std::nullopt, cls});
    }
    return changes;
}

void record_classes(project::Project& p, const ScanResult& result) {
    for (const auto& f : result.rate_findings) p.review_for(project::rate_key(f.strata, f.focal, f.reference)).saved_class = f.cls;
    for (const auto& f : result.slope_findings)
        p.review_for(project::slope_key(f.strata, f.x, f.y)).saved_class = f.finding_class;
}

std::string today() {
    std::time_t t = std::time(nullptr);
    if (const char* epoch = std::getenv("SOURCE_DATE_EPOCH"); epoch && *epoch) t = static_cast<std::time_t>(std::atoll(epoch));
    std::tm tm{};
    gmtime_r(&t, &tm);
    char buf[16];
    std::strftime(buf, sizeof buf, "%Y-%m-%d", &tm);
    return buf;
}

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
                         const std::string& memo_path, const std::string& csv_prefix, const Table* table) {
    std::vector<std::string> outputs = {memo_path};
    if (!csv_prefix.empty())
        for (const auto& f : report::csv_export_paths(result, csv_prefix)) outputs.push_back(f);
    for (const auto& out : outputs)
        if (auto msg = overwrites_input(out, {info.path}); !msg.empty()) return fail(command, kUsage, msg);
    if (!csv_prefix.empty()) {
        if (auto st = report::write_csv_exports(result, nullptr, csv_prefix); !st)
            return fail(command, kInput, st.error().to_string());
    }
    if (!memo_path.empty()) return write_memo(command, result, info, nullptr, {}, {}, memo_path, table);
    return kOk;
}

bool memo_available() {
#ifdef FOLDLINE_HAVE_UI
    return true;
#else
    return false;
#endif
}

int write_memo(const std::string& command, const ScanResult& result, const DataInfo& info, const project::Project* p,
               const std::vector<std::optional<causal::Verdict>>& verdicts, const std::string& data_change,
               const std::string& out_path, const Table* table) {
#ifdef FOLDLINE_HAVE_UI
    report::MemoInput in;
    in.scan = &result;
    in.data = info;
    in.project = p;
    in.verdicts = verdicts;
    in.date = today();
    in.data_change = data_change;
    in.table = table;
    const auto content = report::build_memo(in);
    if (auto st = ui::write_memo_pdf(content, out_path); !st) return fail(command, kInput, st.error().to_string());
    return kOk;
#else
    (void)result, (void)info, (void)p, (void)verdicts, (void)data_change, (void)out_path, (void)table;
    return fail(command, kUsage,
                "this build has no PDF memo writer (built with FOLDLINE_BUILD_UI=OFF); rebuild with the Qt "
                "workbench to write memos");
#endif
}

}  // namespace foldline::cli
