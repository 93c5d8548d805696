#pragma once
// Minimal d-separators of two node sets, found in the moral graph of their ancestral set
// (Lauritzen et al. 1990; minimal separators lie within An(X ∪ Y): Tian, Paz & Pearl 1998).
//
// Enumeration: polynomial delay by binary partition over "close" separators, the scheme of
// Takata 2010 (Discrete Applied Mathematics 158:1660-1669) as used for adjustment sets by
// van der Zander, Liśkiewicz & Textor 2019 (Artificial Intelligence 270:1-40). Each step costs
// O(V + E_m) (E_m = edges of the moral graph) and at most V steps separate two outputs.
//
// Cheapest separator: a minimum-cost vertex cut (max-flow/min-cut with split vertices,
// Edmonds-Karp), the approach of van der Zander et al. 2019, section on minimum sets.
#include <cstdint>
#include <optional>
#include <vector>

#include "core/causal/graph.h"

namespace foldline::causal {

/// Undirected moral graph of the subgraph induced by An(nodes): parents of a common child are
/// joined and directions dropped. Nodes outside the ancestral set keep empty lists; `member`
/// marks the ancestral set. Empty `nodes` → every list empty.
struct MoralGraph {
    std::vector<std::vector<int>> adj;
    NodeMask member;
};
MoralGraph moral_ancestral_graph(const Graph& g, const std::vector<int>& nodes);

struct SeparatorList {
    std::vector<std::vector<int>> sets;  ///< each sorted by index; the list is in discovery order
    bool truncated = false;              ///< true when max_sets was reached before the end
};

/// Every inclusion-minimal Z ⊆ allowed (nodes of x and y are never allowed) that d-separates
/// x and y in g. No separator exists → empty list; x, y already separated → one empty set.
/// Empty x or y → one empty set. Stops after max_sets sets (truncated = true).
SeparatorList minimal_d_separators(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                                   const NodeMask& allowed, std::size_t max_sets = 10000);

/// A d-separator of x and y with the least total cost; cost[v] < 0 means v may not be used.
/// Among sets of equal cost any one may be returned; the result is inclusion-minimal when all
/// costs are positive. No separator → nullopt; x, y already separated → empty set.
std::optional<std::vector<int>> cheapest_d_separator(const Graph& g, const std::vector<int>& x,
                                                     const std::vector<int>& y,
                                                     const std::vector<std::int64_t>& cost);

}  // namespace foldline::causal
