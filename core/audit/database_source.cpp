#include "core/audit/database_source.h"

#include <algorithm>

#include "core/scan/question.h"
#include "core/table/row_filter.h"

#ifdef FOLDLINE_HAS_ODBC
#include "core/io/odbc_source.h"
#include "core/scan/grouped_cubes.h"
#endif

namespace foldline::audit {

#ifdef FOLDLINE_HAS_ODBC
namespace {

Result<OdbcOptions> odbc_options(const DatabaseRequest& r, const CandidateOptions& copt) {
    if (r.source.rfind("odbc:", 0) != 0)
        return make_error("--source must start with odbc: (for example odbc:DSN=warehouse;)");
    if (r.table.empty() == r.query.empty()) return make_error("with --source give exactly one of --table T or --query SQL");
    OdbcOptions o;
    o.connection = r.source;
    o.source.table = r.table;
    o.source.query = r.query;
    o.required = r.required;
    o.all_columns = r.all_columns;
    o.max_levels = copt.max_levels;
    o.max_missing_share = copt.max_missing_share;
    o.count_column = r.count_column;
    // The filter reaches the engine as a condition written from its parsed form (quoted names,
    // escaped literals), never as the text the user typed.
    auto f = filter::parse(r.where);
    if (!f) return f.error();
    o.source.where = filter::to_sql(*f);
    o.where_columns = filter::columns(*f);
    return o;
}

void describe(const DatabaseRequest& r, const OdbcSourceInfo& s, DatabaseInfo& d) {
    // Credentials never reach the description (a password in the string is masked).
    d.description = "odbc:" + redact_connection_string(r.source.substr(5)) +
                    (r.table.empty() ? " query: " + r.query : " table " + r.table);
    d.source_rows = s.source_rows;
    d.columns = s.source_columns;
    for (auto& l : s.left_out) d.left_out.push_back({l.column, l.reason});
    d.bytes_fetched = s.bytes_fetched;
    d.record.connection = redact_connection_string(r.source.substr(5));
    d.record.driver = s.driver;
    d.record.database = s.database;
    d.record.table = r.table;
    d.record.query = r.query;
    d.record.rows = s.source_rows;
    d.record.queried_at = s.queried_at;
}

}  // namespace
#endif

Result<DatabaseSource> load_database_source(const DatabaseRequest& request, const CandidateOptions& copt,
                                            const Work& work) {
#ifdef FOLDLINE_HAS_ODBC
    auto o = odbc_options(request, copt);
    if (!o) return o.error();
    auto r = read_odbc_cells(*o, work);
    if (!r) return r.error();
    DatabaseSource d;
    describe(request, *r, d);
    d.table = std::move(r->table);
    return d;
#else
    (void)request, (void)copt, (void)work;
    return make_error("this build has no database support (install unixodbc-dev and rebuild with -DFOLDLINE_ODBC=ON)");
#endif
}

Result<DatabaseCounts> load_database_counts(const DatabaseRequest& request, const CandidateOptions& copt,
                                            const QuestionSpec& spec, bool pairs, bool may_be_slopes,
                                            const std::string& trend_x, const std::string& trend_y,
                                            const Work& work) {
#ifdef FOLDLINE_HAS_ODBC
    auto o = odbc_options(request, copt);
    if (!o) return o.error();
    // The stratifiers the single sets qualify, each numeric one with the cuts of its levels.
    const PairPlanner planner = [&](const GroupedCounts& singles) -> Result<PairPlan> {
        auto in = cubes_from_groups(singles, spec, copt, false);
        if (!in) return in.error();
        PairPlan plan;
        for (std::size_t i = 0; i < in->cubes.stratifiers.size(); ++i) {
            plan.strata.push_back(in->cubes.stratifiers[i].name);
            plan.cuts.push_back(bin_cuts(singles, *in, i));
        }
        return plan;
    };
    auto r = read_odbc_groups(*o, spec.outcome, spec.exposure, pairs, may_be_slopes, OdbcSlope{trend_x, trend_y}, work,
                              planner);
    if (!r) return r.error();
    DatabaseCounts d;
    describe(request, *r, d);
    d.counts = std::move(r->counts);
    d.numeric_question = r->numeric_question;
    d.moments = std::move(r->moments);
    return d;
#else
    (void)request, (void)copt, (void)spec, (void)pairs, (void)may_be_slopes, (void)trend_x,
        (void)trend_y, (void)work;
    return make_error("this build has no database support (install unixodbc-dev and rebuild with -DFOLDLINE_ODBC=ON)");
#endif
}

Result<DatabaseLoad> load_for_audit(DatabaseRequest request, const project::AuditSpec& spec,
                                    const std::vector<std::string>& extra, const Work& work) {
    auto need = [&](const std::string& c) {
        if (!c.empty() && std::find(request.required.begin(), request.required.end(), c) == request.required.end())
            request.required.push_back(c);
    };
    need(spec.question.outcome);
    need(spec.question.exposure);
    for (const auto& c : spec.scan.strata) need(c);
    for (const auto& c : extra) need(c);
    request.all_columns = spec.scan.strata.empty();
    request.where = spec.question.rows;
    CandidateOptions copt;
    copt.columns = spec.scan.strata;
    copt.bins = spec.scan.bins;
    copt.max_levels = static_cast<std::size_t>(spec.scan.max_levels);
    const std::string tx = spec.trend ? spec.trend->x : std::string(), ty = spec.trend ? spec.trend->y : std::string();
    // The diagram's verdicts (joint strata of any set), slope stability (resampled rows) and
    // trends of a pre-counted source need rows; everything else is counted in the engine.
    const bool rows = !spec.diagrams.empty() || (!tx.empty() && (spec.scan.slope_bootstrap > 0 || !request.count_column.empty()));
    DatabaseLoad out;
    if (!rows) {
        DatabaseRequest counted = request;
        for (const auto& c : {tx, ty})
            if (!c.empty() && std::find(counted.required.begin(), counted.required.end(), c) == counted.required.end())
                counted.required.push_back(c);
        const QuestionSpec qs{spec.question.outcome, spec.question.positive, spec.question.exposure,
                              spec.question.focal, spec.question.reference};
        auto c = load_database_counts(counted, copt, qs, spec.scan.pairs, !spec.question.positive, tx, ty, work);
        if (!c) return c.error();
        if (!c->numeric_question) {
            out.info = *c;
            out.counts = std::move(*c);
            return out;
        }
    }
    auto loaded = load_database_source(request, copt, work);
    if (!loaded) return loaded.error();
    out.info = *loaded;
    out.cells = std::move(loaded->table);
    return out;
}

void merge_left_out(std::vector<Exclusion>& excluded, const std::vector<Exclusion>& left_out,
                    const std::vector<std::string>& columns) {
    excluded.insert(excluded.end(), left_out.begin(), left_out.end());
    auto pos = [&](const std::string& n) {
        return static_cast<std::size_t>(std::find(columns.begin(), columns.end(), n) - columns.begin());
    };
    std::stable_sort(excluded.begin(), excluded.end(),
                     [&](const Exclusion& a, const Exclusion& b) { return pos(a.column) < pos(b.column); });
}

}  // namespace foldline::audit
