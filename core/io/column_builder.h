#pragma once
// One column built cell by cell, for the readers that see a file's cells one at a time
// (statistical files, spreadsheets). It gives the same Column the CSV reader gives for the same
// text: a text cell equal to a missing marker is missing; a column is Numeric when every
// non-missing cell is a number (a number cell, or text that parse_number reads as one),
// otherwise Categorical with levels in order of first appearance, number cells written in
// their shortest round-trip form ("3", "0.1"). A column with no non-missing cell is Numeric
// (all NaN).
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/io/level_dictionary.h"
#include "core/table/table.h"

namespace foldline {

class ColumnBuilder {
public:
    ColumnBuilder(std::string name, const std::vector<std::string>* missing_markers);
    ColumnBuilder(ColumnBuilder&&) noexcept = default;
    ColumnBuilder& operator=(ColumnBuilder&&) noexcept = default;

    /// A number cell; NaN is a missing cell.
    void add_number(double v);
    /// A text cell: a missing marker → missing; text parse_number reads → that number.
    void add_text(std::string_view text);
    /// A text cell that is never read as a number (a value label, a date): a level, or missing
    /// when it equals a missing marker.
    void add_level(std::string_view text);
    void add_missing();
    std::size_t size() const { return values_.size(); }
    const std::string& name() const { return name_; }
    void rename(std::string name) { name_ = std::move(name); }

    /// The finished column. `forced` (a type override): Categorical writes numbers as levels;
    /// Numeric with a text cell is an Error naming the 1-based data row (plus `row_offset`).
    Result<Column> finish(std::optional<ColumnType> forced, const std::string& source, std::size_t row_offset) &&;

private:
    static constexpr std::uint32_t kNumber = 0xFFFFFFFFu;
    static constexpr std::uint32_t kMissing = 0xFFFFFFFEu;
    std::string name_;
    const std::vector<std::string>* markers_;
    std::vector<double> values_;       ///< the number; NaN for text and missing cells
    std::vector<std::uint32_t> text_;  ///< code in dict_, kNumber or kMissing
    LevelDictionary dict_;
    bool any_text_ = false;
    bool any_level_only_ = false;
};

/// Unique, non-empty column names (as the CSV reader makes them): an empty name becomes
/// "column_N", a repeated one "name_2"; each rename is added to `warnings`.
std::vector<std::string> unique_column_names(std::vector<std::string> names, std::vector<std::string>& warnings);

/// Finishes the builders into a Table from `source`: type overrides (each must name a column),
/// the count column (must exist, be numeric, non-missing, whole, 0 … 2^53) moved to weights.
/// `row_offset` turns a 0-based data row into the row number used in messages (e.g. 2 when the
/// header is row 1 of a sheet). An Error names the column and what was expected.
Result<Table> finish_table(std::vector<ColumnBuilder>& columns, const std::string& source,
                           const std::string& count_column,
                           const std::map<std::string, ColumnType>& type_overrides, std::size_t row_offset);

/// Shortest text that reads back as exactly `v` ("3", "0.1", "-2.5e-07").
std::string number_to_text(double v);

}  // namespace foldline
