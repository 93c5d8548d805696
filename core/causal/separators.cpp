#include "core/causal/separators.h"

#include <algorithm>
#include <functional>
#include <limits>

namespace foldline::causal {

MoralGraph moral_ancestral_graph(const Graph& g, const std::vector<int>& nodes) {
    const int n = g.size();
    MoralGraph m;
    m.member = ancestors(g, nodes);
    m.adj.assign(static_cast<std::size_t>(n), {});
    auto link = [&](int a, int b) {
        m.adj[static_cast<std::size_t>(a)].push_back(b);
        m.adj[static_cast<std::size_t>(b)].push_back(a);
    };
    for (int v = 0; v < n; ++v) {
        if (!m.member[static_cast<std::size_t>(v)]) continue;
        const auto& pa = g.parents(v);  // parents of an ancestor are ancestors
        for (std::size_t i = 0; i < pa.size(); ++i) {
            link(pa[i], v);
            for (std::size_t j = i + 1; j < pa.size(); ++j) link(pa[i], pa[j]);
        }
    }
    for (auto& a : m.adj) {
        std::sort(a.begin(), a.end());
        a.erase(std::unique(a.begin(), a.end()), a.end());
    }
    return m;
}

namespace {

// Nodes reachable from `start` in h without entering `wall`; start nodes inside the wall are
// skipped.
NodeMask reach(const MoralGraph& h, const NodeMask& start, const NodeMask& wall) {
    const std::size_t n = h.adj.size();
    NodeMask seen(n, 0);
    std::vector<int> stack;
    for (std::size_t v = 0; v < n; ++v)
        if (start[v] && !wall[v]) {
            seen[v] = 1;
            stack.push_back(static_cast<int>(v));
        }
    while (!stack.empty()) {
        int v = stack.back();
        stack.pop_back();
        for (int w : h.adj[static_cast<std::size_t>(v)]) {
            auto wi = static_cast<std::size_t>(w);
            if (seen[wi] || wall[wi]) continue;
            seen[wi] = 1;
            stack.push_back(w);
        }
    }
    return seen;
}

struct Enumerator {
    const MoralGraph& h;
    NodeMask candidate;  // may be part of a separator
    NodeMask targets;    // Y
    std::size_t max_sets;
    SeparatorList out;

    // The separator closest to S: S* = S grown through non-candidates; Z = the candidates next
    // to S* that touch the component(s) of Y in H − N(S*). Returns false if Y meets S*.
    bool close_separator(const NodeMask& s, NodeMask& z, NodeMask& side) const {
        const std::size_t n = h.adj.size();
        NodeMask s_star(n, 0);
        std::vector<int> stack;
        for (std::size_t v = 0; v < n; ++v)
            if (s[v]) {
                s_star[v] = 1;
                stack.push_back(static_cast<int>(v));
            }
        NodeMask border(n, 0);
        while (!stack.empty()) {
            int v = stack.back();
            stack.pop_back();
            for (int w : h.adj[static_cast<std::size_t>(v)]) {
                auto wi = static_cast<std::size_t>(w);
                if (s_star[wi]) continue;
                if (candidate[wi]) {
                    border[wi] = 1;
                } else {
                    s_star[wi] = 1;
                    stack.push_back(w);
                }
            }
        }
        for (std::size_t v = 0; v < n; ++v)
            if (targets[v] && s_star[v]) return false;
        for (std::size_t v = 0; v < n; ++v)
            if (s_star[v]) border[v] = 0;  // a candidate added to S is inside, not on the border
        NodeMask wall = border;
        for (std::size_t v = 0; v < n; ++v)
            if (s_star[v]) wall[v] = 1;
        NodeMask c_t = reach(h, targets, wall);
        z.assign(n, 0);
        for (std::size_t v = 0; v < n; ++v) {
            if (!border[v]) continue;
            for (int w : h.adj[v])
                if (c_t[static_cast<std::size_t>(w)]) {
                    z[v] = 1;
                    break;
                }
        }
        side = reach(h, s_star, z);
        return true;
    }

