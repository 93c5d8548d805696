#include "core/io/sql_pushdown.h"

#include <array>
#include <cctype>
#include <cmath>
#include <cstdio>

namespace foldline::sql {
namespace {

bool is_word_char(char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '$';
}

std::string upper(std::string_view s) {
    std::string out(s);
    for (auto& c : out) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    return out;
}

std::string trim(std::string_view s) {
    std::size_t b = 0, e = s.size();
    while (b < e && std::isspace(static_cast<unsigned char>(s[b]))) ++b;
    while (e > b && std::isspace(static_cast<unsigned char>(s[e - 1]))) --e;
    return std::string(s.substr(b, e - b));
}

std::string number17(double v) {
    if (!std::isfinite(v)) v = 0;
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return buf;
}

std::string as_double(const std::string& quoted) { return "CAST(" + quoted + " AS DOUBLE PRECISION)"; }

std::string join_quoted(const std::vector<std::string>& names) {
    std::string out;
    for (std::size_t i = 0; i < names.size(); ++i) out += (i ? ", " : "") + quote_identifier(names[i]);
    return out;
}

}  // namespace

std::string quote_identifier(std::string_view name) {
    std::string out;
    out.reserve(name.size() + 2);
    out += '"';
    for (char c : name) {
        if (c == '"') out += '"';
        out += c;
    }
    out += '"';
    return out;
}

Result<std::string> quote_table_name(std::string_view name) {
    if (name.empty()) return make_error("empty table name");
    std::string out;
    std::size_t start = 0;
    while (true) {
        const std::size_t dot = name.find('.', start);
        const std::string_view part = name.substr(start, dot == std::string_view::npos ? name.npos : dot - start);
        if (part.empty())
            return make_error("table name '" + std::string(name) + "' has an empty part (expected TABLE or SCHEMA.TABLE)");
        if (!out.empty()) out += '.';
        out += quote_identifier(part);
        if (dot == std::string_view::npos) break;
        start = dot + 1;
    }
    return out;
}

Result<std::string> checked_query(std::string_view raw) {
    const std::string q = trim(raw);
    if (q.empty()) return make_error("empty query (expected one SELECT or WITH statement)");
    static const std::array<const char*, 18> kRefused = {
        "INSERT", "UPDATE", "DELETE", "MERGE", "INTO",   "CREATE",  "DROP", "ALTER", "TRUNCATE",
        "GRANT",  "REVOKE", "COPY",   "CALL",  "EXEC",   "EXECUTE", "LOCK", "SET",   "VACUUM"};
    auto where = [](std::size_t i) { return " (character " + std::to_string(i + 1) + ")"; };
    std::string first_word;
    std::size_t i = 0;
    while (i < q.size()) {
        const char c = q[i];
        if (c == '\'' || c == '"' || c == '`') {
            const std::size_t open = i++;
            while (true) {
                if (i >= q.size()) return make_error(std::string("unterminated quote ") + c + " in the query" + where(open));
                if (q[i] == c) {
                    if (i + 1 < q.size() && q[i + 1] == c) {
                        i += 2;
                        continue;
                    }
                    ++i;
                    break;
                }
                ++i;
            }
            if (first_word.empty()) return make_error("the query must start with SELECT or WITH");
            continue;
        }
        if (c == '-' && i + 1 < q.size() && q[i + 1] == '-') {
            while (i < q.size() && q[i] != '\n') ++i;
            continue;
        }
        if (c == '/' && i + 1 < q.size() && q[i + 1] == '*') {
            const std::size_t open = i;
            const std::size_t end = q.find("*/", i + 2);
            if (end == std::string::npos) return make_error("unterminated /* comment in the query" + where(open));
            i = end + 2;
            continue;
        }
        if (c == ';')
            return make_error("the query contains ';'" + where(i) +
                              ": give one SELECT or WITH statement without a semicolon");
        if (is_word_char(c)) {
            const std::size_t b = i;
            while (i < q.size() && is_word_char(q[i])) ++i;
            const std::string w = upper(std::string_view(q).substr(b, i - b));
            if (first_word.empty()) {
                first_word = w;
                if (w != "SELECT" && w != "WITH")
                    return make_error("the query must start with SELECT or WITH, not '" + q.substr(b, i - b) + "'" +
                                      where(b));
            }
            for (const char* k : kRefused)
                if (w == k)
                    return make_error("the query uses " + w + where(b) +
                                      ": only a read-only SELECT or WITH statement is accepted");
            continue;
        }
        if (first_word.empty() && c != '(' && !std::isspace(static_cast<unsigned char>(c)))
            return make_error("the query must start with SELECT or WITH" + where(i));
        ++i;
    }
    if (first_word.empty()) return make_error("the query has no statement (expected SELECT or WITH)");
    return q;
}

Result<std::string> from_clause(const SqlSource& s) {
    if (s.table.empty() == s.query.empty())
        return make_error(s.table.empty() ? "no source: give a table or a query" : "give a table or a query, not both");
    std::string item;
    if (!s.table.empty()) {
        auto t = quote_table_name(s.table);
        if (!t) return t.error();
        item = *t;
        // The row id is a pseudo-column that SELECT * leaves out: name it in a derived table,
        // which engines pull up into the outer query (a parallel scan stays possible).
        if (!s.row_id.empty())
            return "(SELECT src0.*, src0." + quote_identifier(s.row_id) + " AS " + quote_identifier(kRowIdColumn) +
                   " FROM " + item + " AS src0" + (s.where.empty() ? "" : " WHERE " + s.where) + ") AS src";
    } else {
        auto q = checked_query(s.query);
        if (!q) return q.error();
        item = "(" + *q + ")";
    }
    if (s.where.empty()) return item + " AS src";
    return "(SELECT * FROM " + item + " AS src0 WHERE " + s.where + ") AS src";
}

std::string describe_sql(const std::string& from) { return "SELECT * FROM " + from + " WHERE 1 = 0"; }

std::string profile_sql(const std::string& from, const std::vector<std::string>& columns, bool cells_first) {
    if (columns.empty()) return "SELECT COUNT(*) FROM " + from;
    // One pass: the distinct values of every column by hashing (GROUPING SETS, one set per
    // column), then one row per set. Engines count DISTINCT by sorting each column instead.
    std::string inner = "SELECT ";
    for (const auto& c : columns) inner += quote_identifier(c) + ", ";
    for (std::size_t i = 0; i < columns.size(); ++i)
        inner += "GROUPING(" + quote_identifier(columns[i]) + ") AS g" + std::to_string(i) + ", ";
    if (cells_first) {
        const std::string cols = join_quoted(columns);
        inner += "SUM(n) AS n FROM (SELECT " + cols + ", COUNT(*) AS n FROM " + from + " GROUP BY " + cols +
                 ") AS cells GROUP BY GROUPING SETS (";
    } else {
        inner += "COUNT(*) AS n FROM " + from + " GROUP BY GROUPING SETS (";
    }
    for (std::size_t i = 0; i < columns.size(); ++i) inner += (i ? ", (" : "(") + quote_identifier(columns[i]) + ")";
    inner += ")";
    std::string flags, s = "SELECT ";
    for (std::size_t i = 0; i < columns.size(); ++i) flags += (i ? ", g" : "g") + std::to_string(i);
    s += flags;
    for (const auto& c : columns) {
        const std::string q = quote_identifier(c);
        s += ", COUNT(" + q + "), SUM(CASE WHEN " + q + " IS NOT NULL THEN n ELSE 0 END)";
    }
    return s + ", SUM(n) FROM (" + inner + ") AS distinct_values GROUP BY " + flags;
}

std::string cells_sql(const std::string& from, const std::vector<std::string>& columns, bool first_appearance,
                      const std::string& count_column, bool row_ids) {
    if (columns.empty()) return {};
    const std::string cols = join_quoted(columns);
    const std::string w = count_column.empty() ? std::string() : quote_identifier(count_column);
    const std::string count =
        (w.empty() ? std::string("COUNT(*)") : "SUM(" + as_double(w) + ")") + " AS " + quote_identifier(kCountColumn);
    if (!first_appearance) return "SELECT " + cols + ", " + count + " FROM " + from + " GROUP BY " + cols;
    const std::string pos = quote_identifier(kFirstRowColumn);
    if (row_ids)
        return "SELECT " + cols + ", " + count + ", MIN(" + quote_identifier(kRowIdColumn) + ") AS " + pos + " FROM " +
               from + " GROUP BY " + cols + " ORDER BY " + pos;
    return "SELECT " + cols + ", " + count + ", MIN(" + pos + ") AS " + pos + " FROM (SELECT " + cols +
           (w.empty() ? "" : ", " + w) + ", ROW_NUMBER() OVER () AS " + pos + " FROM " + from +
           ") AS numbered GROUP BY " + cols + " ORDER BY " + pos;
}

std::string cubes_sql(const std::string& from, const std::string& outcome, const std::string& exposure,
                      const std::vector<std::string>& strata, bool pairs) {
    CubesQuery q;
    q.outcome = outcome;
    q.exposure = exposure;
    q.strata = strata;
    q.pairs = pairs;
    return cubes_sql(from, q);
}

std::string cubes_sql(const std::string& from, const CubesQuery& q) {
    const std::string o = quote_identifier(q.outcome), e = quote_identifier(q.exposure);
    std::vector<std::string> cols{q.outcome, q.exposure};
    cols.insert(cols.end(), q.strata.begin(), q.strata.end());
    const std::string list = join_quoted(cols);
    const std::string w = q.count_column.empty() ? std::string() : quote_identifier(q.count_column);
    const std::string pos = quote_identifier(kFirstRowColumn), rows = quote_identifier(kCountColumn);
    // Binned stratifiers: the source is first read through a derived table that replaces each
    // binned column by its bin under the same name.
    std::string source = from;
    bool binned = false;
    for (const auto& c : q.cuts) binned = binned || !c.empty();
    if (binned) {
        std::string sel = "SELECT " + o + ", " + e;
        for (std::size_t i = 0; i < q.strata.size(); ++i) {
            const std::string c = quote_identifier(q.strata[i]);
            if (i >= q.cuts.size() || q.cuts[i].empty()) {
                sel += ", " + c;
                continue;
            }
            std::string expr = "CASE WHEN " + c + " IS NULL THEN NULL";
            for (std::size_t k = 0; k < q.cuts[i].size(); ++k)
                expr += " WHEN " + as_double(c) + " < " + number17(q.cuts[i][k]) + " THEN " + std::to_string(k);
            sel += ", " + expr + " ELSE " + std::to_string(q.cuts[i].size()) + " END AS " + c;
        }
        if (!w.empty()) sel += ", " + w;
        if (q.first_appearance && q.row_ids) sel += ", " + quote_identifier(kRowIdColumn);
        source = "(" + sel + " FROM " + from + ") AS binned";
    }
    // The rows are grouped once into their joint cells (one hash per row), and the grouping
    // sets are then summed over the cells, which are far fewer than the rows: hashing every row
    // once per grouping set costs several times more in the engine.
    std::string cells = "SELECT " + list + ", " + (w.empty() ? std::string("COUNT(*)") : "SUM(" + as_double(w) + ")") +
                        " AS " + rows;
    // First appearance: the smallest row id of each cell is a plain aggregate that engines
    // compute in parallel; numbering the rows is a window over all of them, in one process.
    if (q.first_appearance && q.row_ids)
        cells += ", MIN(" + quote_identifier(kRowIdColumn) + ") AS " + pos + " FROM " + source;
    else if (q.first_appearance)
        cells += ", MIN(" + pos + ") AS " + pos + " FROM (SELECT " + list + (w.empty() ? "" : ", " + w) +
                 ", ROW_NUMBER() OVER () AS " + pos + " FROM " + source + ") AS numbered";
    else
        cells += " FROM " + source;
    cells += " GROUP BY " + list;
    std::string s = "SELECT " + list;
    for (std::size_t i = 0; i < q.strata.size(); ++i)
        s += ", GROUPING(" + quote_identifier(q.strata[i]) + ") AS g" + std::to_string(i);
    s += ", SUM(" + rows + ") AS " + rows;
    if (q.first_appearance) s += ", MIN(" + pos + ") AS " + pos;
    s += " FROM (" + cells + ") AS cells GROUP BY GROUPING SETS (";
    std::string sets;
    auto add = [&](const std::string& set) { sets += (sets.empty() ? "(" : ", (") + o + ", " + e + set + ")"; };
    if (q.pooled || q.strata.empty()) add("");
    if (q.singles)
        for (const auto& c : q.strata) add(", " + quote_identifier(c));
    if (q.pairs)
        for (std::size_t i = 0; i < q.strata.size(); ++i)
            for (std::size_t j = i + 1; j < q.strata.size(); ++j)
                add(", " + quote_identifier(q.strata[i]) + ", " + quote_identifier(q.strata[j]));
    s += sets + ")";
    if (q.first_appearance) s += " ORDER BY " + pos;
    return s;
}

std::string slope_means_sql(const std::string& from, const std::string& x, const std::string& y) {
    const std::string qx = quote_identifier(x), qy = quote_identifier(y);
    return "SELECT COUNT(*), AVG(" + as_double(qx) + "), AVG(" + as_double(qy) + "), SUM(CASE WHEN " + as_double(qy) +
           " IN (0, 1) THEN 0 ELSE 1 END) FROM " + from + " WHERE " + qx + " IS NOT NULL AND " + qy + " IS NOT NULL";
}

std::string slope_moments_sql(const std::string& from, const std::string& x, const std::string& y,
                              const std::vector<std::string>& strata, double mean_x, double mean_y,
                              bool cells_first) {
    const std::string qx = quote_identifier(x), qy = quote_identifier(y);
    std::string inner = "SELECT ";
    for (const auto& c : strata) inner += quote_identifier(c) + ", ";
    inner += as_double(qx) + " AS x, " + as_double(qy) + " AS y, " + as_double(qx) + " - " + number17(mean_x) +
             " AS dx, " + as_double(qy) + " - " + number17(mean_y) + " AS dy FROM " + from + " WHERE " + qx +
             " IS NOT NULL AND " + qy + " IS NOT NULL";
    std::string s = "SELECT ";
    for (const auto& c : strata) s += quote_identifier(c) + ", ";
    for (std::size_t i = 0; i < strata.size(); ++i)
        s += "GROUPING(" + quote_identifier(strata[i]) + ") AS g" + std::to_string(i) + ", ";
    const std::string sums =
        "COUNT(*) AS n, SUM(dx) AS sx, SUM(dy) AS sy, SUM(dx * dx) AS sxx, SUM(dx * dy) AS sxy, "
        "SUM(dy * dy) AS syy, MIN(x) AS x_min, MAX(x) AS x_max, MIN(y) AS y_min, MAX(y) AS y_max FROM (" +
        inner + ") AS centred";
    if (cells_first && !strata.empty()) {
        const std::string cols = join_quoted(strata);
        s += "SUM(n) AS n, SUM(sx) AS sx, SUM(sy) AS sy, SUM(sxx) AS sxx, SUM(sxy) AS sxy, SUM(syy) AS syy, "
             "MIN(x_min) AS x_min, MAX(x_max) AS x_max, MIN(y_min) AS y_min, MAX(y_max) AS y_max FROM (SELECT " +
             cols + ", " + sums + " GROUP BY " + cols + ") AS cells GROUP BY GROUPING SETS (()";
    } else {
        s += sums + " GROUP BY GROUPING SETS (()";
    }
    for (const auto& c : strata) s += ", (" + quote_identifier(c) + ")";
    return s + ")";
}

std::string slope_hc3_sql(const std::string& from, const std::string& x, const std::string& y, double mean_x,
                          double mean_y, double slope, double inv_w, double inv_sxx) {
    const std::string qx = quote_identifier(x), qy = quote_identifier(y);
    const std::string xt = "(" + as_double(qx) + " - " + number17(mean_x) + ")";
    const std::string e = "((" + as_double(qy) + " - " + number17(mean_y) + ") - " + number17(slope) + " * " + xt + ")";
    const std::string omh = "(1 - (" + number17(inv_w) + " + " + xt + " * " + xt + " * " + number17(inv_sxx) + "))";
    return "SELECT SUM(u * u), MIN(omh) FROM (SELECT CASE WHEN " + omh + " > 0 THEN " + xt + " * " + e + " / " + omh +
           " ELSE 0 END AS u, " + omh + " AS omh FROM " + from + " WHERE " + qx + " IS NOT NULL AND " + qy +
           " IS NOT NULL) AS leverage";
}

}  // namespace foldline::sql
