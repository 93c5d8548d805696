#include "core/io/odbc_source.h"

#include <sql.h>
#include <sqlext.h>

#include <algorithm>
#include <atomic>
#include <cctype>
#include <cmath>
#include <cstdlib>
#include <ctime>
#include <functional>
#include <limits>
#include <stop_token>
#include <unordered_map>

#include "core/stats/moments.h"
#include "core/table/column_profile.h"

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string lower(std::string_view s) {
    std::string out(s);
    for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

bool good(SQLRETURN rc) { return rc == SQL_SUCCESS || rc == SQL_SUCCESS_WITH_INFO; }

struct Diagnostic {
    std::string state;
    std::string text;
};

Diagnostic diagnose(SQLSMALLINT type, SQLHANDLE h) {
    Diagnostic d;
    for (SQLSMALLINT i = 1; i <= 5; ++i) {
        SQLCHAR state[6] = {0};
        SQLCHAR msg[1024] = {0};
        SQLINTEGER native = 0;
        SQLSMALLINT len = 0;
        if (!good(SQLGetDiagRec(type, h, i, state, &native, msg, sizeof msg, &len))) break;
        if (d.state.empty()) d.state = reinterpret_cast<const char*>(state);
        std::string m = reinterpret_cast<const char*>(msg);
        while (!m.empty() && (m.back() == '\n' || m.back() == ' ')) m.pop_back();
        if (!d.text.empty()) d.text += "; ";
        d.text += m;
    }
    return d;
}

/// Plain words for the SQLSTATE classes a user can cause.
std::string explain(const Diagnostic& d, const std::string& what) {
    const std::string& s = d.state;
    std::string head;
    const std::string text = lower(d.text);
    if (s.rfind("08", 0) == 0 || s == "57P01" || s == "HYT01" || text.find("server closed the connection") != std::string::npos ||
        (text.find("connection") != std::string::npos && text.find("lost") != std::string::npos) ||
        text.find("could not send data") != std::string::npos || text.find("no connection") != std::string::npos)
        head = "the connection to the database failed or was lost while " + what;
    else if (s == "42501" || text.find("permission denied") != std::string::npos)
        head = "permission denied while " + what + " (the account needs SELECT on the source)";
    else if (s == "42P01" || s == "42S02" || text.find("does not exist") != std::string::npos)
        head = "the table, view or column does not exist (" + what + ")";
    else if (s == "42883" || s == "42804" || text.find("equality operator") != std::string::npos)
        head = "a column's type cannot be grouped or counted by the engine while " + what +
               " (leave it out with --strata, or convert it in a --query)";
    else if (s == "HY008")
        head = "cancelled while " + what;
    else
        head = "database error while " + what;
    return head + " [SQLSTATE " + (s.empty() ? "?" : s) + "]: " + (d.text.empty() ? "no message from the driver" : d.text);
}

struct Handles {
    SQLHENV env = SQL_NULL_HENV;
    SQLHDBC dbc = SQL_NULL_HDBC;
    bool connected = false;
    ~Handles() {
        if (connected) SQLDisconnect(dbc);
        if (dbc != SQL_NULL_HDBC) SQLFreeHandle(SQL_HANDLE_DBC, dbc);
        if (env != SQL_NULL_HENV) SQLFreeHandle(SQL_HANDLE_ENV, env);
    }
};

struct Statement {
    SQLHSTMT h = SQL_NULL_HSTMT;
    ~Statement() {
        if (h != SQL_NULL_HSTMT) SQLFreeHandle(SQL_HANDLE_STMT, h);
    }
};

/// While alive, a stop request calls SQLCancel on `stmt` at once, on the thread that asks the
/// stop (std::stop_callback). Its destructor waits for a cancel already running, so the
/// statement handle outlives every SQLCancel on it: declare the watch after the Statement.
class CancelWatch {
public:
    CancelWatch(SQLHSTMT stmt, const Work& work)
        : callback_(work.stop.token(), Cancel{stmt, &cancelled_}) {}
    bool cancelled() const { return cancelled_.load(); }

private:
    struct Cancel {
        SQLHSTMT stmt;
        std::atomic<bool>* cancelled;
        void operator()() const noexcept {
            cancelled->store(true);
            SQLCancel(stmt);
        }
    };
    std::atomic<bool> cancelled_{false};  // declared before the callback, which may run in its constructor
    std::stop_callback<Cancel> callback_;
};

bool numeric_type(SQLSMALLINT t) {
    switch (t) {
        case SQL_NUMERIC: case SQL_DECIMAL: case SQL_INTEGER: case SQL_SMALLINT: case SQL_FLOAT:
        case SQL_REAL: case SQL_DOUBLE: case SQL_BIGINT: case SQL_TINYINT:
            return true;
        default:
            return false;
    }
}

bool groupable_type(SQLSMALLINT t) {
    return t != SQL_BINARY && t != SQL_VARBINARY && t != SQL_LONGVARBINARY;
}

struct SourceColumn {
    std::string name;
    SQLSMALLINT type = 0;
    bool numeric = false;
};

std::string utc_now() {
    const std::time_t t = std::time(nullptr);
    std::tm tm{};
    gmtime_r(&t, &tm);
    char buf[32];
    std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
    return buf;
}

class Session {
public:
    Session(const OdbcOptions& o, const Work& w, OdbcSourceInfo& out) : o_(o), work_(w), out_(out) {}

    Status connect() {
        if (!good(SQLAllocHandle(SQL_HANDLE_ENV, SQL_NULL_HANDLE, &h_.env)))
            return make_error("ODBC: cannot allocate an environment (is unixODBC installed?)");
        SQLSetEnvAttr(h_.env, SQL_ATTR_ODBC_VERSION, reinterpret_cast<SQLPOINTER>(SQL_OV_ODBC3), 0);
        if (!good(SQLAllocHandle(SQL_HANDLE_DBC, h_.env, &h_.dbc))) return make_error("ODBC: cannot allocate a connection");
        SQLSetConnectAttr(h_.dbc, SQL_ATTR_LOGIN_TIMEOUT, reinterpret_cast<SQLPOINTER>(15), 0);
        const std::string cs = odbc_connection_string(o_.connection);
        if (cs.empty()) return make_error("no ODBC connection string (expected odbc:DSN=NAME; or odbc:Driver=...;...)");
        SQLCHAR outbuf[1024];
        SQLSMALLINT outlen = 0;
        const SQLRETURN rc = SQLDriverConnect(h_.dbc, nullptr, reinterpret_cast<SQLCHAR*>(const_cast<char*>(cs.c_str())),
                                              SQL_NTS, outbuf, sizeof outbuf, &outlen, SQL_DRIVER_NOPROMPT);
        if (!good(rc)) {
            const Diagnostic d = diagnose(SQL_HANDLE_DBC, h_.dbc);
            return make_error("cannot connect with '" + redact_connection_string(cs) + "' [SQLSTATE " + d.state +
                              "]: " + d.text);
        }
        h_.connected = true;
        // Read-only access mode: the driver may refuse any change (only SELECTs are sent anyway).
        SQLSetConnectAttr(h_.dbc, SQL_ATTR_ACCESS_MODE, reinterpret_cast<SQLPOINTER>(SQL_MODE_READ_ONLY), 0);
        char buf[256];
        SQLSMALLINT len = 0;
        if (good(SQLGetInfo(h_.dbc, SQL_DRIVER_NAME, buf, sizeof buf, &len))) out_.driver = buf;
        if (good(SQLGetInfo(h_.dbc, SQL_DRIVER_VER, buf, sizeof buf, &len))) out_.driver += std::string(" ") + buf;
        if (good(SQLGetInfo(h_.dbc, SQL_DBMS_NAME, buf, sizeof buf, &len))) {
            dbms_ = buf;
            out_.driver += std::string(" (") + buf + ")";
        }
        if (good(SQLGetInfo(h_.dbc, SQL_DATABASE_NAME, buf, sizeof buf, &len))) out_.database = buf;
        return Ok{};
    }

    /// Runs one statement; `on_row` reads the current row with the statement handle.
    Status run(const std::string& sql, const char* what, const std::function<Status(SQLHSTMT, SQLSMALLINT)>& on_row,
               std::vector<SourceColumn>* describe = nullptr) {
        if (work_.cancelled()) return make_error("cancelled before " + std::string(what));
        out_.statements.push_back(sql);
        Statement st;
        if (!good(SQLAllocHandle(SQL_HANDLE_STMT, h_.dbc, &st.h))) {
            return make_error(explain(diagnose(SQL_HANDLE_DBC, h_.dbc), what));
        }
        if (o_.timeout_seconds > 0)
            SQLSetStmtAttr(st.h, SQL_ATTR_QUERY_TIMEOUT, reinterpret_cast<SQLPOINTER>(o_.timeout_seconds), 0);
        CancelWatch watch(st.h, work_);
        // A stop asked before the watch existed has no statement to cancel yet: do not start one.
        if (work_.cancelled()) return make_error("cancelled before " + std::string(what));
        SQLRETURN rc = SQLExecDirect(st.h, reinterpret_cast<SQLCHAR*>(const_cast<char*>(sql.c_str())), SQL_NTS);
        auto failure = [&]() -> Error {
            if (watch.cancelled() || work_.cancelled()) return make_error(std::string("cancelled while ") + what);
            return make_error(explain(diagnose(SQL_HANDLE_STMT, st.h), what));
        };
        if (!good(rc) && rc != SQL_NO_DATA) return failure();
        SQLSMALLINT ncols = 0;
        if (!good(SQLNumResultCols(st.h, &ncols))) return failure();
        if (describe) {
            for (SQLSMALLINT c = 1; c <= ncols; ++c) {
                SQLCHAR name[512] = {0};
                SQLSMALLINT nlen = 0, type = 0, digits = 0, nullable = 0;
                SQLULEN size = 0;
                if (!good(SQLDescribeCol(st.h, static_cast<SQLUSMALLINT>(c), name, sizeof name, &nlen, &type, &size,
                                         &digits, &nullable)))
                    return failure();
                describe->push_back({reinterpret_cast<const char*>(name), type, numeric_type(type)});
            }
        }
        while (true) {
            rc = SQLFetch(st.h);
            if (rc == SQL_NO_DATA) break;
            if (!good(rc)) return failure();
            if (auto s = on_row(st.h, ncols); !s) return s;
        }
        if (watch.cancelled()) return make_error(std::string("cancelled while ") + what);
        return Ok{};
    }

    Result<double> get_double(SQLHSTMT h, SQLUSMALLINT col) {
        double v = 0;
        SQLLEN ind = 0;
        if (!good(SQLGetData(h, col, SQL_C_DOUBLE, &v, sizeof v, &ind)))
            return make_error(explain(diagnose(SQL_HANDLE_STMT, h), "reading a number"));
        out_.bytes_fetched += sizeof v;
        return ind == SQL_NULL_DATA ? kNaN : v;
    }

    /// Text of the cell; `null` set when the cell is NULL.
    Result<std::string> get_text(SQLHSTMT h, SQLUSMALLINT col, bool& null) {
        std::string s;
        null = false;
        char buf[4096];
        while (true) {
            SQLLEN ind = 0;
            const SQLRETURN rc = SQLGetData(h, col, SQL_C_CHAR, buf, sizeof buf, &ind);
            if (rc == SQL_NO_DATA) break;
            if (!good(rc)) return make_error(explain(diagnose(SQL_HANDLE_STMT, h), "reading a text value"));
            if (ind == SQL_NULL_DATA) {
                null = true;
                return s;
            }
            const std::size_t got = ind == SQL_NO_TOTAL || ind >= static_cast<SQLLEN>(sizeof buf)
                                        ? sizeof buf - 1
                                        : static_cast<std::size_t>(ind);
            s.append(buf, got);
            if (rc == SQL_SUCCESS) break;
        }
        out_.bytes_fetched += static_cast<double>(s.size());
        return s;
    }

    /// The engine's name as the driver reports it (SQL_DBMS_NAME), e.g. "PostgreSQL".
    const std::string& dbms() const { return dbms_; }

private:
    const OdbcOptions& o_;
    const Work& work_;
    OdbcSourceInfo& out_;
    Handles h_;
    std::string dbms_;
};

}  // namespace

