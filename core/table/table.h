#pragma once
// The columnar table every reader produces and every scan consumes.
//
// Categorical columns are dictionary-encoded: codes[i] indexes levels; the code equal to
// levels.size() marks a missing cell (so the sentinel is always the largest code). Codes use
// the narrowest unsigned width that holds levels.size() + 1 values.
// Numeric columns hold doubles; a missing cell is NaN.
// A pre-counted table carries per-row weights (the count column): each row stands for
// weight[i] observations in every statistic. Row-level tables have an empty weights vector.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <variant>
#include <vector>

namespace foldline {

enum class ColumnType { Categorical, Numeric };

using CodeVector = std::variant<std::vector<std::uint8_t>, std::vector<std::uint16_t>,
                                std::vector<std::uint32_t>>;

struct Column {
    std::string name;
    ColumnType type = ColumnType::Categorical;

    // Categorical payload.
    std::vector<std::string> levels;  ///< level labels in order of first appearance
    CodeVector codes;                 ///< one code per row; levels.size() == missing

    // Numeric payload.
    std::vector<double> values;  ///< one value per row; NaN == missing

    std::size_t missing_count = 0;

    std::size_t size() const;
    bool is_categorical() const { return type == ColumnType::Categorical; }
    bool is_numeric() const { return type == ColumnType::Numeric; }
    /// Code that marks a missing categorical cell.
    std::uint32_t missing_code() const { return static_cast<std::uint32_t>(levels.size()); }
    /// Code of row i (categorical only).
    std::uint32_t code(std::size_t i) const;
    bool is_missing(std::size_t i) const;
    /// Number of distinct non-missing values (levels for categoricals, counted for numerics).
    std::size_t distinct_count() const;
    /// True for a categorical with exactly two levels, or a numeric whose non-missing values
    /// are exactly two distinct numbers.
    bool is_binary() const;

    /// Builds a categorical column, choosing the narrowest code width.
    /// `codes32` uses levels.size() for missing cells.
    static Column categorical(std::string name, std::vector<std::string> levels,
                              const std::vector<std::uint32_t>& codes32);
    static Column numeric(std::string name, std::vector<double> values);
};

/// Calls f(const std::vector<uintN_t>&) with the column's code vector.
template <typename F>
decltype(auto) visit_codes(const Column& c, F&& f) {
    return std::visit(std::forward<F>(f), c.codes);
}

struct Table {
    std::vector<Column> columns;
    std::size_t rows = 0;
    std::vector<double> weights;  ///< empty == every row counts once
    std::string source;           ///< path or description of where the rows came from
    std::string weight_column;    ///< name of the count column, if any (not in `columns`)
    std::string filter;           ///< the rows filter these rows passed (canonical text), empty = none

    bool weighted() const { return !weights.empty(); }
    double weight(std::size_t i) const { return weights.empty() ? 1.0 : weights[i]; }
    /// Sum of weights (== rows for row-level data).
    double total_weight() const;
    /// Index of the column with that name, or nullopt.
    std::optional<std::size_t> find(const std::string& name) const;
    const Column* column(const std::string& name) const;
};

}  // namespace foldline
