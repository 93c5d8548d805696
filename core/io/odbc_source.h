#pragma once
// A database table (or one read-only query) as a scan source, through ODBC (unixODBC). The
// counting is pushed down and only summaries come back, in one of two shapes:
//   read_odbc_groups  one GROUP BY GROUPING SETS query: the cells of every count cube a rate
//                     scan needs (core/table/grouped_counts.h; core/scan/grouped_cubes.h turns
//                     them into cubes), and for a trend the per-stratum moment sums;
//   read_odbc_cells   the joint cells of every column kept, as a pre-counted Table (one row per
//                     distinct combination, weights = COUNT(*)), for work that needs rows.
// Either way every statistic equals that of a scan of a CSV export of the same rows.
//
// Read-only by construction: only SELECT statements are sent (the user's query is checked and
// wrapped, see core/io/sql_pushdown.h) and the connection is put in read-only access mode.
// Credentials come only from the connection string the caller passes or the environment
// variable FOLDLINE_ODBC_PASSWORD (added as PWD= when the string has none, see
// core/io/odbc_connection.h); the source description kept for reports never contains them.
//
// Built only when unixODBC is found (CMake option FOLDLINE_ODBC; FOLDLINE_HAS_ODBC is then 1).
#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/odbc_connection.h"
#include "core/io/sql_pushdown.h"
#include "core/table/grouped_counts.h"
#include "core/table/table.h"

namespace foldline {

struct OdbcOptions {
    std::string connection;         ///< ODBC connection string, "DSN=...;" or "Driver=...;...", "odbc:" prefix allowed
    sql::SqlSource source;          ///< table or read-only query
    std::vector<std::string> required;  ///< columns always fetched (outcome, exposure, named stratifiers)
    bool all_columns = true;        ///< also every other groupable column (automatic stratifiers)
    std::size_t max_levels = 50;    ///< text columns above this many distinct values are left out (all_columns)
    double max_missing_share = 0.5; ///< columns missing in more of the rows are left out (all_columns)
    bool first_appearance = true;   ///< levels in order of first appearance (MIN(ctid) of a PostgreSQL table, else ROW_NUMBER() OVER ())
    long timeout_seconds = 0;       ///< per-statement timeout; 0 = none
    std::string count_column;       ///< pre-counted source: rows per source row (summed, never fetched as a column)
    std::vector<std::string> where_columns;  ///< columns source.where reads (checked to exist in the source)
};

/// A column that was not fetched, and why (same wording as the candidate selection).
struct OdbcLeftOut {
    std::string column;
    std::string reason;
};

/// Where the counts came from, for reports (never a credential).
struct OdbcSourceInfo {
    std::vector<std::string> source_columns;  ///< every column of the source, in its order
    std::vector<OdbcLeftOut> left_out;    ///< columns of the source not fetched, in source order
    double source_rows = 0;               ///< COUNT(*) of the source
    std::string driver;                   ///< driver name and version as the driver reports them
    std::string database;                 ///< database (catalog) name
    std::string source_text;              ///< table name or the query text
    std::string queried_at;               ///< UTC time the counting query started, ISO 8601
    std::vector<std::string> statements;  ///< every statement sent, in order
    double bytes_fetched = 0;             ///< bytes of result data received (cell values and counts)
};

struct OdbcTable : OdbcSourceInfo {
    Table table;                          ///< the cells: weights = rows per cell
};

/// A trend of y on x checked beside a rate question: its moment sums are pushed down too.
struct OdbcSlope {
    std::string x;  ///< numeric exposure column; empty = no slope
    std::string y;  ///< numeric outcome column
};

/// Which stratifiers enter the pair sets and how the engine bins each numeric one (ascending
/// cut points, as sql::CubesQuery::cuts; an empty entry keeps the values).
struct PairPlan {
    std::vector<std::string> strata;
    std::vector<std::vector<double>> cuts;
};
/// Decides the pair sets from the pooled and single-stratifier cells.
using PairPlanner = std::function<Result<PairPlan>(const GroupedCounts& singles)>;

/// The cells of every grouping set of a rate question (core/table/grouped_counts.h).
struct OdbcGroups : OdbcSourceInfo {
    GroupedCounts counts;
    std::optional<GroupedMoments> moments;  ///< with an OdbcSlope: per-stratum moment sums of y on x
    /// The outcome and the exposure are both numeric and no positive outcome level was given: a
    /// slope question may be meant, so no counting query was sent (counts are empty).
    bool numeric_question = false;
};

/// Connects, discovers the columns (a `WHERE 1 = 0` describe), profiles them (rows, present and
/// distinct values, sql::profile_sql), fetches the joint cells of the columns kept and builds the pre-counted Table.
/// On PostgreSQL two small statements come first: a pg_class query (may a table's row ids order
/// its rows, for first appearance without numbering them) and an EXPLAIN (does the planner
/// expect few joint cells, for the profile's and the trend sums' cells_first).
/// Errors (as values, with the driver's SQLSTATE and message): no connection, a lost
/// connection, a permission error, a missing table or column, a column type the engine cannot
/// group by, a refused query, a required column absent from the source. A stop request
/// cancels the running statement (SQLCancel) and returns an error "cancelled". An empty source
/// gives a Table with no rows. Progress reports statements done out of 3.
Result<OdbcTable> read_odbc_cells(const OdbcOptions& options, const Work& work = {});

/// Connects, describes and profiles as read_odbc_cells, then sends one GROUP BY GROUPING SETS
/// query (sql::cubes_sql, first appearance kept) over `outcome`, `exposure` and every other
/// column kept: the pooled cells, the cells of each stratifier and, when `pairs`, of each pair.
/// `options.required` must hold the outcome and the exposure (plus named stratifiers). With
/// `numeric_outcome_question` set and both the outcome and the exposure numeric, stops before
/// counting and returns numeric_question = true. With a `slope` (x and y among
/// options.required), three more statements: the means of x and y (the shift), the centred
/// moment sums per value of every stratifier (sql::slope_moments_sql) and the HC3 sum
/// (sql::slope_hc3_sql). Errors, cancellation and progress as for read_odbc_cells (an empty
/// source gives empty tables); a slope column that is not numeric, a pre-counted source with a
/// slope, or no row with both x and y is an error. With `plan_pairs`, pairs and a numeric
/// stratifier with more than options.max_levels values (or not profiled), the pair sets come
/// from a second GROUPING SETS query over the planned stratifiers, binned in the engine, so a
/// continuous column does not bring its every value into every pair.
Result<OdbcGroups> read_odbc_groups(const OdbcOptions& options, const std::string& outcome,
                                    const std::string& exposure, bool pairs, bool numeric_outcome_question,
                                    const OdbcSlope& slope = {}, const Work& work = {},
                                    const PairPlanner& plan_pairs = {});

}  // namespace foldline
