#pragma once
// An audit of a database table or query (`foldline scan --source odbc:... --table T | --query
// "SELECT ..."`; the workbench's database source). A rate question is counted by one GROUPING SETS query whose cells become the
// scan's count cubes (core/scan/grouped_cubes.h); other questions load the pushed-down joint
// cells as a pre-counted Table (core/io/odbc_source.h). Either way the source is described for
// the JSON data block without the credentials.
#include <optional>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/audit/audit_spec.h"
#include "core/common/progress.h"
#include "core/io/source_record.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/table/grouped_counts.h"
#include "core/table/table.h"

namespace foldline::audit {

/// What the reports say about a database source (never a credential).
struct DatabaseInfo {
    std::string description;            ///< "odbc:<redacted connection> table T" / "... query: ..."
    double source_rows = 0;             ///< rows in the source (COUNT(*))
    std::vector<std::string> columns;   ///< every column of the source, in order
    std::vector<Exclusion> left_out;    ///< columns not fetched, with the candidate selection's reason
    double bytes_fetched = 0;
    DatabaseRecord record;              ///< driver, database, table or query, rows, query time (masked connection)
};

struct DatabaseSource : DatabaseInfo {
    Table table;                        ///< pre-counted cells (weights = rows per cell)
};

struct DatabaseCounts : DatabaseInfo {
    GroupedCounts counts;               ///< the cells of every grouping set
    bool numeric_question = false;      ///< outcome and exposure numeric, no positive level: not counted
    std::optional<GroupedMoments> moments;  ///< per-stratum moment sums of the trend, when asked
};

/// Where to read and what to fetch. `required`: outcome, exposure and named stratifiers (always
/// fetched); `all_columns`: also every other column (automatic stratifiers).
struct DatabaseRequest {
    std::string source;                 ///< "odbc:<connection string>"
    std::string table;                  ///< exactly one of table and query
    std::string query;
    std::vector<std::string> required;
    bool all_columns = true;
    std::string count_column;
    std::string where;                  ///< rows filter (core/table/row_filter.h), pushed down as a WHERE condition
};

/// Loads the source's joint cells. Error when the build has no ODBC support, when both or
/// neither of table/query are given, or from the database.
/// A stop request on `work` cancels the running statement (the driver's SQLCancel).
Result<DatabaseSource> load_database_source(const DatabaseRequest& request, const CandidateOptions& options,
                                            const Work& work = {});

/// Counts the grouping sets of a rate question (pooled, each stratifier, each pair when
/// `pairs`). With `may_be_slopes` and a numeric outcome and exposure nothing is counted and
/// numeric_question is set. A `trend_x`/`trend_y` pair (both in request.required) also sums the
/// trend's moments per stratum. Errors as for load_database_source.
/// The pairs of a table with continuous numeric columns come from a second query in which the
/// engine bins them with the cut points the single sets gave (grouped_cubes.h, bin_cuts).
Result<DatabaseCounts> load_database_counts(const DatabaseRequest& request, const CandidateOptions& options,
                                            const QuestionSpec& spec, bool pairs, bool may_be_slopes,
                                            const std::string& trend_x = {}, const std::string& trend_y = {},
                                            const Work& work = {});

/// What an audit of a database reads: the cubes of one GROUPING SETS query (a rate question,
/// with the trend's moment sums), or the joint cells as a pre-counted table when the audit needs
/// rows (a diagram's verdicts over any set, slope resampling, a trend of a pre-counted source, a
/// slope question).
struct DatabaseLoad {
    DatabaseInfo info;
    std::optional<DatabaseCounts> counts;  ///< set: run scan_groups over these
    Table cells;                           ///< otherwise: run scan_table over this table
};

/// Loads what `spec` needs from the database named by `request` (its `required` columns are
/// filled here: the question's, the named strata, the trend's and `extra`, e.g. covariates).
/// A numeric outcome and exposure with no positive level come back as cells (the engine says it
/// is not a rate question). Errors as for load_database_source.
Result<DatabaseLoad> load_for_audit(DatabaseRequest request, const project::AuditSpec& spec,
                                    const std::vector<std::string>& extra, const Work& work = {});

/// Puts `left_out` into `excluded` and orders the list by the columns' positions in `columns`.
void merge_left_out(std::vector<Exclusion>& excluded, const std::vector<Exclusion>& left_out,
                    const std::vector<std::string>& columns);

}  // namespace foldline::audit
