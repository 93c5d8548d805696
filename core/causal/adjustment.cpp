#include "core/causal/adjustment.h"

#include <algorithm>

#include "core/causal/dseparation.h"

namespace foldline::causal {

std::vector<int> proper_causal_nodes(const Graph& g, const std::vector<int>& x, const std::vector<int>& y) {
    if (x.empty() || y.empty()) return {};
    const int n = g.size();
    NodeMask xm = to_mask(n, x);
    // Descendants of X along paths that do not re-enter X: start from X's children outside X.
    std::vector<int> start;
    for (int v : x)
        for (int c : g.children(v))
            if (!xm[static_cast<std::size_t>(c)]) start.push_back(c);
    NodeMask down(static_cast<std::size_t>(n), 0);
    {
        std::vector<int> stack;
        for (int v : start)
            if (!down[static_cast<std::size_t>(v)]) {
                down[static_cast<std::size_t>(v)] = 1;
                stack.push_back(v);
            }
        while (!stack.empty()) {
            int v = stack.back();
            stack.pop_back();
            for (int c : g.children(v)) {
                auto ci = static_cast<std::size_t>(c);
                if (down[ci] || xm[ci]) continue;
                down[ci] = 1;
                stack.push_back(c);
            }
        }
    }
    // Ancestors of Y along paths avoiding X.
    NodeMask up = ancestors_avoiding(g, y, xm);
    std::vector<int> cn;
    for (int v = 0; v < n; ++v)
        if (down[static_cast<std::size_t>(v)] && up[static_cast<std::size_t>(v)]) cn.push_back(v);
    return cn;
}

NodeMask forbidden_nodes(const Graph& g, const std::vector<int>& x, const std::vector<int>& y) {
    NodeMask f = descendants(g, proper_causal_nodes(g, x, y));
    for (int v : x) f[static_cast<std::size_t>(v)] = 1;
    return f;
}

Graph proper_backdoor_graph(const Graph& g, const std::vector<int>& x, const std::vector<int>& y) {
    const int n = g.size();
    NodeMask xm = to_mask(n, x);
    NodeMask cn = to_mask(n, proper_causal_nodes(g, x, y));
    Graph out(n);
    for (int v = 0; v < n; ++v)
        for (int c : g.children(v))
            if (!(xm[static_cast<std::size_t>(v)] && cn[static_cast<std::size_t>(c)])) out.add_edge(v, c);
    return out;
}

namespace {

bool meets(const NodeMask& m, const std::vector<int>& z) {
    for (int v : z)
        if (v < 0 || v >= static_cast<int>(m.size()) || m[static_cast<std::size_t>(v)]) return true;
    return false;
}

}  // namespace

bool is_valid_adjustment(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                         const std::vector<int>& z) {
    if (x.empty() || y.empty()) return true;
    const int n = g.size();
    NodeMask xy = to_mask(n, x);
    for (int v : y) xy[static_cast<std::size_t>(v)] = 1;
    if (meets(xy, z)) return false;
    if (meets(forbidden_nodes(g, x, y), z)) return false;
    return d_separated(proper_backdoor_graph(g, x, y), x, y, z);
}

bool satisfies_backdoor(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                        const std::vector<int>& z) {
    const int n = g.size();
    NodeMask xy = to_mask(n, x);
    for (int v : y) xy[static_cast<std::size_t>(v)] = 1;
    if (meets(xy, z)) return false;
    NodeMask dx = descendants(g, x);
    if (meets(dx, z)) return false;
    // Remove every edge out of X: what is left between X and Y are the back-door paths.
    NodeMask xm = to_mask(n, x);
    Graph h(n);
    for (int v = 0; v < n; ++v)
        if (!xm[static_cast<std::size_t>(v)])
            for (int c : g.children(v)) h.add_edge(v, c);
    return d_separated(h, x, y, z);
}

SeparatorList minimal_adjustment_sets(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                                      const NodeMask& usable, std::size_t max_sets) {
    NodeMask allowed = usable;
    NodeMask forb = forbidden_nodes(g, x, y);
    for (std::size_t v = 0; v < allowed.size(); ++v)
        if (forb[v]) allowed[v] = 0;
    SeparatorList list = minimal_d_separators(proper_backdoor_graph(g, x, y), x, y, allowed, max_sets);
    std::sort(list.sets.begin(), list.sets.end(), [](const auto& a, const auto& b) {
        return a.size() != b.size() ? a.size() < b.size() : a < b;
    });
    return list;
}

std::optional<std::vector<int>> smallest_adjustment_set(const Graph& g, const std::vector<int>& x,
                                                        const std::vector<int>& y, const NodeMask& usable) {
    std::vector<std::int64_t> cost(usable.size());
    for (std::size_t v = 0; v < usable.size(); ++v) cost[v] = usable[v] ? 1 : -1;
    return cheapest_adjustment_set(g, x, y, cost);
}

std::optional<std::vector<int>> cheapest_adjustment_set(const Graph& g, const std::vector<int>& x,
                                                        const std::vector<int>& y,
                                                        const std::vector<std::int64_t>& cost) {
    std::vector<std::int64_t> c = cost;
    NodeMask forb = forbidden_nodes(g, x, y);
    for (std::size_t v = 0; v < c.size(); ++v)
        if (forb[v]) c[v] = -1;
    return cheapest_d_separator(proper_backdoor_graph(g, x, y), x, y, c);
}

}  // namespace foldline::causal
