#include "core/causal/diagram_edit.h"

#include <algorithm>

namespace foldline::causal {

namespace {

bool has_edge(const Diagram& d, std::string_view from, std::string_view to) {
    return std::any_of(d.edges.begin(), d.edges.end(), [&](const DiagramEdge& e) { return e.from == from && e.to == to; });
}

// A directed path from `from` to `to` as names (inclusive); empty when none.
std::vector<std::string> path_between(const Diagram& d, std::string_view from, std::string_view to) {
    std::vector<std::string> parent_of(d.nodes.size());
    std::vector<char> seen(d.nodes.size(), 0);
    std::vector<int> queue{d.find_node(from)};
    seen[static_cast<std::size_t>(queue[0])] = 1;
    const int target = d.find_node(to);
    for (std::size_t qi = 0; qi < queue.size(); ++qi) {
        const std::string& here = d.nodes[static_cast<std::size_t>(queue[qi])].name;
        if (queue[qi] == target) {
            std::vector<std::string> path{here};
            while (path.back() != from) path.push_back(parent_of[static_cast<std::size_t>(d.find_node(path.back()))]);
            std::reverse(path.begin(), path.end());
            return path;
        }
        for (const auto& e : d.edges) {
            if (e.from != here) continue;
            int next = d.find_node(e.to);
            if (next < 0 || seen[static_cast<std::size_t>(next)]) continue;
            seen[static_cast<std::size_t>(next)] = 1;
            parent_of[static_cast<std::size_t>(next)] = here;
            queue.push_back(next);
        }
    }
    return {};
}

Status known(const Diagram& d, std::string_view name) {
    if (d.find_node(name) < 0) return make_error(quote_name(name) + " is not a node of the diagram");
    return Ok{};
}

}  // namespace

Status check_new_node(const Diagram& d, std::string_view name) {
    const bool blank = std::all_of(name.begin(), name.end(), [](char c) {
        return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\v' || c == '\f';
    });
    if (blank) return make_error("a node needs a name");
    if (d.find_node(name) >= 0) return make_error("a node named " + quote_name(name) + " already exists");
    return Ok{};
}

Status add_node(Diagram& d, const std::string& name, bool observed) {
    return add_node(d, DiagramNode{name, observed, {}, {}});
}

Status add_node(Diagram& d, DiagramNode node) {
    if (auto st = check_new_node(d, node.name); !st) return st;
    d.nodes.push_back(std::move(node));
    return Ok{};
}

Status move_node(Diagram& d, std::string_view name, double x, double y) {
    if (auto st = known(d, name); !st) return st;
    DiagramNode& n = d.nodes[static_cast<std::size_t>(d.find_node(name))];
    n.x = x;
    n.y = y;
    return Ok{};
}

Status rename_node(Diagram& d, std::string_view old_name, const std::string& new_name) {
    if (auto st = known(d, old_name); !st) return st;
    if (old_name == new_name) return Ok{};
    if (auto st = check_new_node(d, new_name); !st) return st;
    const std::string old(old_name);
    d.nodes[static_cast<std::size_t>(d.find_node(old))].name = new_name;
    for (auto& e : d.edges) {
        if (e.from == old) e.from = new_name;
        if (e.to == old) e.to = new_name;
    }
    if (d.exposure == old) d.exposure = new_name;
    if (d.outcome == old) d.outcome = new_name;
    return Ok{};
}

Status remove_node(Diagram& d, std::string_view name) {
    if (auto st = known(d, name); !st) return st;
    d.nodes.erase(d.nodes.begin() + d.find_node(name));
    d.edges.erase(std::remove_if(d.edges.begin(), d.edges.end(),
                                 [&](const DiagramEdge& e) { return e.from == name || e.to == name; }),
                  d.edges.end());
    if (d.exposure == name) d.exposure.clear();
    if (d.outcome == name) d.outcome.clear();
    return Ok{};
}

Status set_observed(Diagram& d, std::string_view name, bool observed) {
    if (auto st = known(d, name); !st) return st;
    if (!observed && (d.exposure == name || d.outcome == name))
        return make_error(quote_name(name) + " is the " + (d.exposure == name ? "exposure" : "outcome") +
                          "; it must stay observed");
    d.nodes[static_cast<std::size_t>(d.find_node(name))].observed = observed;
    return Ok{};
}

Status check_new_edge(const Diagram& d, std::string_view from, std::string_view to) {
    if (auto st = known(d, from); !st) return st;
    if (auto st = known(d, to); !st) return st;
    if (from == to) return make_error("a node cannot cause itself (self-loop)");
    if (has_edge(d, from, to)) return make_error("the edge " + quote_name(from) + " -> " + quote_name(to) + " already exists");
    if (auto back = path_between(d, to, from); !back.empty()) {
        std::string cycle;
        for (const auto& n : back) cycle += quote_name(n) + " -> ";
        return make_error("the edge " + quote_name(from) + " -> " + quote_name(to) + " would close the cycle " + cycle +
                          quote_name(to));
    }
    return Ok{};
}

Status add_edge(Diagram& d, std::string_view from, std::string_view to) {
    if (auto st = check_new_edge(d, from, to); !st) return st;
    d.edges.push_back({std::string(from), std::string(to)});
    return Ok{};
}

Status remove_edge(Diagram& d, std::string_view from, std::string_view to) {
    auto it = std::find_if(d.edges.begin(), d.edges.end(),
                           [&](const DiagramEdge& e) { return e.from == from && e.to == to; });
    if (it == d.edges.end()) return make_error("there is no edge " + quote_name(from) + " -> " + quote_name(to));
    d.edges.erase(it);
    return Ok{};
}

Status set_question(Diagram& d, std::string_view exposure, std::string_view outcome) {
    for (auto [name, role] : {std::pair{exposure, "exposure"}, std::pair{outcome, "outcome"}}) {
        if (name.empty()) continue;
        int v = d.find_node(name);
        if (v < 0) return make_error(std::string(role) + " " + quote_name(name) + " is not a node of the diagram");
        if (!d.nodes[static_cast<std::size_t>(v)].observed)
            return make_error(std::string(role) + " " + quote_name(name) + " is marked unobserved; it must be an observed column");
    }
    if (!exposure.empty() && exposure == outcome)
        return make_error("exposure and outcome are the same node " + quote_name(exposure));
    d.exposure = std::string(exposure);
    d.outcome = std::string(outcome);
    return Ok{};
}

}  // namespace foldline::causal
