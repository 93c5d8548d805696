#pragma once
// Compared groups formed by two or more columns: the exposure `sex+ethnicity` is one categorical
// column whose levels are the combinations that occur, written `female+black` (the parts' levels
// joined by "+", in the parts' order). Each combination is a group; the focal and reference
// groups name combinations.
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline {

/// The separator of parts in a combined name and of levels in a combined level.
inline constexpr char kCombineSeparator = '+';

/// The parts of `name` when it names a combination of the table's columns: `name` is not itself
/// a column, and splitting it at every "+" gives two or more names that all are columns, each
/// once. Empty otherwise (an ordinary column name, or a name that does not resolve).
std::vector<std::string> combined_parts(const Table& table, const std::string& name);
/// The same over a list of column names.
std::vector<std::string> combined_parts(const std::vector<std::string>& columns, const std::string& name);

/// The combined column named `name` over `parts` (columns of `table`): one level per combination
/// that occurs, in order of first appearance, labelled by the parts' labels joined with "+"
/// (a numeric part's value in its shortest round-trip form); missing when any part is missing.
/// Error when a part is not a column, there are fewer than two parts, or the combinations exceed
/// 65,535.
Result<Column> combine_columns(const Table& table, const std::vector<std::string>& parts, const std::string& name);

}  // namespace foldline
