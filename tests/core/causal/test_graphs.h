#pragma once
// Helpers shared by the causal tests: building diagrams from edge lists and random DAGs.
#include <random>
#include <string>
#include <utility>
#include <vector>

#include "core/causal/diagram.h"

namespace foldline::causal::fixtures {

/// A diagram whose nodes are the names in `observed` and `unobserved`, with the given edges.
inline Diagram make_diagram(const std::vector<std::string>& observed,
                            const std::vector<std::pair<std::string, std::string>>& edges,
                            const std::vector<std::string>& unobserved = {}, std::string exposure = {},
                            std::string outcome = {}) {
    Diagram d;
    for (const auto& n : observed) d.nodes.push_back({n, true, {}, {}});
    for (const auto& n : unobserved) d.nodes.push_back({n, false, {}, {}});
    for (const auto& [a, b] : edges) d.edges.push_back({a, b});
    d.exposure = std::move(exposure);
    d.outcome = std::move(outcome);
    return d;
}

/// A random DAG on n nodes: edges only from earlier to later in a random order, each with
/// probability p.
inline Graph random_dag(std::mt19937& rng, int n, double p) {
    std::vector<int> order(static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) order[static_cast<std::size_t>(i)] = i;
    std::shuffle(order.begin(), order.end(), rng);
    std::bernoulli_distribution coin(p);
    Graph g(n);
    for (int i = 0; i < n; ++i)
        for (int j = i + 1; j < n; ++j)
            if (coin(rng)) g.add_edge(order[static_cast<std::size_t>(i)], order[static_cast<std::size_t>(j)]);
    return g;
}

}  // namespace foldline::causal::fixtures
