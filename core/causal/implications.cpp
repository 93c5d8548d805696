#include "core/causal/implications.h"

#include <algorithm>
#include <cstdint>
#include <optional>

#include "core/causal/separators.h"

namespace foldline::causal {

const char* to_string(ClaimForm f) {
    switch (f) {
        case ClaimForm::Parents: return "parents";
        case ClaimForm::Separator: return "separator";
        case ClaimForm::Untestable: return "untestable";
    }
    return "parents";
}

namespace {

bool all_observed(const std::vector<int>& nodes, const NodeMask& observed) {
    return std::all_of(nodes.begin(), nodes.end(), [&](int v) { return observed[static_cast<std::size_t>(v)] != 0; });
}

std::vector<int> sorted(std::vector<int> v) {
    std::sort(v.begin(), v.end());
    return v;
}

}  // namespace

std::vector<Implication> implied_independences(const Graph& g, const NodeMask& observed) {
    const int n = g.size();
    std::vector<NodeMask> desc(static_cast<std::size_t>(n));
    for (int v = 0; v < n; ++v)
        if (observed[static_cast<std::size_t>(v)]) desc[static_cast<std::size_t>(v)] = descendants(g, {v});
    std::vector<std::int64_t> observed_cost(static_cast<std::size_t>(n)), any_cost(static_cast<std::size_t>(n), 1);
    for (int v = 0; v < n; ++v) observed_cost[static_cast<std::size_t>(v)] = observed[static_cast<std::size_t>(v)] ? 1 : -1;

    std::vector<Implication> out;
    for (int a = 0; a < n; ++a) {
        if (!observed[static_cast<std::size_t>(a)]) continue;
        for (int b = a + 1; b < n; ++b) {
            if (!observed[static_cast<std::size_t>(b)] || g.has_edge(a, b) || g.has_edge(b, a)) continue;
            Implication imp{a, b, {}, ClaimForm::Parents};
            // Local Markov: a node's parents separate it from every non-descendant.
            std::optional<std::vector<int>> best;
            for (int v : {b, a}) {
                const int other = v == a ? b : a;
                if (desc[static_cast<std::size_t>(v)][static_cast<std::size_t>(other)]) continue;
                const auto& pa = g.parents(v);
                if (!all_observed(pa, observed)) continue;
                if (!best || pa.size() < best->size()) best = sorted(pa);
            }
            if (best) {
                imp.given = std::move(*best);
            } else if (auto sep = cheapest_d_separator(g, {a}, {b}, observed_cost)) {
                imp.given = sorted(std::move(*sep));
                imp.form = ClaimForm::Separator;
            } else {
                auto any = cheapest_d_separator(g, {a}, {b}, any_cost);
                imp.given = any ? sorted(std::move(*any)) : std::vector<int>{};
                imp.form = ClaimForm::Untestable;
            }
            out.push_back(std::move(imp));
        }
    }
    return out;
}

std::vector<Implication> implied_independences(const CausalGraph& cg) {
    return implied_independences(cg.graph(), cg.observed_mask());
}

}  // namespace foldline::causal
