#pragma once
// Edits of a Diagram that keep it valid, for the diagram editor: each returns an Error (and
// leaves the diagram unchanged) when the edit would make the diagram invalid — a duplicate or
// empty name, an unknown node, a self-loop, a duplicate edge, or a cycle (the message names the
// path that the new edge would close).
#include <string>
#include <string_view>

#include "core/causal/diagram.h"
#include "core/common/error.h"

namespace foldline::causal {

/// Adds a node. Empty or already used name → Error.
Status add_node(Diagram& d, const std::string& name, bool observed = true);
/// Renames a node and every reference to it (edges, exposure, outcome). Unknown old name,
/// empty or used new name → Error; renaming to the same name → Ok.
Status rename_node(Diagram& d, std::string_view old_name, const std::string& new_name);
/// Removes a node with its edges; clears exposure/outcome if they named it. Unknown → Error.
Status remove_node(Diagram& d, std::string_view name);
/// Marks a node observed or not. Unknown name, or unobserving the exposure/outcome → Error.
Status set_observed(Diagram& d, std::string_view name, bool observed);
/// Adds from → to. Unknown node, self-loop, duplicate, or a cycle → Error.
Status add_edge(Diagram& d, std::string_view from, std::string_view to);
/// Removes from → to. Absent edge → Error.
Status remove_edge(Diagram& d, std::string_view from, std::string_view to);
/// Sets the question. Empty name clears it; unknown or unobserved node, or the same node for
/// both → Error.
Status set_question(Diagram& d, std::string_view exposure, std::string_view outcome);

}  // namespace foldline::causal
