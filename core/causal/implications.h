#pragma once
// The conditional independences a diagram implies among its observed columns: the claims the
// data can contradict.
//
// One claim per pair of observed nodes that no arrow joins (in a DAG every such pair is
// d-separated by the parents of one of the two: the local Markov property, Lauritzen et al.
// 1990). The conditioning set is chosen in this order:
//   1. parents: the parents of one node of the pair when that node is not an ancestor of the
//      other and all its parents are observed (the smaller of the two such sets; on a tie, the
//      parents of the node later in the diagram's order);
//   2. separator: otherwise a smallest set of observed nodes that d-separates the pair (a
//      minimum vertex cut, core/causal/separators.h);
//   3. untestable: when no set of observed nodes separates the pair, the claim is kept with a
//      smallest separating set over all nodes, which names at least one unobserved node.
// Pairs with an unobserved member are not listed: they say nothing about the columns.
#include <string>
#include <vector>

#include "core/causal/diagram.h"
#include "core/causal/graph.h"

namespace foldline::causal {

enum class ClaimForm { Parents, Separator, Untestable };

/// "parents", "separator" or "untestable".
const char* to_string(ClaimForm f);

struct Implication {
    int a = -1;              ///< the pair, a < b (node indices)
    int b = -1;
    std::vector<int> given;  ///< conditioning set, sorted by index
    ClaimForm form = ClaimForm::Parents;
};

/// Every claim of the diagram, ordered by (a, b). A graph with fewer than two observed nodes,
/// or whose observed nodes are all adjacent, gives an empty list. `observed` has g.size() entries.
std::vector<Implication> implied_independences(const Graph& g, const NodeMask& observed);

/// The same for a validated diagram (its observed mask).
std::vector<Implication> implied_independences(const CausalGraph& cg);

}  // namespace foldline::causal
