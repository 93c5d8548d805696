#pragma once
// The audit's specification: where the data are and how to read them, the question, the scan
// settings and seed, the trend checks and the causal diagrams. It is what both front ends run
// (core/audit/run_audit.h) and what the project file records (core/audit/project_file.h: a
// Project is an AuditSpec plus the reviewers' decisions, notes and memo settings), so the
// mapping between the two is lossless by construction.
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/causal/diagram.h"
#include "core/io/source_record.h"
#include "core/table/table.h"

namespace foldline::project {

struct DataSource {
    std::string path;            ///< in memory: usable path; on disk: relative to the project folder
    std::uint64_t size = 0;      ///< bytes when saved
    std::string sha256;          ///< hex digest when saved; empty = never hashed
    std::uint64_t rows = 0;      ///< data rows when saved (for the "what changed" message)
    std::vector<std::string> columns;  ///< column names when saved (the count column excluded)
    std::string count_column;    ///< empty: row-level data
    char delimiter = 0;          ///< 0 = detect
    std::vector<std::string> missing_markers = {"", "NA", "N/A", "NULL", "."};
    std::map<std::string, ColumnType> type_overrides;
    std::optional<DatabaseRecord> database;  ///< a database source (no size or digest then); never a credential
};

/// What the audit compares: a rate between groups, or the slope of a numeric outcome on a
/// numeric exposure (a trend audit).
enum class QuestionKind { Rate, Slope };
/// "rate" or "slope".
std::string_view to_string(QuestionKind k);

struct QuestionSettings {
    QuestionKind kind = QuestionKind::Rate;  ///< absent in a version 1 file: rate
    std::string outcome;                   ///< slope: the numeric outcome y
    std::optional<std::string> positive;   ///< absent: the reader's default rule
    std::string exposure;                  ///< slope: the numeric exposure x
    std::vector<std::string> focal;        ///< empty: every level except the reference
    std::optional<std::string> reference;  ///< absent: the most frequent level
    std::vector<std::string> covariates;   ///< slope: numeric columns adjusted for (may be empty)
    std::string rows;                      ///< rows to include (core/table/row_filter.h); empty = every row
};

/// Slope checks added to a rate audit (`scan --trend X:Y`): the slope of y on x within each
/// single stratifier of the rate question.
struct TrendSettings {
    std::string x, y;
    std::vector<std::string> covariates;  ///< numeric columns adjusted for (may be empty)
    auto operator<=>(const TrendSettings&) const = default;
};

struct ScanSettings {
    std::vector<std::string> strata;  ///< empty = auto (every qualifying column)
    bool pairs = true;
    int bins = 4;
    std::uint64_t max_levels = 50;
    double alpha = 0.05;
    int bootstrap = 1000;
    std::uint64_t seed = 20240601;
    int slope_bootstrap = 0;  ///< resamples for the stability of flagged slope findings; 0 = none
    bool find_groups = false; ///< trend audits: fit the hidden-group hint (Gaussian mixtures of x, y)
};

/// The range of each scan setting, shared by the project file reader, `foldline scan` and the
/// workbench (one rule, so a project that opens in one opens in the other with the same figures).
namespace limits {
inline constexpr int kMaxBins = 1000;                      ///< bins: 0 (off) .. kMaxBins
inline constexpr double kMinMaxLevels = 2, kMaxMaxLevels = 1e6;
inline constexpr double kMinAlpha = 1e-12, kMaxAlpha = 0.5;  ///< alpha in [kMinAlpha, kMaxAlpha]
inline constexpr int kMaxBootstrap = 1000000;              ///< resamples: 0 .. kMaxBootstrap
}  // namespace limits

/// Problems with scan settings in plain sentences (bins, max_levels, alpha, bootstrap,
/// slope_bootstrap out of range); empty when every setting is in range. Every seed is valid.
std::vector<std::string> settings_problems(const ScanSettings& s);

struct NamedDiagram {
    std::string name;  ///< the reviewer's label ("as drawn", "alternative: no income path", ...)
    causal::Diagram diagram;
};

/// The audit's specification (see the top of this file).
struct AuditSpec {
    DataSource data;
    QuestionSettings question;
    ScanSettings scan;
    std::vector<NamedDiagram> diagrams;
    std::string active_diagram;  ///< name of the diagram used for verdicts; empty = the first
    std::optional<TrendSettings> trend;  ///< absent: no slope checks beside a rate question

    /// The diagram used for verdicts: the one named active_diagram, else the first; nullptr
    /// when there is none.
    const causal::Diagram* diagram() const;
};

}  // namespace foldline::project

namespace foldline::audit {
using project::AuditSpec;
}  // namespace foldline::audit
