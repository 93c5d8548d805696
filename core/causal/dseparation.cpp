#include "core/causal/dseparation.h"

namespace foldline::causal {

NodeMask d_connected(const Graph& g, const std::vector<int>& from, const NodeMask& given) {
    const int n = g.size();
    // Phase 1: ancestors of the conditioning set (a collider passes the ball iff it is one).
    NodeMask given_anc = ancestors(g, from_mask(given));
    // Phase 2: search over (node, direction). up = the ball arrived from a child (or starts
    // here), down = it arrived from a parent.
    enum : int { kUp = 0, kDown = 1 };
    std::vector<char> visited(static_cast<std::size_t>(2 * n), 0);
    NodeMask reach(static_cast<std::size_t>(n), 0);
    std::vector<std::pair<int, int>> stack;
    for (int v : from)
        if (v >= 0 && v < n) stack.push_back({v, kUp});
    while (!stack.empty()) {
        auto [v, dir] = stack.back();
        stack.pop_back();
        auto key = static_cast<std::size_t>(2 * v + dir);
        if (visited[key]) continue;
        visited[key] = 1;
        const auto vi = static_cast<std::size_t>(v);
        const bool in_given = given[vi] != 0;
        if (!in_given) reach[vi] = 1;
        if (dir == kUp) {
            if (in_given) continue;  // a blocked chain or fork
            for (int p : g.parents(v)) stack.push_back({p, kUp});
            for (int c : g.children(v)) stack.push_back({c, kDown});
        } else {
            if (!in_given)
                for (int c : g.children(v)) stack.push_back({c, kDown});
            if (given_anc[vi])  // an open collider
                for (int p : g.parents(v)) stack.push_back({p, kUp});
        }
    }
    return reach;
}

bool d_separated(const Graph& g, const std::vector<int>& x, const std::vector<int>& y, const std::vector<int>& z) {
    if (x.empty() || y.empty()) return true;
    NodeMask xm = to_mask(g.size(), x);
    for (int v : y)
        if (xm[static_cast<std::size_t>(v)]) return false;
    NodeMask reach = d_connected(g, x, to_mask(g.size(), z));
    for (int v : y)
        if (reach[static_cast<std::size_t>(v)]) return false;
    return true;
}

}  // namespace foldline::causal
