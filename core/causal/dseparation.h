#pragma once
// d-separation by reachability: the Bayes-ball algorithm (Shachter 1998, "Bayes-Ball: The
// Rational Pastime", UAI), in the two-phase form of Koller & Friedman 2009, Algorithm 3.1
// ("Reachable"). One query costs O(V + E).
#include <vector>

#include "core/causal/graph.h"

namespace foldline::causal {

/// Nodes d-connected to at least one node of `from` given the set `given` (mask). Nodes of
/// `from` that are not in `given` are reported as reachable; nodes in `given` never are.
/// Empty `from` → all 0. `given` must have g.size() entries.
NodeMask d_connected(const Graph& g, const std::vector<int>& from, const NodeMask& given);

/// True when every path between x and y is blocked by z. x, y, z are expected disjoint;
/// x and y sharing a node → false; empty x or empty y → true.
bool d_separated(const Graph& g, const std::vector<int>& x, const std::vector<int>& y, const std::vector<int>& z);

}  // namespace foldline::causal
