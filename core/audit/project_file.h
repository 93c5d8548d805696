#pragma once
// The audit project file, NAME.foldline: our own versioned JSON (documented in the README,
// "Project files"). It records everything needed to re-run and re-read an audit — where the data
// are and what they looked like (size, SHA-256, rows, columns, how to read them), the question,
// the scan settings and seed, the causal diagram(s), the reviewer's decisions and notes, and the
// memo settings — and never a data row.
//
// Paths: in memory `DataSource::path` is usable as is (absolute, or relative to the current
// folder); on disk it is stored relative to the project file's folder, so a project moved
// together with its data still opens. Output is deterministic (sorted keys, 2-space indent,
// trailing newline): save → load → save gives the same bytes.
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/audit/audit_spec.h"
#include "core/causal/diagram.h"
#include "core/common/error.h"
#include "core/io/source_record.h"
#include "core/io/csv_reader.h"
#include "core/io/table_reader.h"
#include "core/scan/finding_class.h"
#include "core/table/table.h"

namespace foldline::project {

/// The newest project version this build reads. A project is written with the lowest version
/// that holds it: 1 for a rate audit, 2 when it holds a slope question, trend checks or slope
/// settings (see required_version), 3 when it holds a rows filter or a mean-gap question, so
/// builds that read an older version refuse what they would misread instead of dropping the
/// trend, scanning every row or reading a mean gap as a rate.
inline constexpr int kProjectVersion = 3;
inline constexpr std::string_view kProjectFormat = "foldline-project";

/// Identifies a finding across re-runs: kind ("rate" or "slope"), stratifier column names in
/// order, and the comparison ("B vs A" for rates; "y on x" for slopes).
struct FindingKey {
    std::string kind = "rate";
    std::vector<std::string> strata;
    std::string comparison;
    auto operator<=>(const FindingKey&) const = default;
};

/// "rate: product × branch (B vs A)". Empty key → "rate:  ()".
std::string describe(const FindingKey& key);

/// The key of a rate finding: kind "rate", its strata, comparison "FOCAL vs REFERENCE".
FindingKey rate_key(const std::vector<std::string>& strata, const std::string& focal, const std::string& reference);
/// The key of a slope finding: kind "slope", its strata, comparison "Y on X".
FindingKey slope_key(const std::vector<std::string>& strata, const std::string& x, const std::string& y);
/// Key of a mean-gap finding: kind "mean", comparison "y: FOCAL vs REFERENCE".
FindingKey mean_key(const std::vector<std::string>& strata, const std::string& y, const std::string& focal,
                    const std::string& reference);

struct FindingReview {
    FindingKey key;
    std::optional<FindingClass> saved_class;  ///< class when the project was last saved
    Decision decision = Decision::Undecided;
    std::string note;                         ///< free text, any UTF-8
    std::optional<bool> in_memo;              ///< absent: the memo's default rule decides
    /// The label of the family lead whose decision the reviewer applied to this finding
    /// ("product"); empty when the finding was decided on its own. A version 3 key.
    std::string applied_from;
};

enum class PageSize { A4, Letter };
/// "A4" or "Letter".
std::string_view to_string(PageSize p);

struct MemoSettings {
    std::string title;    ///< empty: "Audit of DATA"
    std::string analyst;
    PageSize page_size = PageSize::A4;
    /// "flagged": every finding whose class is not stable, unless in_memo is false;
    /// "chosen": only findings with in_memo true.
    std::string findings = "flagged";
    /// "families": one section per family lead, its related findings in a table inside it;
    /// "full": one section per finding. Version 3 key, written only when "full".
    std::string detail = "families";
};

/// The audit project: the audit's specification (core/audit/audit_spec.h: source, question,
/// scan settings, diagrams) and what the reviewers added — decisions, notes, memo settings.
struct Project : AuditSpec {
    std::vector<FindingReview> reviews;  ///< sorted by key when saved
    MemoSettings memo;

    /// The review for a key; nullptr when the reviewer never touched that finding.
    const FindingReview* review(const FindingKey& key) const;
    FindingReview& review_for(const FindingKey& key);  ///< adds an empty review when absent
};

/// 1 when the project is a plain rate audit of a file; 2 when it holds a slope question, trend
/// checks, covariates, a slope bootstrap or a database source; 3 when it holds a mean-gap
/// question (or another version 3 key: a rows filter, a sheet, a decimal mark, a memo detail, a
/// decision applied from a family lead). A default project → 1.
int required_version(const Project& p);

/// The JSON text of a project saved at `project_path` (data path made relative to its folder).
/// Never fails; an empty project gives a valid document.
std::string project_to_json_text(const Project& p, const std::string& project_path);

/// Parses project JSON text read from `project_path` (data path resolved against its folder).
/// Errors: not JSON (line and column), another format, a newer version ("written by a newer
/// Foldline"), a missing or mistyped field (named by its JSON path), a slope question or trend
/// without its columns. Empty text → Error.
Result<Project> parse_project(std::string_view text, const std::string& project_path);

/// Reads and parses a project file. Unreadable file → Error naming it.
Result<Project> load_project(const std::string& project_path);

/// Writes the project atomically (temporary file, then rename). Missing or read-only folder →
/// Error naming the file and the reason; the previous file is then left as it was.
Status save_project(const Project& p, const std::string& project_path);

/// How the data file on disk differs from what the project recorded.
struct DataChange {
    bool missing = false;        ///< the file cannot be read
    bool changed = false;        ///< size or SHA-256 differ
    std::string sha256_before, sha256_now;
    std::uint64_t size_before = 0, size_now = 0;
    bool rows_known = false;     ///< rows_now / columns compared (the file was read)
    std::uint64_t rows_before = 0, rows_now = 0;
    std::vector<std::string> columns_added, columns_removed;
    /// One plain paragraph: "unchanged", or what changed ("the data file changed since the
    /// project was saved: 20,000 → 20,150 rows; new columns: x; missing columns: y").
    std::string message;
};

/// Compares the recorded source with a digest, size and (optionally) the freshly read table.
/// A recorded digest that is empty counts as unchanged. `table` may be nullptr (rows and
/// columns then not compared).
DataChange compare_data(const DataSource& saved, const std::string& sha256_now, std::uint64_t size_now,
                        const Table* table);

/// Hashes the file at saved.path and, when it changed, reads it (with the recorded reading
/// options) to say which rows and columns changed. An unreadable file gives missing = true.
DataChange check_data_file(const DataSource& saved);

/// The reader options the project records (delimiter, missing markers, count column, type
/// overrides, sheet, decimal mark); defaults for a default DataSource.
ReadOptions reading_options(const DataSource& data);

/// Records what the data look like now (size, digest, rows, column names) into `data`.
/// Error when the file cannot be read.
Status record_data(DataSource& data, const Table& table);

}  // namespace foldline::project
