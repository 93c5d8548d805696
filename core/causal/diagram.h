#pragma once
// The causal diagram: variables (observed columns or unobserved, declared by the reviewer) and
// directed edges between them, plus the question's exposure and outcome.
//
// `Diagram` is the editable value (names, as read from or written to a file); `CausalGraph` is
// a validated, index-based form that every algorithm uses. Building one checks, in this order:
// empty or duplicate node names, self-loops, edges naming unknown nodes, duplicate edges,
// cycles (the message names the cycle's nodes), and an exposure/outcome that is unknown,
// unobserved or the same node.
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "core/causal/graph.h"
#include "core/common/error.h"

namespace foldline::causal {

struct DiagramNode {
    std::string name;        ///< the data column's name (any UTF-8)
    bool observed = true;    ///< false: declared by the reviewer, not in the data
    std::optional<double> x; ///< position for the editor; absent when never placed
    std::optional<double> y;
};

struct DiagramEdge {
    std::string from;
    std::string to;
};

struct Diagram {
    std::vector<DiagramNode> nodes;
    std::vector<DiagramEdge> edges;
    std::string exposure;  ///< empty: not set in the file
    std::string outcome;   ///< empty: not set in the file

    /// Index of the node with this name; -1 when absent.
    int find_node(std::string_view name) const;
};

class CausalGraph {
public:
    /// Validates `d` and builds the index form. `source` (a file name) goes into every Error.
    /// An empty diagram is valid (no nodes); exposure and outcome may be empty (unset).
    static Result<CausalGraph> build(const Diagram& d, const std::string& source = {});

    const Graph& graph() const { return graph_; }
    int size() const { return graph_.size(); }
    const std::string& name(int v) const { return names_[static_cast<std::size_t>(v)]; }
    bool observed(int v) const { return observed_[static_cast<std::size_t>(v)] != 0; }
    /// Mask of observed nodes (1 = observed).
    const NodeMask& observed_mask() const { return observed_; }
    /// Index of a node; -1 when no node has this name.
    int index_of(std::string_view name) const;
    /// Exposure / outcome index; -1 when the diagram sets none.
    int exposure() const { return exposure_; }
    int outcome() const { return outcome_; }
    /// Names of `nodes` in the given order; empty list → empty list.
    std::vector<std::string> names_of(const std::vector<int>& nodes) const;

    /// Checks a question (exposure, outcome) against this graph: both known, observed and
    /// distinct. Returns the pair of indices or an Error naming what is wrong.
    Result<std::pair<int, int>> question(std::string_view exposure, std::string_view outcome,
                                         const std::string& source = {}) const;

private:
    Graph graph_;
    std::vector<std::string> names_;
    NodeMask observed_;
    std::unordered_map<std::string, int> index_;
    int exposure_ = -1;
    int outcome_ = -1;
};

/// Checks that every node marked observed is a column of the data (matched by exact name).
/// Error names the missing node(s) and `source` (the diagram file); an empty diagram → Ok.
Status check_columns(const CausalGraph& cg, const std::vector<std::string>& data_columns,
                     const std::string& source = {});

/// "a" quoted for messages: the name in double quotes, inner quotes and backslashes escaped.
std::string quote_name(std::string_view name);

}  // namespace foldline::causal