namespace {

/// The source's FROM item and the columns worth fetching.
struct Plan {
    std::string from;
    bool row_ids = false;            ///< `from` exposes sql::kRowIdColumn (first appearance without numbering)
    std::vector<SourceColumn> keep;  ///< in source order
    std::vector<double> distinct;    ///< distinct values of each kept column; NaN when not profiled
};

/// True when the table's rows can be ordered by PostgreSQL's physical row id: a plain table or
/// materialized view without child tables (a view has no ctid; the partitions of a partitioned
/// table, or an inherited table's children, each number their rows from the start, so their
/// ids do not follow the order of a scan of the whole), on a server with MIN(tid) (version 14
/// on). Any failure of the check means no.
bool postgres_row_ids(Session& s, const std::string& table) {
    auto quoted = sql::quote_table_name(table);
    if (!quoted) return false;
    std::string literal = "'";
    for (char c : *quoted) literal += c == '\'' ? std::string("''") : std::string(1, c);
    literal += "'";
    double yes = 0;
    const auto st = s.run("SELECT COUNT(*) FROM pg_catalog.pg_class WHERE oid = to_regclass(" + literal +
                              ") AND relkind IN ('r', 'm') AND NOT relhassubclass"
                              " AND CAST(current_setting('server_version_num') AS INTEGER) >= 140000",
                          "checking the table's row ids", [&](SQLHSTMT h, SQLSMALLINT) -> Status {
                              auto v = s.get_double(h, 1);
                              if (!v) return v.error();
                              yes = *v;
                              return Ok{};
                          });
    return st && yes == 1;
}

/// True when PostgreSQL's planner expects the joint cells of `columns` to be at most a tenth of
/// the rows it scans (read from the estimates of `EXPLAIN`, which runs nothing): then the
/// profile and the trend's sums group the rows into cells first, in parallel (the cells_first
/// of sql::profile_sql and sql::slope_moments_sql). Any failure of the check means no.
bool postgres_few_cells(Session& s, const std::string& from, const std::vector<std::string>& columns) {
    double cells = -1, scanned = 0;
    const auto st = s.run("EXPLAIN " + sql::cells_sql(from, columns, false), "estimating the joint cells",
                          [&](SQLHSTMT h, SQLSMALLINT) -> Status {
                              bool null = false;
                              auto line = s.get_text(h, 1, null);
                              if (!line) return line.error();
                              const std::size_t at = line->find("rows=");
                              if (at == std::string::npos) return Ok{};
                              const double rows = std::strtod(line->c_str() + at + 5, nullptr);
                              if (cells < 0) cells = rows;  // the plan's top node: the cells
                              scanned = std::max(scanned, rows);
                              return Ok{};
                          });
    return st && cells >= 0 && cells * 10 <= scanned;
}

/// Describes the source (its columns), checks the required columns, and profiles the others
/// (rows, present and distinct values) to leave out what a scan would leave out anyway.
Result<Plan> plan_source(Session& s, const OdbcOptions& o, OdbcSourceInfo& out, const Work& work) {
    Plan plan;
    out.source_text = o.source.table.empty() ? o.source.query : o.source.table;
    sql::SqlSource every_row = o.source;
    every_row.where.clear();
    auto unfiltered = sql::from_clause(every_row);
    if (!unfiltered) return unfiltered.error();
    if (auto st = s.connect(); !st) return st.error();
    // First appearance by the smallest row id of each cell (a parallel aggregate) where the
    // engine has one that follows a scan's order; otherwise the rows are numbered.
    sql::SqlSource source = o.source;
    if (o.first_appearance && !o.source.table.empty() && s.dbms() == "PostgreSQL" &&
        postgres_row_ids(s, o.source.table)) {
        source.row_id = "ctid";
        plan.row_ids = true;
    }
    auto from = sql::from_clause(source);
    if (!from) return from.error();
    plan.from = *from;

    // 1. The source's columns (described without the rows filter, so a filter naming a column
    // the source lacks gets Foldline's message rather than the engine's).
    std::vector<SourceColumn> cols;
    auto none = [](SQLHSTMT, SQLSMALLINT) -> Status { return Ok{}; };
    if (auto st = s.run(sql::describe_sql(*unfiltered), "describing the source's columns", none, &cols); !st)
        return st.error();
    for (const auto& c : cols) out.source_columns.push_back(c.name);
    for (const auto& w : o.where_columns)
        if (std::none_of(cols.begin(), cols.end(), [&](const SourceColumn& c) { return c.name == w; }))
            return usage_error(make_error("rows filter: no column named '" + w + "' in the source " + out.source_text));
    for (const auto& r : o.required)
        if (std::none_of(cols.begin(), cols.end(), [&](const SourceColumn& c) { return c.name == r; }))
            return make_error("column '" + r + "' not found in the source " + out.source_text);
    if (!o.count_column.empty()) {
        const auto it = std::find_if(cols.begin(), cols.end(), [&](const SourceColumn& c) { return c.name == o.count_column; });
        if (it == cols.end()) return make_error("count column '" + o.count_column + "' not found in the source " + out.source_text);
        if (!it->numeric) return make_error("count column '" + o.count_column + "' is not numeric in the source");
        cols.erase(it);
    }
    work.report(1, 3, "profiling columns");

    // 2. Profile: rows, non-missing and distinct values of every candidate column.
    std::vector<std::string> profiled;
    auto is_required = [&](const std::string& n) { return std::find(o.required.begin(), o.required.end(), n) != o.required.end(); };
    for (const auto& c : cols) {
        if (is_required(c.name)) continue;
        if (!o.all_columns) continue;
        if (!groupable_type(c.type)) {
            out.left_out.push_back({c.name, "binary column type (cannot be grouped)"});
            continue;
        }
        profiled.push_back(c.name);
    }
    // Per profiled column: non-missing rows and distinct non-missing values.
    const std::size_t np = profiled.size();
    std::vector<double> present(np, 0), distincts(np, 0);
    double rows = 0;
    // A profile of one column is its own cells; of several, cells first where the engine expects
    // few of them (GROUPING SETS over the rows would run in one process).
    const bool cells_first =
        np == 1 || (np > 1 && s.dbms() == "PostgreSQL" && postgres_few_cells(s, plan.from, profiled));
    if (auto st = s.run(sql::profile_sql(plan.from, profiled, cells_first), "counting rows and distinct values",
                        [&](SQLHSTMT h, SQLSMALLINT n) -> Status {
                            std::vector<double> v;
                            for (SQLSMALLINT i = 1; i <= n; ++i) {
                                auto x = s.get_double(h, static_cast<SQLUSMALLINT>(i));
                                if (!x) return x.error();
                                v.push_back(*x);
                            }
                            if (np == 0) {
                                if (v.size() != 1) return make_error("the profile query returned an unexpected shape");
                                rows = v[0];
                                return Ok{};
                            }
                            if (v.size() != 3 * np + 1) return make_error("the profile query returned an unexpected shape");
                            rows = v.back();
                            for (std::size_t k = 0; k < np; ++k)
                                if (v[k] == 0) {
                                    distincts[k] = v[np + 2 * k];
                                    present[k] = v[np + 2 * k + 1];
                                }
                            return Ok{};
                        });
        !st)
        return st.error();
    out.source_rows = rows;
    for (const auto& c : cols) {
        if (is_required(c.name)) {
            plan.keep.push_back(c);
            plan.distinct.push_back(kNaN);
            continue;
        }
        const auto it = std::find(profiled.begin(), profiled.end(), c.name);
        if (it == profiled.end()) continue;
        const std::size_t k = static_cast<std::size_t>(it - profiled.begin());
        const double distinct = distincts[k];
        // The candidate selection's own rule (core/table/column_profile.h), so a column left out
        // here gets the words a scan of the same rows gives.
        ColumnProfile profile;
        profile.rows = rows;
        profile.missing = rows - present[k];
        profile.distinct = distinct;
        profile.categorical = !c.numeric;
        profile.row_level = o.count_column.empty();
        if (auto why = exclusion_reason(profile, o.max_levels, o.max_missing_share)) {
            out.left_out.push_back({c.name, std::move(*why)});
            continue;
        }
        plan.keep.push_back(c);
        plan.distinct.push_back(distinct);
    }
    work.report(2, 3, "counting in the database");
    if (plan.keep.empty()) return make_error("no column of the source can be fetched");
    return plan;
}

/// One value of a result row.
struct Cell {
    double number = kNaN;
    std::string text;
    bool null = false;
};

Result<Cell> read_cell(Session& s, SQLHSTMT h, SQLUSMALLINT col, bool numeric) {
    Cell c;
    if (numeric) {
        auto v = s.get_double(h, col);
        if (!v) return v.error();
        c.number = *v;
        c.null = std::isnan(*v);
        return c;
    }
    auto t = s.get_text(h, col, c.null);
    if (!t) return t.error();
    c.text = std::move(*t);
    return c;
}

/// Collects result rows into a pre-counted Table: text columns become categorical (levels in
/// order of first appearance among the rows, NULL missing), numeric ones stay numeric.
class TableBuilder {
public:
    explicit TableBuilder(std::vector<SourceColumn> columns)
        : columns_(std::move(columns)), cells_(columns_.size()), seeds_(columns_.size()) {}
    /// Text column i starts with these levels, in this order (rows may add more after them).
    void seed_levels(std::size_t i, std::vector<std::string> levels) { seeds_[i] = std::move(levels); }
    /// Adds a row: one cell per column (in the builder's column order) and its count.
    void add(const std::vector<const Cell*>& row, double weight) {
        for (std::size_t i = 0; i < columns_.size(); ++i) cells_[i].push_back(*row[i]);
        weights_.push_back(weight);
    }
    Table finish(const std::string& source, const std::string& weight_column) {
        Table t;
        t.rows = weights_.size();
        t.weights = std::move(weights_);
        t.source = source;
        t.weight_column = weight_column;
        for (std::size_t i = 0; i < columns_.size(); ++i) {
            if (columns_[i].numeric) {
                std::vector<double> v;
                v.reserve(cells_[i].size());
                for (const auto& c : cells_[i]) v.push_back(c.number);
                t.columns.push_back(Column::numeric(columns_[i].name, std::move(v)));
                continue;
            }
            std::vector<std::string> levels = seeds_[i];
            std::unordered_map<std::string, std::uint32_t> index;
            for (std::size_t k = 0; k < levels.size(); ++k) index.emplace(levels[k], static_cast<std::uint32_t>(k));
            std::vector<std::uint32_t> codes;
            codes.reserve(cells_[i].size());
            std::vector<std::size_t> missing_rows;
            for (std::size_t r = 0; r < cells_[i].size(); ++r) {
                const Cell& c = cells_[i][r];
                if (c.null) {
                    codes.push_back(0);
                    missing_rows.push_back(r);
                    continue;
                }
                auto [it, inserted] = index.try_emplace(c.text, static_cast<std::uint32_t>(levels.size()));
                if (inserted) levels.push_back(c.text);
                codes.push_back(it->second);
            }
            const auto miss = static_cast<std::uint32_t>(levels.size());
            for (auto r : missing_rows) codes[r] = miss;
            t.columns.push_back(Column::categorical(columns_[i].name, std::move(levels), codes));
            cells_[i].clear();
        }
        return t;
    }

private:
    std::vector<SourceColumn> columns_;
    std::vector<std::vector<Cell>> cells_;
    std::vector<std::vector<std::string>> seeds_;
    std::vector<double> weights_;
};

/// The slope's shift, per-stratum centred sums and HC3 sum (three statements).
Result<GroupedMoments> read_moments(Session& s, const std::string& from, const OdbcSlope& slope,
                                    const std::vector<std::string>& strata, const std::vector<SourceColumn>& cols,
                                    const Work& work) {
    GroupedMoments m;
    std::vector<double> means;
    auto numbers = [&](std::vector<double>& into) {
        return [&s, &into](SQLHSTMT h, SQLSMALLINT n) -> Status {
            for (SQLSMALLINT i = 1; i <= n; ++i) {
                auto v = s.get_double(h, static_cast<SQLUSMALLINT>(i));
                if (!v) return v.error();
                into.push_back(*v);
            }
            return Ok{};
        };
    };
    if (auto st = s.run(sql::slope_means_sql(from, slope.x, slope.y), "averaging the trend columns", numbers(means)); !st)
        return st.error();
    if (means.size() != 4) return make_error("the trend means query returned an unexpected shape");
    if (!(means[0] > 0)) return make_error("no row has both '" + slope.x + "' and '" + slope.y + "'");
    m.shift_x = means[1];
    m.shift_y = means[2];
    m.zero_one = means[3] == 0;

    const std::size_t n = strata.size();
    std::vector<TableBuilder> values;
    for (std::size_t i = 0; i < n; ++i) values.emplace_back(std::vector<SourceColumn>{cols[i]});
    m.sums.resize(n);
    std::vector<Cell> row(n);
    std::vector<std::size_t> in_set;
    bool pooled_seen = false;
    auto on_row = [&](SQLHSTMT h, SQLSMALLINT) -> Status {
        for (std::size_t i = 0; i < n; ++i) {
            auto c = read_cell(s, h, static_cast<SQLUSMALLINT>(i + 1), cols[i].numeric);
            if (!c) return c.error();
            row[i] = std::move(*c);
        }
        in_set.clear();
        for (std::size_t i = 0; i < n; ++i) {
            auto g = s.get_double(h, static_cast<SQLUSMALLINT>(n + 1 + i));
            if (!g) return g.error();
            if (*g == 0) in_set.push_back(i);
        }
        double v[10];
        for (std::size_t k = 0; k < 10; ++k) {
            auto x = s.get_double(h, static_cast<SQLUSMALLINT>(2 * n + 1 + k));
            if (!x) return x.error();
            v[k] = *x;
        }
        CentredSums sums{v[0], v[1], v[2], v[3], v[4], v[5], v[6] == v[7], v[8] == v[9]};
        if (in_set.empty()) {
            m.pooled = sums;
            pooled_seen = true;
        } else if (in_set.size() == 1) {
            values[in_set[0]].add({&row[in_set[0]]}, 1);
            m.sums[in_set[0]].push_back(sums);
        } else {
            return make_error("the moment query returned a row of no requested set");
        }
        if (work.cancelled()) return make_error("cancelled while reading the moment sums");
        return Ok{};
    };
    // Per joint cell of the strata first (in parallel) where the engine expects few cells.
    const bool cells_first = !strata.empty() && s.dbms() == "PostgreSQL" && postgres_few_cells(s, from, strata);
    if (auto st = s.run(sql::slope_moments_sql(from, slope.x, slope.y, strata, m.shift_x, m.shift_y, cells_first),
                        "summing the trend per stratum", on_row);
        !st)
        return st.error();
    if (!pooled_seen) return make_error("the moment query returned no pooled row");
    for (auto& b : values) m.values.push_back(std::move(b.finish("", "").columns[0]));

    // The pooled slope's HC3 robust SE needs each row's leverage: one more pass in the engine.
    const auto p = BivariateMoments::from_centred_sums(m.pooled.n, m.pooled.sx, m.pooled.sy, m.pooled.sxx, m.pooled.sxy,
                                                       m.pooled.syy, m.shift_x, m.shift_y, m.pooled.x_constant,
                                                       m.pooled.y_constant);
    m.hc3 = kNaN;
    if (p.cxx > 0 && p.w >= 3) {
        std::vector<double> h3;
        if (auto st = s.run(sql::slope_hc3_sql(from, slope.x, slope.y, p.mean_x(), p.mean_y(), p.cxy / p.cxx, 1.0 / p.w,
                                               1.0 / p.cxx),
                            "computing the robust standard error", numbers(h3));
            !st)
            return st.error();
        if (h3.size() == 2 && h3[1] > 0) m.hc3 = std::sqrt(h3[0]) / p.cxx;
    }
    return m;
}

/// The pair sets of the planned stratifiers, numeric ones binned in the engine (second query).
Status read_pair_sets(Session& s, const std::string& from, const OdbcOptions& o, const std::string& outcome,
                      const std::string& exposure, const PairPlan& plan, const std::vector<SourceColumn>& cols,
                      GroupedCounts& counts, const Work& work) {
    const std::size_t n = plan.strata.size();
    if (n < 2) return Ok{};
    sql::CubesQuery q;
    q.outcome = outcome;
    q.exposure = exposure;
    q.strata = plan.strata;
    q.cuts = plan.cuts;
    q.cuts.resize(n);
    q.pairs = true;
    q.pooled = false;
    q.singles = false;
    q.first_appearance = false;  // the level order comes from the pooled and single sets
    q.count_column = o.count_column;
    std::vector<SourceColumn> qc{cols[0], cols[1]};
    for (std::size_t i = 0; i < n; ++i) {
        const auto it = std::find_if(cols.begin(), cols.end(), [&](const SourceColumn& c) { return c.name == plan.strata[i]; });
        if (it == cols.end()) return make_error("pair stratifier '" + plan.strata[i] + "' was not fetched");
        SourceColumn c = *it;
        if (!q.cuts[i].empty()) {
            c.numeric = true;  // the bin's number
            counts.coded_in_pairs.push_back(c.name);
        }
        qc.push_back(c);
    }
    std::vector<TableBuilder> sets;
    std::vector<std::size_t> at(n * n, 0);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i + 1; j < n; ++j) {
            at[i * n + j] = sets.size();
            sets.emplace_back(std::vector<SourceColumn>{qc[0], qc[1], qc[2 + i], qc[2 + j]});
            // Outcome and exposure codes must be those of the pooled set.
            for (std::size_t k = 0; k < 2; ++k)
                if (counts.pooled.columns.size() == 2 && counts.pooled.columns[k].is_categorical())
                    sets.back().seed_levels(k, counts.pooled.columns[k].levels);
        }
    std::vector<Cell> row(qc.size());
    std::vector<std::size_t> in_set;
    auto on_row = [&](SQLHSTMT h, SQLSMALLINT) -> Status {
        for (std::size_t i = 0; i < qc.size(); ++i) {
            auto c = read_cell(s, h, static_cast<SQLUSMALLINT>(i + 1), qc[i].numeric);
            if (!c) return c.error();
            row[i] = std::move(*c);
        }
        in_set.clear();
        for (std::size_t i = 0; i < n; ++i) {
            auto g = s.get_double(h, static_cast<SQLUSMALLINT>(qc.size() + 1 + i));
            if (!g) return g.error();
            if (*g == 0) in_set.push_back(i);
        }
        auto w = s.get_double(h, static_cast<SQLUSMALLINT>(qc.size() + n + 1));
        if (!w) return w.error();
        if (in_set.size() != 2) return make_error("the pair query returned a row of no requested set");
        sets[at[in_set[0] * n + in_set[1]]].add({&row[0], &row[1], &row[2 + in_set[0]], &row[2 + in_set[1]]}, *w);
        if (work.cancelled()) return make_error("cancelled while reading the pair counts");
        return Ok{};
    };
    if (auto st = s.run(sql::cubes_sql(from, q), "counting the pairs of stratifiers", on_row); !st) return st;
    const std::string source = "odbc: pairs";
    for (auto& b : sets) counts.pairs.push_back(b.finish(source, o.count_column));
    return Ok{};
}

}  // namespace

