#pragma once
// SQL text for scanning a table where it lives: the counting runs inside the database engine and
// only small summaries come back. Pure string building (no database access), so every query can
// be checked without a server.
//
// The user's source is either a table name or one read-only query; a query is never
// concatenated with other statements: it is checked (a single SELECT or WITH statement, no `;`
// outside quotes or comments, no data-changing keyword) and wrapped as a derived table,
// `... FROM (<query>) AS src`. Identifiers are always quoted with double quotes (a double quote
// inside a name is doubled), so names with spaces, quotes or reserved words work.
//
// SQL features relied on: derived tables, COUNT / COUNT(DISTINCT), SUM in double precision
// (CAST ... AS DOUBLE PRECISION), GROUP BY GROUPING SETS and GROUPING() (SQL:1999), and, for
// level order by first appearance only, either ROW_NUMBER() OVER () (any engine, but one process
// numbers every row) or MIN of the engine's physical row id (PostgreSQL's ctid, a table only),
// which engines compute in a parallel partial aggregate.
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"

namespace foldline::sql {

/// `name` in double quotes with every `"` doubled: `a "b"` -> `"a ""b"""`. "" -> `""` (which
/// engines reject: callers never pass an empty name).
std::string quote_identifier(std::string_view name);

/// A possibly schema-qualified table name ("sales.loans" -> `"sales"."loans"`): split on `.`,
/// each part quoted. Error for an empty name or an empty part ("a..b", ".t").
Result<std::string> quote_table_name(std::string_view name);

/// The query itself (trimmed of surrounding white space) when it is one read-only statement:
/// it starts (after comments and opening parentheses) with SELECT or WITH, has no `;` outside
/// quotes and comments, no unterminated quote or comment, and none of the keywords INSERT,
/// UPDATE, DELETE, MERGE, INTO, CREATE, DROP, ALTER, TRUNCATE, GRANT, REVOKE, COPY, CALL, EXEC,
/// EXECUTE, LOCK, SET outside quotes (so `SELECT ... INTO` and data-changing WITH parts are
/// refused too). Error (with the 1-based character position where it applies) otherwise;
/// an empty query is an error.
Result<std::string> checked_query(std::string_view query);

/// Where the rows come from: exactly one of `table` or `query` is set.
struct SqlSource {
    std::string table;  ///< table name, optionally schema-qualified with `.`
    std::string query;  ///< one read-only SELECT / WITH statement
    /// Rows to include: an SQL condition written by core/table/row_filter.h's to_sql (quoted
    /// identifiers, escaped literals), never text a user typed. Empty = every row.
    std::string where = {};
    /// A table's physical row id pseudo-column ("ctid" on PostgreSQL), exposed by from_clause as
    /// kRowIdColumn so that first appearance is MIN(row id); ignored for a query. Empty = none.
    std::string row_id = {};
};

/// Name under which from_clause exposes the source's row id (SqlSource::row_id).
inline constexpr const char* kRowIdColumn = "foldline_row_id";

/// The FROM item for the source: `"schema"."table" AS src` or `(<checked query>) AS src`; with
/// a `where` condition, `(SELECT * FROM <that item, as src0> WHERE <where>) AS src`; a table with
/// a `row_id`: `(SELECT src0.*, src0."<row_id>" AS foldline_row_id FROM <table> AS src0 [WHERE
/// <where>]) AS src`.
/// Error when both or neither are set, or when the name or the query is refused (see above).
Result<std::string> from_clause(const SqlSource& source);

/// `SELECT * FROM <from> WHERE 1 = 0`: no rows, only the result's column descriptions.
std::string describe_sql(const std::string& from);

/// The profile of `columns` in one pass: GROUP BY GROUPING SETS with one set per column, then one
/// row per column: the GROUPING flags g0, g1, ... (0 for the row's column), then for each
/// column k COUNT(c_k) and SUM of the rows where c_k is present (on the row of column k: its
/// distinct non-missing values and its non-missing rows), then SUM(n) (every row of the source).
/// An empty source gives no rows. No columns: one row holding COUNT(*).
/// With `cells_first` the rows are first grouped into the joint cells of the columns (one hash
/// per row, which engines run as a parallel partial aggregate; GROUPING SETS over rows runs in
/// one process) and the sets then sum the cells' counts: same result, faster when the cells are
/// far fewer than the rows, about twice the work when nearly every row is its own cell.
std::string profile_sql(const std::string& from, const std::vector<std::string>& columns, bool cells_first = false);

/// Name of the extra column holding each cell's first row position (first_appearance only).
inline constexpr const char* kFirstRowColumn = "foldline_first_row";
/// Name of the extra column holding each cell's row count.
inline constexpr const char* kCountColumn = "foldline_rows";

/// The joint cells of `columns`: one row per distinct combination (NULL kept as a value) with
/// the columns, COUNT(*) AS foldline_rows, and — when `first_appearance` — the smallest
/// ROW_NUMBER() OVER () of the cell AS foldline_first_row, ordered by it (so levels can be
/// numbered in order of first appearance); with `row_ids` (a `from` exposing foldline_row_id)
/// the smallest row id instead, without numbering the rows. With a `count_column` (a pre-counted source) the
/// cell's rows are SUM(CAST(count AS DOUBLE PRECISION)) instead of COUNT(*) (NULL counts add
/// nothing). `columns` must not be empty (returns "" if it is).
std::string cells_sql(const std::string& from, const std::vector<std::string>& columns, bool first_appearance,
                      const std::string& count_column = {}, bool row_ids = false);

/// Every count cube of a rate scan in one pass (the rows grouped once into their joint cells,
/// the sets then summed over the cells): GROUP BY GROUPING SETS with one set
/// (outcome, exposure, s) per stratifier s, and — when `pairs` — one set (outcome, exposure,
/// s, t) per pair s < t. Columns: outcome, exposure, each stratifier, then GROUPING(s) for each
/// stratifier (as g0, g1, ...; 0 where the stratifier belongs to the row's set, so a NULL with
/// flag 0 is a genuinely missing value), then COUNT(*) AS foldline_rows. No stratifiers: one
/// set (outcome, exposure).
std::string cubes_sql(const std::string& from, const std::string& outcome, const std::string& exposure,
                      const std::vector<std::string>& strata, bool pairs);

/// What cubes_sql(from, CubesQuery) groups.
struct CubesQuery {
    std::string outcome;
    std::string exposure;
    std::vector<std::string> strata;
    bool pairs = true;             ///< one set per pair s < t
    bool pooled = false;           ///< also the set (outcome, exposure), first
    bool first_appearance = false; ///< MIN(ROW_NUMBER() OVER ()) AS foldline_first_row, rows ordered by it
    bool row_ids = false;          ///< with first_appearance: MIN(foldline_row_id) of `from` instead (no numbering)
    std::string count_column;      ///< pre-counted source: SUM(CAST(count AS DOUBLE PRECISION)) instead of COUNT(*)
    bool singles = true;           ///< one set per stratifier (false: pairs only, with `pooled` unset)
    /// Per stratifier (empty, or one entry per stratifier): ascending cut points of a numeric
    /// column; the column is then replaced by its bin, CASE WHEN x IS NULL THEN NULL WHEN
    /// CAST(x AS DOUBLE PRECISION) < cut1 THEN 0 WHEN ... < cut2 THEN 1 ... ELSE cuts.size() END,
    /// under its own name. An empty entry keeps the column's values.
    std::vector<std::vector<double>> cuts;
};

/// The same query with the options above: columns outcome, exposure, each stratifier, the
/// GROUPING flags g0, g1, ..., foldline_rows, and foldline_first_row when first_appearance
/// (computed over `(SELECT the columns, ROW_NUMBER() OVER () ... FROM <from>) AS numbered`,
/// one numbering shared by every set, or with row_ids as MIN(foldline_row_id) per joint cell;
/// the result ordered by it).
std::string cubes_sql(const std::string& from, const CubesQuery& query);

/// One row: COUNT of rows where x and y are both present, AVG(x) and AVG(y) over those rows
/// (in double precision), and how many of those rows have a y other than 0 or 1. The means
/// centre the moment query.
std::string slope_means_sql(const std::string& from, const std::string& x, const std::string& y);

/// Per-stratum moment sums of (x, y) on values centred by (mean_x, mean_y), rows where x or y
/// is missing left out: GROUP BY GROUPING SETS with one set per stratifier (plus the empty set
/// for the whole table). Columns: each stratifier, GROUPING(s) flags (g0, g1, ...), then
/// COUNT(*) AS n, SUM(dx) AS sx, SUM(dy) AS sy, SUM(dx*dx) AS sxx, SUM(dx*dy) AS sxy,
/// SUM(dy*dy) AS syy with dx = x - mean_x, dy = y - mean_y in double precision, then MIN and
/// MAX of x and of y (a constant x or y in a stratum is then known exactly, whatever the
/// rounding of the sums). The means are written with 17 significant digits (exact round
/// trip); a non-finite mean is written as 0. With `cells_first` the sums are first taken per
/// joint cell of the strata (a parallel aggregate) and the sets then add the cells' sums (and
/// take MIN/MAX of their MIN/MAX): the same columns, worth it when the cells are far fewer than
/// the rows (as profile_sql's cells_first).
std::string slope_moments_sql(const std::string& from, const std::string& x, const std::string& y,
                              const std::vector<std::string>& strata, double mean_x, double mean_y,
                              bool cells_first = false);

/// One row for the HC3 robust SE of the pooled slope (as core/stats/regression.h's hc3_slope_se):
/// SUM(u * u) with u = xt e / (1 - h), xt = x - mean_x, e = (y - mean_y) - slope xt,
/// h = inv_w + xt² inv_sxx over the rows with x and y present, and MIN(1 - h) (the SE is
/// undefined when it is not positive). Numbers as in slope_moments_sql.
std::string slope_hc3_sql(const std::string& from, const std::string& x, const std::string& y, double mean_x,
                          double mean_y, double slope, double inv_w, double inv_sxx);

}  // namespace foldline::sql
