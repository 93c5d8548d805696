#pragma once
// Edits of a Diagram that keep it valid, for the diagram editor (the workbench's DiagramDoc
// makes every change through these): each returns an Error (and
// leaves the diagram unchanged) when the edit would make the diagram invalid — a duplicate or
// empty name, an unknown node, a self-loop, a duplicate edge, or a cycle (the message names the
// path that the new edge would close).
#include <string>
#include <string_view>

#include "core/causal/diagram.h"
#include "core/common/error.h"

namespace foldline::causal {

/// Whether a node named `name` could be added, changing nothing: an empty or blank (only
/// spaces) name or one already used → Error.
Status check_new_node(const Diagram& d, std::string_view name);
/// Adds a node, unplaced. The refusals of check_new_node.
Status add_node(Diagram& d, const std::string& name, bool observed = true);
/// Adds a node with its place on the editor's canvas (x, y may be absent). The refusals of
/// check_new_node.
Status add_node(Diagram& d, DiagramNode node);
/// Places a node on the editor's canvas. Unknown name → Error.
Status move_node(Diagram& d, std::string_view name, double x, double y);
/// Renames a node and every reference to it (edges, exposure, outcome). Unknown old name,
/// empty, blank or used new name → Error; renaming to the same name → Ok.
Status rename_node(Diagram& d, std::string_view old_name, const std::string& new_name);
/// Removes a node with its edges; clears exposure/outcome if they named it. Unknown → Error.
Status remove_node(Diagram& d, std::string_view name);
/// Marks a node observed or not. Unknown name, or unobserving the exposure/outcome → Error.
Status set_observed(Diagram& d, std::string_view name, bool observed);
/// Whether from → to could be added, changing nothing: unknown node, self-loop, duplicate, or
/// a cycle (named by its path) → Error.
Status check_new_edge(const Diagram& d, std::string_view from, std::string_view to);
/// Adds from → to. The refusals of check_new_edge.
Status add_edge(Diagram& d, std::string_view from, std::string_view to);
/// Removes from → to. Absent edge → Error.
Status remove_edge(Diagram& d, std::string_view from, std::string_view to);
/// Sets the question. Empty name clears it; unknown or unobserved node, or the same node for
/// both → Error.
Status set_question(Diagram& d, std::string_view exposure, std::string_view outcome);

}  // namespace foldline::causal