Result<OdbcTable> read_odbc_cells(const OdbcOptions& o, const Work& work) {
    OdbcTable out;
    Session s(o, work, out);
    auto plan = plan_source(s, o, out, work);
    if (!plan) return plan.error();
    const auto& keep = plan->keep;

    // 3. The joint cells.
    std::vector<std::string> names;
    for (const auto& c : keep) names.push_back(c.name);
    out.queried_at = utc_now();
    TableBuilder cells(keep);
    std::vector<Cell> row(keep.size());
    std::vector<const Cell*> ptrs(keep.size());
    for (std::size_t i = 0; i < keep.size(); ++i) ptrs[i] = &row[i];
    const SQLUSMALLINT count_col = static_cast<SQLUSMALLINT>(keep.size() + 1);
    if (auto st = s.run(sql::cells_sql(plan->from, names, o.first_appearance, o.count_column, plan->row_ids), "counting the cells",
                        [&](SQLHSTMT h, SQLSMALLINT) -> Status {
                            for (std::size_t i = 0; i < keep.size(); ++i) {
                                auto c = read_cell(s, h, static_cast<SQLUSMALLINT>(i + 1), keep[i].numeric);
                                if (!c) return c.error();
                                row[i] = std::move(*c);
                            }
                            auto w = s.get_double(h, count_col);
                            if (!w) return w.error();
                            cells.add(ptrs, *w);
                            if (work.cancelled()) return make_error("cancelled while reading the cells");
                            return Ok{};
                        });
        !st)
        return st.error();
    out.table = cells.finish("odbc: " + out.source_text, o.count_column);
    work.report(3, 3, "cells received");
    return out;
}

