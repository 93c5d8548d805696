#pragma once
// A directed graph over node indices 0..n-1 with parent and child lists (vector adjacency).
// The causal algorithms work on this plain structure; names live in CausalGraph (diagram.h).
#include <cstddef>
#include <vector>

namespace foldline::causal {

/// A set of nodes as a membership mask indexed by node (1 = member).
using NodeMask = std::vector<char>;

class Graph {
public:
    Graph() = default;
    /// A graph with n nodes and no edges; n = 0 gives the empty graph.
    explicit Graph(int n) : children_(static_cast<std::size_t>(n)), parents_(static_cast<std::size_t>(n)) {}

    int size() const { return static_cast<int>(children_.size()); }
    std::size_t edge_count() const { return edges_; }
    /// Adds from → to. No checks: callers validate (CausalGraph::build does).
    void add_edge(int from, int to) {
        children_[static_cast<std::size_t>(from)].push_back(to);
        parents_[static_cast<std::size_t>(to)].push_back(from);
        ++edges_;
    }
    const std::vector<int>& children(int v) const { return children_[static_cast<std::size_t>(v)]; }
    const std::vector<int>& parents(int v) const { return parents_[static_cast<std::size_t>(v)]; }
    /// True when from → to is an edge; false for out-of-range or absent edges.
    bool has_edge(int from, int to) const;

private:
    std::vector<std::vector<int>> children_;
    std::vector<std::vector<int>> parents_;
    std::size_t edges_ = 0;
};

/// Mask of `nodes` in a graph of size n; indices outside 0..n-1 are ignored. Empty list → all 0.
NodeMask to_mask(int n, const std::vector<int>& nodes);
/// Members of a mask in increasing index order; an all-zero mask gives an empty list.
std::vector<int> from_mask(const NodeMask& mask);

/// `from` and every node with a directed path from it (descendants, inclusive). Empty from → all 0.
NodeMask descendants(const Graph& g, const std::vector<int>& from);
/// `to` and every node with a directed path to it (ancestors, inclusive). Empty to → all 0.
NodeMask ancestors(const Graph& g, const std::vector<int>& to);
/// Ancestors of `to` (inclusive) along paths that never enter a node of `blocked` (blocked nodes
/// are never added, even when in `to`). Empty to → all 0.
NodeMask ancestors_avoiding(const Graph& g, const std::vector<int>& to, const NodeMask& blocked);

/// A directed cycle as its nodes in order (first node not repeated); empty when the graph is acyclic.
std::vector<int> find_cycle(const Graph& g);

}  // namespace foldline::causal
