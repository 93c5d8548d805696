#include "core/causal/diagram.h"

#include <set>
#include <utility>

namespace foldline::causal {

int Diagram::find_node(std::string_view name) const {
    for (std::size_t i = 0; i < nodes.size(); ++i)
        if (nodes[i].name == name) return static_cast<int>(i);
    return -1;
}

std::string quote_name(std::string_view name) {
    std::string out = "\"";
    for (char c : name) {
        if (c == '"' || c == '\\') out += '\\';
        out += c;
    }
    return out + "\"";
}

int CausalGraph::index_of(std::string_view name) const {
    auto it = index_.find(std::string(name));
    return it == index_.end() ? -1 : it->second;
}

std::vector<std::string> CausalGraph::names_of(const std::vector<int>& nodes) const {
    std::vector<std::string> out;
    out.reserve(nodes.size());
    for (int v : nodes) out.push_back(name(v));
    return out;
}

Result<std::pair<int, int>> CausalGraph::question(std::string_view exposure, std::string_view outcome,
                                                  const std::string& source) const {
    auto role_index = [&](std::string_view name, const char* role) -> Result<int> {
        if (name.empty()) return make_error(std::string("no ") + role + " is set", source);
        int v = index_of(name);
        if (v < 0) return make_error(std::string(role) + " " + quote_name(name) + " is not a node of the diagram", source);
        if (!observed(v))
            return make_error(std::string(role) + " " + quote_name(name) +
                                  " is marked unobserved; the exposure and outcome must be observed columns",
                              source);
        return v;
    };
    auto x = role_index(exposure, "exposure");
    if (!x) return x.error();
    auto y = role_index(outcome, "outcome");
    if (!y) return y.error();
    if (*x == *y) return make_error("exposure and outcome are the same node " + quote_name(exposure), source);
    return std::pair<int, int>{*x, *y};
}

Result<CausalGraph> CausalGraph::build(const Diagram& d, const std::string& source) {
    CausalGraph cg;
    const int n = static_cast<int>(d.nodes.size());
    cg.graph_ = Graph(n);
    cg.names_.reserve(d.nodes.size());
    cg.observed_.assign(d.nodes.size(), 0);
    for (int i = 0; i < n; ++i) {
        const auto& node = d.nodes[static_cast<std::size_t>(i)];
        if (node.name.empty())
            return make_error("node " + std::to_string(i + 1) + " has an empty name", source);
        if (!cg.index_.emplace(node.name, i).second)
            return make_error("node " + quote_name(node.name) + " is declared twice", source);
        cg.names_.push_back(node.name);
        cg.observed_[static_cast<std::size_t>(i)] = node.observed ? 1 : 0;
    }
    std::set<std::pair<int, int>> seen;
    for (std::size_t e = 0; e < d.edges.size(); ++e) {
        const auto& edge = d.edges[e];
        const std::string where = "edge " + std::to_string(e + 1) + " (" + quote_name(edge.from) + " -> " +
                                  quote_name(edge.to) + ")";
        int a = cg.index_of(edge.from);
        int b = cg.index_of(edge.to);
        if (a < 0) return make_error(where + ": " + quote_name(edge.from) + " is not a node of the diagram", source);
        if (b < 0) return make_error(where + ": " + quote_name(edge.to) + " is not a node of the diagram", source);
        if (a == b) return make_error(where + ": a node cannot cause itself (self-loop)", source);
        if (!seen.insert({a, b}).second) return make_error(where + ": this edge is listed twice", source);
        cg.graph_.add_edge(a, b);
    }
    if (auto cycle = find_cycle(cg.graph_); !cycle.empty()) {
        std::string path;
        for (int v : cycle) path += quote_name(cg.name(v)) + " -> ";
        path += quote_name(cg.name(cycle.front()));
        return make_error("the diagram has a cycle: " + path + "; a causal diagram must be acyclic", source);
    }
    if (!d.exposure.empty() || !d.outcome.empty()) {
        if (!d.exposure.empty()) {
            int v = cg.index_of(d.exposure);
            if (v < 0) return make_error("exposure " + quote_name(d.exposure) + " is not a node of the diagram", source);
            if (!cg.observed(v))
                return make_error("exposure " + quote_name(d.exposure) + " is marked unobserved; it must be an observed column",
                                  source);
            cg.exposure_ = v;
        }
        if (!d.outcome.empty()) {
            int v = cg.index_of(d.outcome);
            if (v < 0) return make_error("outcome " + quote_name(d.outcome) + " is not a node of the diagram", source);
            if (!cg.observed(v))
                return make_error("outcome " + quote_name(d.outcome) + " is marked unobserved; it must be an observed column",
                                  source);
            cg.outcome_ = v;
        }
        if (cg.exposure_ >= 0 && cg.exposure_ == cg.outcome_)
            return make_error("exposure and outcome are the same node " + quote_name(d.exposure), source);
    }
    return cg;
}

Status check_columns(const CausalGraph& cg, const std::vector<std::string>& data_columns,
                     const std::string& source) {
    std::set<std::string_view> have(data_columns.begin(), data_columns.end());
    std::vector<std::string> missing;
    for (int v = 0; v < cg.size(); ++v)
        if (cg.observed(v) && !have.count(cg.name(v))) missing.push_back(quote_name(cg.name(v)));
    if (missing.empty()) return Ok{};
    std::string list;
    for (std::size_t i = 0; i < missing.size(); ++i) list += (i ? ", " : "") + missing[i];
    return make_error(std::string(missing.size() == 1 ? "node " : "nodes ") + list +
                          (missing.size() == 1 ? " is" : " are") +
                          " marked observed but not a column of the data; mark unobserved or rename to match a column",
                      source);
}

}  // namespace foldline::causal
