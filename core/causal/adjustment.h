#pragma once
// Covariate adjustment for the total effect of X on Y in a DAG.
//
// Back-door criterion (Pearl 1993; Pearl 2009, Causality, Def. 3.3.1): Z contains no
// descendant of X and blocks every path between X and Y that starts with an edge into X.
//
// Generalised (complete) adjustment criterion (Shpitser, VanderWeele & Robins 2010, UAI;
// Perković, Textor, Kalisch & Maathuis 2018, JMLR 18(220); in the constructive form of van der
// Zander, Liśkiewicz & Textor 2014, UAI causal workshop, and 2019, Artificial Intelligence
// 270:1-40): Z is valid iff Z ∩ Forb = ∅ with Forb = X ∪ De(Cn), where Cn are the nodes other
// than X on proper causal paths from X to Y, and Z d-separates X and Y in the proper back-door
// graph (G with the first edge of every proper causal path removed).
//
// Minimal valid sets are the minimal d-separators of X and Y in the proper back-door graph
// that avoid Forb (van der Zander et al. 2019, Theorem on the reduction to separators);
// see separators.h for the enumeration and the minimum-size search.
#include <cstdint>
#include <optional>
#include <vector>

#include "core/causal/graph.h"
#include "core/causal/separators.h"

namespace foldline::causal {

/// Cn: nodes other than X on proper causal paths from X to Y (a directed path whose only node
/// in X is its first). Includes the nodes of Y that X causes. Empty x or y → empty.
std::vector<int> proper_causal_nodes(const Graph& g, const std::vector<int>& x, const std::vector<int>& y);

/// Forb = X ∪ De(Cn): nodes no valid adjustment set may contain. Empty x → De(Cn) only.
NodeMask forbidden_nodes(const Graph& g, const std::vector<int>& x, const std::vector<int>& y);

/// G with every edge X → w removed where w ∈ Cn (the proper back-door graph).
Graph proper_backdoor_graph(const Graph& g, const std::vector<int>& x, const std::vector<int>& y);

/// The generalised adjustment criterion. Z meeting X or Y → false; empty x or y → true.
bool is_valid_adjustment(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                         const std::vector<int>& z);

/// Pearl's back-door criterion (sufficient, not necessary). Z meeting X or Y → false.
bool satisfies_backdoor(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                        const std::vector<int>& z);

/// All minimal valid adjustment sets made only of `usable` nodes (e.g. the observed ones),
/// with polynomial delay. None exists → empty list; ∅ valid → exactly one set, the empty one.
/// Stops after max_sets (truncated = true). Sets sorted by index; list sorted by size, then
/// lexicographically by index.
SeparatorList minimal_adjustment_sets(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                                      const NodeMask& usable, std::size_t max_sets = 10000);

/// A valid adjustment set of `usable` nodes with the fewest members; nullopt when none exists.
std::optional<std::vector<int>> smallest_adjustment_set(const Graph& g, const std::vector<int>& x,
                                                        const std::vector<int>& y, const NodeMask& usable);

/// A valid adjustment set of least total cost (cost[v] < 0: v may not be used); nullopt when
/// none exists. Used to find which unobserved nodes would have to be measured.
std::optional<std::vector<int>> cheapest_adjustment_set(const Graph& g, const std::vector<int>& x,
                                                        const std::vector<int>& y,
                                                        const std::vector<std::int64_t>& cost);

}  // namespace foldline::causal