Result<OdbcGroups> read_odbc_groups(const OdbcOptions& o, const std::string& outcome, const std::string& exposure,
                                    bool pairs, bool numeric_outcome_question, const OdbcSlope& slope,
                                    const Work& work, const PairPlanner& plan_pairs) {
    OdbcGroups out;
    Session s(o, work, out);
    auto plan = plan_source(s, o, out, work);
    if (!plan) return plan.error();
    auto find = [&](const std::string& n) {
        return std::find_if(plan->keep.begin(), plan->keep.end(), [&](const SourceColumn& c) { return c.name == n; });
    };
    const auto oc = find(outcome), ec = find(exposure);
    if (oc == plan->keep.end() || ec == plan->keep.end())
        return make_error("the outcome and the exposure must be among the columns fetched");
    if (numeric_outcome_question && oc->numeric && ec->numeric) {
        out.numeric_question = true;
        return out;
    }
    // Columns of the query: outcome, exposure, then every stratifier in source order.
    std::vector<SourceColumn> cols{*oc, *ec};
    sql::CubesQuery q;
    q.outcome = outcome;
    q.exposure = exposure;
    for (const auto& c : plan->keep)
        if (c.name != outcome && c.name != exposure) {
            cols.push_back(c);
            q.strata.push_back(c.name);
        }
    // A numeric stratifier with many values (or unprofiled) would bring every value into every
    // pair set: then the pairs wait for a second query, binned in the engine.
    bool continuous = false;
    for (std::size_t k = 0; k < plan->keep.size(); ++k) {
        const auto& c = plan->keep[k];
        if (c.name == outcome || c.name == exposure || !c.numeric) continue;
        continuous = continuous || !(plan->distinct[k] <= static_cast<double>(o.max_levels));
    }
    const bool second = pairs && plan_pairs && continuous;
    q.pairs = pairs && !second;
    q.pooled = true;
    q.first_appearance = o.first_appearance;
    q.row_ids = plan->row_ids;
    q.count_column = o.count_column;
    const std::size_t n = q.strata.size();

    TableBuilder pooled({cols[0], cols[1]});
    std::vector<TableBuilder> singles;
    for (std::size_t i = 0; i < n; ++i) singles.emplace_back(std::vector<SourceColumn>{cols[0], cols[1], cols[2 + i]});
    std::vector<TableBuilder> pair_sets;
    std::vector<std::size_t> pair_at(n * n, 0);
    if (q.pairs)
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = i + 1; j < n; ++j) {
                pair_at[i * n + j] = pair_sets.size();
                pair_sets.emplace_back(std::vector<SourceColumn>{cols[0], cols[1], cols[2 + i], cols[2 + j]});
            }

    out.queried_at = utc_now();
    std::vector<Cell> row(cols.size());
    std::vector<std::size_t> in_set;
    const SQLUSMALLINT count_col = static_cast<SQLUSMALLINT>(cols.size() + n + 1);
    auto on_row = [&](SQLHSTMT h, SQLSMALLINT) -> Status {
        for (std::size_t i = 0; i < cols.size(); ++i) {
            auto c = read_cell(s, h, static_cast<SQLUSMALLINT>(i + 1), cols[i].numeric);
            if (!c) return c.error();
            row[i] = std::move(*c);
        }
        in_set.clear();
        for (std::size_t i = 0; i < n; ++i) {
            auto g = s.get_double(h, static_cast<SQLUSMALLINT>(cols.size() + 1 + i));
            if (!g) return g.error();
            if (*g == 0) in_set.push_back(i);  // GROUPING() is 0 where the column belongs to the row's set
        }
        auto w = s.get_double(h, count_col);
        if (!w) return w.error();
        if (in_set.empty()) {
            pooled.add({&row[0], &row[1]}, *w);
        } else if (in_set.size() == 1) {
            singles[in_set[0]].add({&row[0], &row[1], &row[2 + in_set[0]]}, *w);
        } else if (in_set.size() == 2 && q.pairs) {
            pair_sets[pair_at[in_set[0] * n + in_set[1]]].add({&row[0], &row[1], &row[2 + in_set[0]], &row[2 + in_set[1]]},
                                                             *w);
        } else {
            return make_error("the grouping sets query returned a row of no requested set");
        }
        if (work.cancelled()) return make_error("cancelled while reading the counts");
        return Ok{};
    };
    if (auto st = s.run(sql::cubes_sql(plan->from, q), "counting the grouping sets", on_row); !st) return st.error();
    const std::string source = "odbc: " + out.source_text;
    out.counts.pooled = pooled.finish(source, o.count_column);
    for (auto& b : singles) out.counts.singles.push_back(b.finish(source, o.count_column));
    for (auto& b : pair_sets) out.counts.pairs.push_back(b.finish(source, o.count_column));
    out.counts.weighted_source = !o.count_column.empty();
    if (second) {
        auto pp = plan_pairs(out.counts);
        if (!pp) return pp.error();
        if (auto st = read_pair_sets(s, plan->from, o, outcome, exposure, *pp, cols, out.counts, work); !st)
            return st.error();
    }
    if (!slope.x.empty()) {
        for (const auto* name : {&slope.x, &slope.y}) {
            const auto it = find(*name);
            if (it == plan->keep.end()) return make_error("trend column '" + *name + "' not found in the source " + out.source_text);
            if (!it->numeric) return make_error("trend column '" + *name + "' is not numeric in the source");
        }
        if (!o.count_column.empty()) return make_error("trend checks of a pre-counted source are not pushed down");
        auto m = read_moments(s, plan->from, slope, q.strata, std::vector<SourceColumn>(cols.begin() + 2, cols.end()), work);
        if (!m) return m.error();
        out.moments = std::move(*m);
    }
    work.report(3, 3, "counts received");
    return out;
}

}  // namespace foldline
