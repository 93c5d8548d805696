#include "core/causal/graph.h"

#include <algorithm>

namespace foldline::causal {

bool Graph::has_edge(int from, int to) const {
    if (from < 0 || from >= size() || to < 0 || to >= size()) return false;
    const auto& c = children(from);
    return std::find(c.begin(), c.end(), to) != c.end();
}

NodeMask to_mask(int n, const std::vector<int>& nodes) {
    NodeMask m(static_cast<std::size_t>(n), 0);
    for (int v : nodes)
        if (v >= 0 && v < n) m[static_cast<std::size_t>(v)] = 1;
    return m;
}

std::vector<int> from_mask(const NodeMask& mask) {
    std::vector<int> out;
    for (std::size_t i = 0; i < mask.size(); ++i)
        if (mask[i]) out.push_back(static_cast<int>(i));
    return out;
}

namespace {

template <typename Next>
NodeMask closure(int n, const std::vector<int>& start, const NodeMask* blocked, Next next) {
    NodeMask seen(static_cast<std::size_t>(n), 0);
    std::vector<int> stack;
    for (int v : start) {
        if (v < 0 || v >= n || seen[static_cast<std::size_t>(v)]) continue;
        if (blocked && (*blocked)[static_cast<std::size_t>(v)]) continue;
        seen[static_cast<std::size_t>(v)] = 1;
        stack.push_back(v);
    }
    while (!stack.empty()) {
        int v = stack.back();
        stack.pop_back();
        for (int w : next(v)) {
            auto wi = static_cast<std::size_t>(w);
            if (seen[wi] || (blocked && (*blocked)[wi])) continue;
            seen[wi] = 1;
            stack.push_back(w);
        }
    }
    return seen;
}

}  // namespace

NodeMask descendants(const Graph& g, const std::vector<int>& from) {
    return closure(g.size(), from, nullptr, [&](int v) -> const std::vector<int>& { return g.children(v); });
}

NodeMask ancestors(const Graph& g, const std::vector<int>& to) {
    return closure(g.size(), to, nullptr, [&](int v) -> const std::vector<int>& { return g.parents(v); });
}

NodeMask ancestors_avoiding(const Graph& g, const std::vector<int>& to, const NodeMask& blocked) {
    return closure(g.size(), to, &blocked, [&](int v) -> const std::vector<int>& { return g.parents(v); });
}

std::vector<int> find_cycle(const Graph& g) {
    // Iterative depth-first search with colours; a back edge closes a cycle on the stack.
    const int n = g.size();
    std::vector<char> colour(static_cast<std::size_t>(n), 0);  // 0 new, 1 on stack, 2 done
    std::vector<int> parent_on_path(static_cast<std::size_t>(n), -1);
    std::vector<std::pair<int, std::size_t>> stack;
    for (int root = 0; root < n; ++root) {
        if (colour[static_cast<std::size_t>(root)]) continue;
        stack.push_back({root, 0});
        colour[static_cast<std::size_t>(root)] = 1;
        while (!stack.empty()) {
            auto& [v, next] = stack.back();
            const auto& ch = g.children(v);
            if (next == ch.size()) {
                colour[static_cast<std::size_t>(v)] = 2;
                stack.pop_back();
                continue;
            }
            int w = ch[next++];
            auto wi = static_cast<std::size_t>(w);
            if (colour[wi] == 1) {
                std::vector<int> cycle;
                for (int u = v; u != w; u = parent_on_path[static_cast<std::size_t>(u)]) cycle.push_back(u);
                cycle.push_back(w);
                std::reverse(cycle.begin(), cycle.end());
                return cycle;
            }
            if (colour[wi] == 0) {
                colour[wi] = 1;
                parent_on_path[wi] = v;
                stack.push_back({w, 0});
            }
        }
    }
    return {};
}

}  // namespace foldline::causal
