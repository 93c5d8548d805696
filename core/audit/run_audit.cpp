#include "core/audit/run_audit.h"

#include <algorithm>
#include <thread>

#include "core/audit/mean_audit.h"
#include "core/audit/diagram_checks.h"
#include "core/audit/project_file.h"
#include "core/common/sha256.h"
#include "core/io/csv_reader.h"
#include "core/io/table_reader.h"
#include "core/scan/candidates.h"
#include "core/scan/grouped_cubes.h"
#include "core/scan/grouped_slopes.h"
#include "core/scan/question.h"
#include "core/scan/slope_scan.h"
#include "core/causal/combined_exposure.h"
#include "core/table/combined_column.h"

namespace foldline::audit {
namespace {

CandidateOptions candidate_options(const AuditSpec& spec, unsigned threads) {
    CandidateOptions o;
    o.threads = threads;
    o.columns = spec.scan.strata;
    o.bins = spec.scan.bins;
    o.max_levels = static_cast<std::size_t>(spec.scan.max_levels);
    return o;
}

RateScanOptions rate_options(const AuditSpec& spec, unsigned threads) {
    RateScanOptions o;
    o.pairs = spec.scan.pairs;
    o.alpha = spec.scan.alpha;
    o.bootstrap = spec.scan.bootstrap;
    o.seed = spec.scan.seed;
    o.threads = threads;
    return o;
}

QuestionSpec question_spec(const AuditSpec& spec) {
    QuestionSpec q;
    q.outcome = spec.question.outcome;
    q.positive = spec.question.positive;
    q.exposure = spec.question.exposure;
    q.focal = spec.question.focal;
    q.reference = spec.question.reference;
    return q;
}

/// The trend a spec asks for: the slope question itself, or the trend checks beside a rate
/// question; x empty when neither.
SlopeQuestion slope_question(const AuditSpec& spec, unsigned threads) {
    SlopeQuestion q;
    q.threads = threads;
    q.alpha = spec.scan.alpha;
    q.bootstrap = spec.scan.slope_bootstrap;
    q.seed = spec.scan.seed;
    if (spec.question.kind == project::QuestionKind::Slope) {
        q.x = spec.question.exposure;
        q.y = spec.question.outcome;
        q.covariates = spec.question.covariates;
    } else if (spec.trend) {
        q.x = spec.trend->x;
        q.y = spec.trend->y;
        q.covariates = spec.trend->covariates;
    }
    return q;
}

// The trend columns must exist and be numeric, and a covariate must be another column than x,
// y and the named stratifiers; a usage error names the one that is not.
Status check_slope_columns(const Table& table, const SlopeQuestion& q, const std::vector<std::string>& strata,
                           bool trend_checks) {
    auto check = [&](const std::string& name, const std::string& role) -> Status {
        const Column* c = table.column(name);
        if (!c) return usage_error(make_error(role + " column '" + name + "' not found in the data"));
        if (!c->is_numeric()) return usage_error(make_error(role + " column '" + name + "' is not numeric"));
        return Ok{};
    };
    if (auto st = check(q.x, trend_checks ? "trend x" : "exposure (x)"); !st) return st;
    if (auto st = check(q.y, trend_checks ? "trend y" : "outcome (y)"); !st) return st;
    for (std::size_t i = 0; i < q.covariates.size(); ++i) {
        const std::string& c = q.covariates[i];
        if (c == q.x || c == q.y)
            return usage_error(make_error("covariate '" + c + "' is the trend's " +
                                          (c == q.x ? "exposure (x)" : "outcome (y)") +
                                          "; a covariate must be another column"));
        if (std::count(q.covariates.begin(), q.covariates.end(), c) > 1)
            return usage_error(make_error("covariate '" + c + "' is named twice"));
        if (std::find(strata.begin(), strata.end(), c) != strata.end())
            return usage_error(make_error("column '" + c + "' is both a stratifier and a covariate: a column either "
                                          "stratifies the trend or adjusts it"));
        if (auto st = check(c, "covariate"); !st) return st;
    }
    return Ok{};
}

std::vector<std::string> slope_columns(const SlopeQuestion& q) {
    std::vector<std::string> cols = {q.x, q.y};
    cols.insert(cols.end(), q.covariates.begin(), q.covariates.end());
    return cols;
}

Status check_spec(const AuditSpec& spec) {
    const auto problems = settings_problems(spec.scan);
    if (!problems.empty()) return usage_error(make_error(problems.front()));
    return Ok{};
}

/// The result's record of the filter its rows passed.
void note_filter(ScanResult& r, const Table& scanned) {
    r.rows_filter = scanned.filter;
    if (!scanned.filter.empty()) r.rows_kept = static_cast<double>(scanned.rows);
}

void fill_candidates(ScanResult& r, const CandidateSet& cands) {
    r.excluded = cands.excluded;
    r.candidates.clear();
    r.candidate_origin.clear();
    for (const auto& c : cands.candidates) {
        r.candidates.push_back(c.name);
        r.candidate_origin.push_back(c.origin);
    }
}

Result<ScanResult> scan_slopes_only(const Table& table, const AuditSpec& spec, const RunOptions& opt) {
    const SlopeQuestion sq = slope_question(spec, opt.threads);
    if (auto st = check_slope_columns(table, sq, spec.scan.strata, false); !st) return st.error();
    auto cands = select_candidates(table, slope_columns(sq), candidate_options(spec, opt.threads), nullptr);
    if (!cands) return usage_error(cands.error());
    ScanResult r;
    r.slope_question = sq;
    fill_candidates(r, *cands);
    r.rows = table.total_weight();
    r.alpha = sq.alpha;
    r.bootstrap = spec.scan.bootstrap;
    r.seed = sq.seed;
    auto slopes = scan_slopes(table, sq, *cands, spec.scan.pairs, opt.work);
    if (!slopes) {
        if (opt.work.cancelled()) {
            r.cancelled = true;
            return r;
        }
        return slopes.error();
    }
    r.slope_findings = std::move(*slopes);
    apply_fdr(r);
    rank_findings(r);
    if (spec.scan.find_groups) {
        auto latent = find_groups(table, sq, sq.seed, opt.work);
        if (latent) {
            r.latent = std::move(*latent);
        } else if (opt.work.cancelled()) {
            r.cancelled = true;
        } else {
            // The hint could not be fitted (too few rows, say): the scan's findings stand, and the
            // hint says why it is missing.
            LatentFinding none;
            none.x = sq.x;
            none.y = sq.y;
            none.seed = sq.seed;
            none.note = "no hidden-group hint: " + latent.error().message + ".";
            r.latent = std::move(none);
        }
    }
    return r;
}

Result<ScanResult> scan_rates(const Table& table, const AuditSpec& spec, const RunOptions& opt) {
    const QuestionSpec qs = question_spec(spec);
    auto q = resolve_question(table, qs);
    if (!q) return usage_error(q.error());
    const std::vector<std::string> parts = combined_groups(table, spec);
    std::vector<std::string> skip = {qs.outcome, qs.exposure};
    skip.insert(skip.end(), parts.begin(), parts.end());
    auto cands = select_candidates(table, skip, candidate_options(spec, opt.threads), table.column(qs.exposure));
    if (!cands) return usage_error(cands.error());
    if (cands->candidates.empty()) return make_error("no column qualifies as a stratifier (see the strata setting)", table.source);
    const SlopeQuestion sq = slope_question(spec, opt.threads);
    std::vector<SlopeFinding> trend;
    if (!sq.x.empty()) {
        if (auto st = check_slope_columns(table, sq, spec.scan.strata, true); !st) return st.error();
        const auto skip = slope_columns(sq);
        std::vector<const Column*> cols;
        for (const auto& c : cands->candidates)
            if (std::find(skip.begin(), skip.end(), c.name) == skip.end()) cols.push_back(c.column);
        auto checks = scan_slopes(table, sq, cols, false, opt.work);
        if (!checks) {
            if (opt.work.cancelled()) {
                ScanResult r;
                r.cancelled = true;
                return r;
            }
            return checks.error();
        }
        trend = std::move(*checks);
    }
    auto r = rate_scan(table, *q, *cands, rate_options(spec, opt.threads), opt.work, opt.on_rate_finding, std::move(trend));
    if (!r) return internal_error(r.error());
    if (!sq.x.empty()) r->slope_question = sq;
    for (const auto& p : parts) r->excluded.push_back({p, "part of the compared groups " + qs.exposure});
    return r;
}

}  // namespace

project::QuestionKind infer_kind(const Table& table, const project::QuestionSettings& question, std::size_t max_levels) {
    const Column* oc = table.column(question.outcome);
    const Column* ec = table.column(question.exposure);
    const bool slope = oc && ec && oc->is_numeric() && ec->is_numeric() && !question.positive &&
                       ec->distinct_count() > max_levels;
    return slope ? project::QuestionKind::Slope : project::QuestionKind::Rate;
}

EstimateSettings estimate_settings(const AuditSpec& spec) {
    return {spec.scan.bins, static_cast<std::size_t>(spec.scan.max_levels), spec.scan.alpha};
}

Result<filter::RowFilter> rows_filter(const AuditSpec& spec) { return filter::parse(spec.question.rows); }

std::vector<std::string> combined_groups(const Table& table, const AuditSpec& spec) {
    if (spec.question.kind != project::QuestionKind::Rate) return {};
    // A column of that name read from the data is that column; one added by add_combined_groups
    // still says by its name which columns it combines.
    if (table.column(spec.question.exposure) && table.combined != spec.question.exposure) return {};
    std::vector<std::string> others;
    for (const auto& c : table.columns)
        if (c.name != spec.question.exposure) others.push_back(c.name);
    return combined_parts(others, spec.question.exposure);
}

Status add_combined_groups(Table& table, const AuditSpec& spec) {
    if (table.column(spec.question.exposure)) return Ok{};
    const auto parts = combined_groups(table, spec);
    if (parts.empty()) return Ok{};
    auto c = combine_columns(table, parts, spec.question.exposure);
    if (!c) return c.error();
    table.columns.push_back(std::move(*c));
    table.combined = spec.question.exposure;
    return Ok{};
}

Result<Table> filter_rows(const Table& table, const AuditSpec& spec) {
    auto f = rows_filter(spec);
    if (!f) return f.error();
    auto kept = filter::apply(*f, table);
    if (!kept) return kept.error();
    if (!f->empty() && kept->rows == 0)
        return make_error("the rows filter " + filter::canonical_text(*f) + " keeps none of the " +
                              std::to_string(table.rows) + " rows",
                          table.source);
    return kept;
}

Result<ScanResult> scan_table(const Table& table, const AuditSpec& spec, const RunOptions& options) {
    if (auto st = check_spec(spec); !st) return st.error();
    auto f = rows_filter(spec);
    if (!f) return f.error();
    const std::string wanted = filter::canonical_text(*f);
    std::optional<Table> kept;
    if (table.filter != wanted) {
        if (!table.filter.empty())
            return internal_error(make_error("rows filtered by '" + table.filter + "' cannot be scanned with the filter '" +
                                             wanted + "'"));
        auto k = filter_rows(table, spec);
        if (!k) return k.error();
        kept = std::move(*k);
    }
    if (!table.column(spec.question.exposure) && !combined_groups(table, spec).empty()) {
        if (!kept) kept = table;
        if (auto st = add_combined_groups(*kept, spec); !st) return usage_error(st.error());
    }
    const Table& rows = kept ? *kept : table;
    auto r = spec.question.kind == project::QuestionKind::Slope  ? scan_slopes_only(rows, spec, options)
             : spec.question.kind == project::QuestionKind::Mean ? scan_mean_question(rows, spec, options.threads, options.work)
                                                                 : scan_rates(rows, spec, options);
    if (!r) return r;
    note_filter(*r, rows);
    if (const causal::Diagram* d = spec.diagram()) {
        const auto parts = combined_groups(rows, spec);
        const causal::Diagram judged = parts.empty() ? *d : causal::combine_exposure(*d, parts, spec.question.exposure);
        attach_verdicts(*r, &rows, judged, estimate_settings(spec));
        // The claims the diagram makes, tested on the same rows (an invalid diagram has none;
        // attach_verdicts already says why).
        if (auto checks = check_diagram(judged, rows, estimate_settings(spec), options.work))
            r->diagram_checks = std::move(*checks);
    }
    return r;
}

Result<ScanResult> scan_groups(const GroupedCounts& counts, const std::optional<GroupedMoments>& moments,
                               const AuditSpec& spec, const RunOptions& options) {
    if (auto st = check_spec(spec); !st) return st.error();
    if (spec.question.kind == project::QuestionKind::Slope)
        return usage_error(make_error("a trend question needs the rows, not counts"));
    if (spec.question.kind == project::QuestionKind::Mean) return usage_error(make_error(kMeanNeedsRows));
    // The counts come from an engine that applied the filter as a WHERE condition
    // (core/audit/database_source.h); only its text is recorded here.
    auto f = rows_filter(spec);
    if (!f) return f.error();
    auto in = cubes_from_groups(counts, question_spec(spec), candidate_options(spec, options.threads), spec.scan.pairs);
    if (!in) return usage_error(in.error());
    if (in->cubes.stratifiers.empty()) return make_error("no column qualifies as a stratifier (see the strata setting)");
    const SlopeQuestion sq = slope_question(spec, options.threads);
    std::vector<SlopeFinding> slopes;
    if (moments && !sq.x.empty()) {
        auto s = slope_checks_from_groups(*moments, counts, *in, sq);
        if (!s) return s.error();
        slopes = std::move(*s);
    }
    auto r = rate_scan(in->cubes, in->question, rate_options(spec, options.threads), options.work, options.on_rate_finding, std::move(slopes));
    if (!r) return internal_error(r.error());
    if (!sq.x.empty()) r->slope_question = sq;
    r->rows_filter = filter::canonical_text(*f);
    return r;
}

Result<AuditRun> run_audit(const AuditSpec& spec, const std::string& data_override, const RunOptions& options) {
    AuditRun run;
    const std::string path = data_override.empty() ? spec.data.path : data_override;
    if (path.empty()) return make_error("the project names no data file");
    if (data_override.empty()) {
        auto change = project::check_data_file(spec.data);
        if (change.missing) return make_error(change.message);
        if (change.changed) run.data_change = change.message;
    }
    Result<std::string> digest = std::string();
    std::thread hasher([&] { digest = sha256_file(path); });
    ReadOptions ropt = project::reading_options(spec.data);
    ropt.threads = options.threads;
    ReadReport read;
    auto table = read_table(path, ropt, &read, options.work);
    hasher.join();
    if (!table) return table.error();
    if (!digest) return digest.error();
    run.read_warnings = read.warnings;
    run.numbers = read.numbers;
    const double rows_read = static_cast<double>(table->rows);
    if (spec.question.rows.empty()) {
        run.table = std::move(*table);
    } else {
        auto kept = filter_rows(*table, spec);
        if (!kept) return kept.error();
        run.table = std::move(*kept);
    }
    if (auto st = add_combined_groups(run.table, spec); !st) return usage_error(st.error());
    auto result = scan_table(run.table, spec, options);
    if (!result) return result.error();
    run.result = std::move(*result);
    run.info = DataInfo{path, *digest, rows_read};
    if (read.format != FileFormat::Csv) run.info.format = std::string(format_key(read.format));
    run.info.sheet = ropt.sheet;
    for (const auto& f : run.result.rate_findings)
        if (run.diagram_problem.empty()) run.diagram_problem = f.verdict_problem;
    for (const auto& f : run.result.slope_findings)
        if (run.diagram_problem.empty()) run.diagram_problem = f.verdict_problem;
    return run;
}

Status check_diagram_columns(const causal::Diagram& diagram, const Table& table, const std::string& source) {
    auto graph = causal::CausalGraph::build(diagram, source);
    if (!graph) return graph.error();
    std::vector<std::string> names;
    for (const auto& c : table.columns) names.push_back(c.name);
    return causal::check_columns(*graph, names, source);
}

}  // namespace foldline::audit
