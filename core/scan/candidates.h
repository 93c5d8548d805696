#pragma once
// Which columns are tried as stratifiers, and why the others are left out. Shared by the rate
// and the slope scans.
#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/column_profile.h"
#include "core/table/table.h"

namespace foldline {

struct CandidateOptions {
    std::vector<std::string> columns;   ///< empty = every column ("--strata auto")
    std::size_t max_levels = 50;        ///< categorical candidates need 2..max_levels levels
    int bins = 4;                       ///< quantile bins for numeric columns; < 2 = leave them out
    double max_missing_share = 0.5;     ///< more missing than this: "mostly missing"
    unsigned threads = 0;               ///< threads converting numeric columns (0 = hardware concurrency)
};

/// A stratifier ready for counting: always a categorical column (codes + levels).
struct Candidate {
    std::string name;     ///< the source column's name
    std::string origin;   ///< "categorical", "integer levels" or "quantile bins (N)"
    const Column* column = nullptr;          ///< the categorical column to count over
    std::shared_ptr<const Column> derived;   ///< owns `column` when it was derived from a numeric one
};

struct Exclusion {
    std::string column;
    std::string reason;  ///< plain words: "constant", "one value per row", "too many levels (83 > 50)", ...
};

struct CandidateSet {
    std::vector<Candidate> candidates;  ///< in table column order
    std::vector<Exclusion> excluded;    ///< every other column except the skipped ones
};

/// exclusion_reason (core/table/column_profile.h) with the options' limits: the words of every
/// scan path (table, grouping-set cells, database profile) for a column left out before counting.
inline std::optional<std::string> exclusion_reason(const ColumnProfile& p, const CandidateOptions& o) {
    return exclusion_reason(p, o.max_levels, o.max_missing_share);
}

/// Selects candidates among the table's columns, never those named in `skip` (outcome,
/// exposure). Categorical columns qualify with 2..max_levels levels in use; numeric columns with
/// integer values and at most max_levels distinct values become one level per value; other
/// numeric columns are cut into quantile bins (left out when bins < 2). A column is left out,
/// with its reason, when exclusion_reason says so (mostly missing, counted in Σ weights for a
/// pre-counted table; constant; a different value in every row, row-level tables only; too
/// many levels), when its levels or bins are constant, or when it splits the rows exactly as `identity_with`
/// does (pass the exposure column; nullptr skips that check). An explicit list naming an unknown
/// column is an error. The table must outlive the result (candidates point into it).
Result<CandidateSet> select_candidates(const Table& table, const std::vector<std::string>& skip,
                                       const CandidateOptions& options,
                                       const Column* identity_with = nullptr);

/// True when the two categorical columns partition the rows the same way (a one-to-one map
/// between their non-missing codes on every row where both are present, and missing together).
/// False for a numeric column or different lengths; true for two empty columns.
bool same_partition(const Column& a, const Column& b);

}  // namespace foldline
