#include "app/cli/scan_source.h"

#include <algorithm>

#ifdef FOLDLINE_HAS_ODBC
#include "core/io/odbc_source.h"
#endif

namespace foldline::cli {

Result<DatabaseSource> load_database_source(const std::string& source, const std::string& table,
                                            const std::string& query, const std::vector<std::string>& required,
                                            bool all_columns, const CandidateOptions& copt,
                                            const std::string& count_column) {
#ifdef FOLDLINE_HAS_ODBC
    if (source.rfind("odbc:", 0) != 0)
        return make_error("--source must start with odbc: (for example odbc:DSN=warehouse;)");
    if (table.empty() == query.empty()) return make_error("with --source give exactly one of --table T or --query SQL");
    OdbcOptions o;
    o.connection = source;
    o.source.table = table;
    o.source.query = query;
    o.required = required;
    o.all_columns = all_columns;
    o.max_levels = copt.max_levels;
    o.max_missing_share = copt.max_missing_share;
    o.count_column = count_column;
    auto r = read_odbc_cells(o);
    if (!r) return r.error();
    DatabaseSource d;
    // Credentials never reach the description (a password in the string is masked).
    d.description = "odbc:" + redact_connection_string(source.substr(5)) +
                    (table.empty() ? " query: " + query : " table " + table);
    d.source_rows = r->source_rows;
    d.columns = r->source_columns;
    for (auto& l : r->left_out) d.left_out.push_back({l.column, l.reason});
    d.bytes_fetched = r->bytes_fetched;
    d.table = std::move(r->table);
    return d;
#else
    (void)source, (void)table, (void)query, (void)required, (void)all_columns, (void)copt, (void)count_column;
    return make_error("this build has no database support (install unixodbc-dev and rebuild with -DFOLDLINE_ODBC=ON)");
#endif
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

}  // namespace foldline::cli
