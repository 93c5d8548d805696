#pragma once
// The part each variable plays relative to the question "total effect of X on Y", and whether
// that effect is identifiable by covariate adjustment from the observed variables.
//
// Definitions (X, Y single nodes; An/De exclusive of the node itself; "via" paths avoid X):
//   mediator              on a directed path X → … → Y                    (Cn in adjustment.h)
//   outcome_descendant    a descendant of Y
//   mediator_descendant   a descendant of a mediator, off the causal paths
//   confounder            a cause of X and, along a path avoiding X, of Y
//   collider              has one parent on X's side (X, its causes or effects) and another
//                         on Y's side (a cause of Y not through X); conditioning on it opens
//                         a path between X and Y (e.g. X → C ← U → Y, or M-bias)
//   collider_descendant   a descendant of a collider, none of the above
//   exposure_descendant   an effect of X that is none of the above
//   exposure_cause        a cause of X only (instrument-like)
//   outcome_cause         a cause of Y only, not through X (a precision variable)
//   unrelated             none of these
// The first matching role in this order is the node's role. These follow the usual textbook
// vocabulary (Hernán & Robins, Causal Inference: What If, ch. 6-8; Pearl 2009, ch. 3).
#include <string_view>
#include <vector>

#include "core/causal/diagram.h"

namespace foldline::causal {

enum class Role {
    Exposure,
    Outcome,
    Mediator,
    OutcomeDescendant,
    MediatorDescendant,
    Confounder,
    Collider,
    ColliderDescendant,
    ExposureDescendant,
    ExposureCause,
    OutcomeCause,
    Unrelated,
};

/// snake_case name used in JSON and the CLI: "confounder", "outcome_cause", ...
std::string_view to_string(Role r);
/// Plain words for sentences: "a confounder", "a cause of the outcome only", ...
std::string_view describe(Role r);
/// True for roles that make a set invalid for the total effect whenever they are in it
/// (mediator, mediator_descendant, outcome_descendant).
bool always_biases(Role r);

/// Role of every node (indexed like g) for the effect of x on y. x, y out of range → all Unrelated.
std::vector<Role> assign_roles(const Graph& g, int x, int y);

/// Identifiability of the total effect by adjustment.
struct Identifiability {
    bool identifiable = false;              ///< some set of observed nodes is valid
    std::vector<int> smallest;              ///< a smallest valid observed set (when identifiable)
    std::vector<int> unobserved_needed;     ///< not identifiable: the fewest unobserved nodes that,
                                            ///< if measured, would make a valid set exist
    bool outcome_causes_exposure = false;   ///< Y is an ancestor of X: the diagram says X cannot
                                            ///< affect Y, and no adjustment set exists
};

/// Uses the observed mask of `cg`. x or y out of range → not identifiable, all lists empty.
Identifiability identifiability(const CausalGraph& cg, int x, int y);

}  // namespace foldline::causal
