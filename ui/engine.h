#pragma once
// The one place the workbench calls the engines in core/: loading, the question, the scan and
// the causal verdict. Everything returns plain values; nothing here touches widgets, so every
// call may run on a worker thread.
#include <QImage>
#include <QString>
#include <QStringList>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/io/decimal_mark.h"
#include "core/io/source_record.h"
#include "core/table/table.h"
#include "core/audit/audit_spec.h"
#include "core/causal/diagram_check.h"
#include "ui/diagram_doc.h"
#include "ui/finding_view.h"

namespace foldline {
struct ScanResult;
}

namespace foldline::causal {
struct Diagram;
}

namespace foldline::project {
struct Project;
}

namespace foldline::ui {

struct LoadOptions {
    QString count_column;              ///< empty: row-level data
    QStringList missing_markers;       ///< empty: the reader's defaults
    std::map<std::string, ColumnType> type_overrides;
    QString sheet;                     ///< workbooks: the sheet to read; empty = the first
    DecimalMark decimal = DecimalMark::Auto;  ///< decimal mark of numbers written as text
};

/// True when this build has the CSV reader.
bool reader_available();
/// Reads a data file of any format core/io/table_reader.h knows; an Error names file, line and
/// column. Honours work.stop. `notices` (when given) receives the reader's warnings and how
/// each column's numbers were read (decimal commas, ambiguous columns).
Result<Table> load_table(const QString& path, const LoadOptions& opts, const Work& work,
                         QStringList* notices = nullptr);

/// A database table or query as the workbench asks for it. The password lives here only for
/// the call: it is never saved, shown or written into a report.
struct DatabaseRequest {
    QString connection;    ///< ODBC connection string ("DSN=...;" or "Driver=...;..."), without a password
    QString password_env;  ///< name of an environment variable holding the password (may be empty)
    QString password;      ///< typed into a masked field (may be empty; wins over password_env)
    QString table;         ///< exactly one of table and query
    QString query;         ///< one read-only SELECT or WITH statement
};

/// True when this build has database sources (unixODBC).
bool database_available();
/// Problems with a database request in plain sentences; empty when it can be sent. Names: no
/// connection string, a password written into the connection string, both or neither of table
/// and query, a table name with an empty part, a query that is not one read-only statement, an
/// environment variable that is not set.
QStringList check_database_request(const DatabaseRequest& request);
/// The connection string with every password masked (safe to show and to save); "" stays "".
QString masked_connection(const QString& connection);
/// Counts the source's joint cells in the engine and returns them as a pre-counted Table
/// (weights = rows per cell) over every column a scan may use; `record` (optional) receives
/// what the memo and project record (driver, database, table or query, rows, query time,
/// masked connection). A stop request cancels the running statement (the driver's cancel).
/// Errors name the SQLSTATE and the driver's words; a build without ODBC is an Error.
Result<Table> load_database(const DatabaseRequest& request, const Work& work, DatabaseRecord* record = nullptr);

/// What the Question step edits. audit_spec() and question_spec() map it to and from the audit's
/// specification (core/audit), so the workbench runs exactly what `foldline run` runs.
struct QuestionSpec {
    bool slope = false;             ///< false: rates of a binary outcome between two groups;
                                    ///< true: trend of numeric `outcome` (y) on numeric `exposure` (x)
    QString outcome, positive;      ///< binary outcome and its positive level
    QString exposure, focal, reference;
    QStringList candidates;         ///< chosen stratifiers
    bool all_candidates = false;    ///< the saved audit's "auto": every column that qualifies
    QStringList covariates;         ///< trend only: numeric columns the slopes are adjusted for
    bool pairs = true;
    int bins = 4;
    std::uint64_t max_levels = 50;  ///< categorical candidates need 2..max_levels levels
    double alpha = 0.05;
    int bootstrap = 200;            ///< resamples: the rate bootstrap, or a trend's slope bootstrap
    std::uint64_t seed = 1;
    bool find_groups = false;       ///< trend only: the hidden-group hint
    bool mean = false;              ///< means of numeric `outcome` between two groups (slope false)
    bool log_outcome = false;       ///< means only: analyse log(outcome), gaps also as percentages
    bool pay_gap = false;           ///< means only: pay-gap conventions (% of reference, medians, 5% flags)
    QString rows;                   ///< rows to include (docs/filter.md); empty = every row
};

/// The audit the workbench runs: `base` (the opened project's specification: data, trend checks,
/// diagrams, the other kind's resample count) with the Question step's settings over it.
project::AuditSpec audit_spec(const QuestionSpec& q, const project::AuditSpec& base);
/// The Question step's settings of a saved audit (the inverse of audit_spec on what it edits).
QuestionSpec question_spec(const project::AuditSpec& spec);

/// A column and whether it may stratify; `reason` says why not.
struct CandidateView {
    QString column;
    bool usable = true;
    QString reason;
    QString origin;  ///< how a usable column is cut into strata ("quantile bins (4)", ...)
};

/// The parts of a rate question's groups formed by several columns (`sex+ethnicity` →
/// sex, ethnicity; core/table/combined_column.h); empty for an ordinary groups column or a trend.
QStringList combined_group_parts(const Table& t, const QuestionSpec& q);
/// The combined groups column of such a question (one level per combination that occurs).
/// Error when the exposure combines no columns of `t`, or the combinations are too many.
Result<Column> combined_groups_column(const Table& t, const QuestionSpec& q);

/// Columns that could stratify the question, each with the reason any is left out (the outcome,
/// the groups, the parts of combined groups and, for a trend, its covariates never stratify).
/// `combined`: the combined groups column when the caller holds it (computed here otherwise).
/// Empty table → empty list.
std::vector<CandidateView> propose_candidates(const Table& t, const QuestionSpec& q, const Column* combined = nullptr);
/// Problems with the question in plain sentences; empty when the scan can run. `combined` as for
/// propose_candidates.
QStringList check_question(const Table& t, const QuestionSpec& q, const Column* combined = nullptr);

/// True when this build has the rate scan.
bool scan_available();

/// A finished scan as the workbench shows it.
struct ScanOutcome {
    std::shared_ptr<const Table> table;  ///< the rows scanned: the source's, or those the rows filter kept
    std::vector<FindingView> findings;  ///< ranked: class, q-value, size of the change
    QStringList excluded;               ///< "column: reason"
    bool cancelled = false;
    std::shared_ptr<const ScanResult> result;  ///< the engine's own result (rates or slopes), for the memo
};

/// The hidden-group hint of a trend audit (ScanResult::latent's note, core's words); empty when
/// the audit did not ask for it or `r` is null.
QString hidden_group_note(const ScanResult* r);

/// What the PDF memo is made from, beyond the scan itself.
struct MemoRequest {
    std::shared_ptr<const ScanResult> scan;  ///< a finished rate or slope scan; null → Error
    QString data_path;                       ///< the data's path, or its display name when no file
    double rows = 0;
    /// The audit as it would be saved (MainWindow::current_project): title, analyst, page size,
    /// decisions, notes, memo choices and the diagram. When set, `reviewed`, `diagram` and
    /// `title` are not used.
    const project::Project* project = nullptr;
    const Table* table = nullptr;            ///< the rows, for the trend charts; null → no trend charts
    std::vector<FindingView> reviewed;       ///< findings with the reviewer's decisions and notes
    const causal::Diagram* diagram = nullptr;///< the diagram as drawn (verdicts), or null
    bool draft_diagram = false;              ///< a diagram was drawn but not confirmed (no verdicts; the memo says so)
    /// The diagram's checks as the Diagram step computed them on a worker; when set they replace
    /// the scan's (the memo never tests claims itself).
    std::optional<causal::DiagramChecks> diagram_checks;
    QString title;
    QString date;                            ///< YYYY-MM-DD; empty → today
    QString data_change;                     ///< how the data changed since the project was saved
    std::optional<DatabaseRecord> database;  ///< a database source: recorded instead of a file digest
};

/// Writes the memo as a PDF (atomically) through core/report and ui/memo — the same content
/// builder and writer `foldline memo` uses. Error names the file; no scan → Error.
Status export_memo(const MemoRequest& request, const QString& path);

/// Page 1 of the memo `request` would write, `width_px` wide, for the preview beside the menu
/// action. Null image when there is no scan or width_px <= 0.
QImage memo_preview(const MemoRequest& request, int width_px);

/// Runs the audit (core/audit/run_audit.h, as `foldline run` does). Each rate finding is handed
/// to `on_provisional` as soon as it is computed (from the calling thread; class still decided on
/// the raw p, before the FDR step and the bootstrap); the result holds the final, ranked findings
/// (trend checks and the hidden-group hint included). Honours work.stop (cancelled set).
/// With a rows filter in `spec` the scan runs on the rows it keeps, which ScanOutcome::table holds.
Result<ScanOutcome> run_scan(std::shared_ptr<const Table> source, const project::AuditSpec& spec, const Work& work,
                             const std::function<void(FindingView)>& on_provisional);

/// The diagram's verdict for the finding compared by `exposure` and `outcome` and stratified by
/// `strata`, with the estimate it points to, computed by core/audit exactly as `foldline run`'s
/// verdicts are (the audit's bins and level limit; `scan` and `table` may be null before a scan:
/// then no estimate). The words the diagram step shows; `computed` false with `problem` set when
/// the diagram cannot judge.
DiagramVerdict judge(const causal::Diagram& diagram, const QString& exposure, const QString& outcome,
                     const QStringList& strata, const ScanResult* scan, const Table* table,
                     const project::AuditSpec& spec);

}  // namespace foldline::ui