    // Lists every minimal separator Z with S ⊆ C_S(Z) and T ∩ C_S(Z) = ∅ (C_S: the part of
    // H − Z reachable from S). The close separator has the smallest such C_S, so the subspace is
    // empty exactly when T meets it; otherwise branch on a node v of Z outside T.
    void run(const NodeMask& s, NodeMask& t) {
        if (out.truncated) return;
        NodeMask z, side;
        if (!close_separator(s, z, side)) return;
        const std::size_t n = h.adj.size();
        for (std::size_t v = 0; v < n; ++v)
            if (t[v] && side[v]) return;
        int pick = -1;
        for (std::size_t v = 0; v < n && pick < 0; ++v)
            if (z[v] && !t[v]) pick = static_cast<int>(v);
        if (pick < 0) {
            if (out.sets.size() >= max_sets) {
                out.truncated = true;
                return;
            }
            out.sets.push_back(from_mask(z));
            return;
        }
        auto pi = static_cast<std::size_t>(pick);
        t[pi] = 1;  // v stays outside C_S (Z itself lies in this branch)
        run(s, t);
        t[pi] = 0;
        NodeMask grown = side;  // v joins C_S
        grown[pi] = 1;
        run(grown, t);
    }
};

}  // namespace

SeparatorList minimal_d_separators(const Graph& g, const std::vector<int>& x, const std::vector<int>& y,
                                   const NodeMask& allowed, std::size_t max_sets) {
    const int n = g.size();
    if (x.empty() || y.empty()) return SeparatorList{{{}}, false};
    std::vector<int> xy = x;
    xy.insert(xy.end(), y.begin(), y.end());
    MoralGraph h = moral_ancestral_graph(g, xy);
    Enumerator e{h, NodeMask(static_cast<std::size_t>(n), 0), to_mask(n, y), max_sets, {}};
    NodeMask xm = to_mask(n, x);
    for (int v = 0; v < n; ++v) {
        auto vi = static_cast<std::size_t>(v);
        e.candidate[vi] = (h.member[vi] && allowed[vi] && !xm[vi] && !e.targets[vi]) ? 1 : 0;
    }
    for (int v : y)
        if (xm[static_cast<std::size_t>(v)]) return {};
    NodeMask t = e.targets;
    e.run(xm, t);
    return std::move(e.out);
}

std::optional<std::vector<int>> cheapest_d_separator(const Graph& g, const std::vector<int>& x,
                                                     const std::vector<int>& y,
                                                     const std::vector<std::int64_t>& cost) {
    const int n = g.size();
    if (x.empty() || y.empty()) return std::vector<int>{};
    NodeMask xm = to_mask(n, x), ym = to_mask(n, y);
    for (int v : y)
        if (xm[static_cast<std::size_t>(v)]) return std::nullopt;
    std::vector<int> xy = x;
    xy.insert(xy.end(), y.begin(), y.end());
    MoralGraph h = moral_ancestral_graph(g, xy);

    std::int64_t inf = 1;
    for (auto c : cost)
        if (c > 0) inf += c;
    // Flow network: v_in = 2v, v_out = 2v + 1, source 2n, sink 2n + 1.
    struct Arc {
        int to;
        std::int64_t cap;
    };
    std::vector<Arc> arcs;
    std::vector<std::vector<int>> out(static_cast<std::size_t>(2 * n + 2));
    auto add = [&](int a, int b, std::int64_t c) {
        out[static_cast<std::size_t>(a)].push_back(static_cast<int>(arcs.size()));
        arcs.push_back({b, c});
        out[static_cast<std::size_t>(b)].push_back(static_cast<int>(arcs.size()));
        arcs.push_back({a, 0});
    };
    const int src = 2 * n, snk = 2 * n + 1;
    for (int v = 0; v < n; ++v) {
        auto vi = static_cast<std::size_t>(v);
        if (!h.member[vi]) continue;
        bool usable = !xm[vi] && !ym[vi] && cost[vi] >= 0;
        add(2 * v, 2 * v + 1, usable ? cost[vi] : inf);
        for (int w : h.adj[vi]) add(2 * v + 1, 2 * w, inf);
        if (xm[vi]) add(src, 2 * v, inf);
        if (ym[vi]) add(2 * v + 1, snk, inf);
    }
    std::int64_t flow = 0;
    std::vector<int> via(out.size());
    for (;;) {
        std::fill(via.begin(), via.end(), -1);
        std::vector<int> queue{src};
        via[static_cast<std::size_t>(src)] = -2;
        for (std::size_t qi = 0; qi < queue.size() && via[static_cast<std::size_t>(snk)] == -1; ++qi)
            for (int a : out[static_cast<std::size_t>(queue[qi])]) {
                const Arc& arc = arcs[static_cast<std::size_t>(a)];
                if (arc.cap > 0 && via[static_cast<std::size_t>(arc.to)] == -1) {
                    via[static_cast<std::size_t>(arc.to)] = a;
                    queue.push_back(arc.to);
                }
            }
        if (via[static_cast<std::size_t>(snk)] == -1) break;
        std::int64_t push = std::numeric_limits<std::int64_t>::max();
        for (int v = snk; v != src; v = arcs[static_cast<std::size_t>(via[static_cast<std::size_t>(v)] ^ 1)].to)
            push = std::min(push, arcs[static_cast<std::size_t>(via[static_cast<std::size_t>(v)])].cap);
        for (int v = snk; v != src; v = arcs[static_cast<std::size_t>(via[static_cast<std::size_t>(v)] ^ 1)].to) {
            auto a = static_cast<std::size_t>(via[static_cast<std::size_t>(v)]);
            arcs[a].cap -= push;
            arcs[a ^ 1].cap += push;
        }
        flow += push;
        if (flow >= inf) return std::nullopt;
    }
    // Source side of the residual graph; a node is cut when its in-half is on it and its
    // out-half is not.
    std::vector<char> side(out.size(), 0);
    std::vector<int> queue{src};
    side[static_cast<std::size_t>(src)] = 1;
    for (std::size_t qi = 0; qi < queue.size(); ++qi)
        for (int a : out[static_cast<std::size_t>(queue[qi])]) {
            const Arc& arc = arcs[static_cast<std::size_t>(a)];
            if (arc.cap > 0 && !side[static_cast<std::size_t>(arc.to)]) {
                side[static_cast<std::size_t>(arc.to)] = 1;
                queue.push_back(arc.to);
            }
        }
    std::vector<int> cut;
    for (int v = 0; v < n; ++v)
        if (h.member[static_cast<std::size_t>(v)] && side[static_cast<std::size_t>(2 * v)] &&
            !side[static_cast<std::size_t>(2 * v + 1)])
            cut.push_back(v);
    return cut;
}

}  // namespace foldline::causal
