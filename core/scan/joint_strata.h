#pragma once
// The joint strata of any set of columns, for standardising over an adjustment set that a
// causal diagram names (which may hold more than the one or two columns a scan pairs).
#include <cstddef>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline {

/// A categorical column whose levels are the observed combinations of `names`' levels, labelled
/// "a | b | c". Numeric columns are cut as the scan cuts candidates (one level per whole-number
/// value when there are at most `max_levels`, else `bins` quantile bins). A row missing any of
/// the columns is missing. Empty `names` gives one level "(all)" holding every row.
/// Errors: a name that is not a column, a numeric column that cannot be cut, or more joint
/// levels than fit in 32 bits.
Result<Column> joint_stratifier(const Table& table, const std::vector<std::string>& names, int bins = 4,
                                std::size_t max_levels = 50);

}  // namespace foldline
