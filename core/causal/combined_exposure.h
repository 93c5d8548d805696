#pragma once
// A diagram for compared groups formed by two or more columns (core/table/combined_column.h):
// the combined exposure is one node whose parents are the parts' parents and whose children are
// the parts' children, so the back-door criterion reads it as one variable.
#include <string>
#include <vector>

#include "core/causal/diagram.h"

namespace foldline::causal {

/// `d` with the nodes named in `parts` replaced by one observed node `name`: every arrow into or
/// out of a part is redirected to it (arrows between parts vanish, duplicates are dropped), its
/// position is the mean of the parts' positions, and the diagram's exposure becomes `name` when
/// it was a part. `d` unchanged when it already has a node `name` or lacks any part.
Diagram combine_exposure(const Diagram& d, const std::vector<std::string>& parts, const std::string& name);

}  // namespace foldline::causal
