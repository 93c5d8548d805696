// Tests of core/causal/separators.h.
//  - Minimal d-separators against brute force: every subset of the allowed nodes tested with
//    d_separated (itself checked against networkx in dseparation_test / dsep_reference.py).
//  - The moral graph of an ancestral set (Lauritzen, Dawid, Larsen & Leimer 1990, Networks
//    20:491-505 [from memory]): parents of a common child are joined.
//  - Cheapest separator honours costs.
#include "core/causal/separators.h"

#include <algorithm>
#include <random>

#include <gtest/gtest.h>

#include "core/causal/dseparation.h"
#include "tests/core/causal/test_graphs.h"

using namespace foldline::causal;

namespace {

std::vector<std::vector<int>> brute_force_separators(const Graph& g, const std::vector<int>& x,
                                                     const std::vector<int>& y, const std::vector<int>& allowed) {
    const std::size_t k = allowed.size(), total = std::size_t{1} << k;
    std::vector<char> sep(total);
    for (std::size_t m = 0; m < total; ++m) {
        std::vector<int> z;
        for (std::size_t i = 0; i < k; ++i)
            if (m >> i & 1) z.push_back(allowed[i]);
        sep[m] = d_separated(g, x, y, z);
    }
    std::vector<std::vector<int>> out;
    for (std::size_t m = 0; m < total; ++m) {
        if (!sep[m]) continue;
        bool minimal = true;  // no separating proper subset (checked over all subsets of m)
        for (std::size_t sub = (m - 1) & m; minimal && sub != m; sub = (sub - 1) & m) {
            if (sep[sub]) minimal = false;
            if (sub == 0) break;
        }
        if (!minimal) continue;
        std::vector<int> z;
        for (std::size_t i = 0; i < k; ++i)
            if (m >> i & 1) z.push_back(allowed[i]);
        out.push_back(z);
    }
    std::sort(out.begin(), out.end());
    return out;
}

}  // namespace

TEST(Separators, MoralGraphMarriesParentsWithinTheAncestralSet) {
    Graph g(5);  // 0 → 2 ← 1, 2 → 3, 4 → 3; ancestral set of {2} = {0, 1, 2}
    g.add_edge(0, 2);
    g.add_edge(1, 2);
    g.add_edge(2, 3);
    g.add_edge(4, 3);
    MoralGraph m = moral_ancestral_graph(g, {2});
    EXPECT_EQ(from_mask(m.member), (std::vector<int>{0, 1, 2}));
    EXPECT_EQ(m.adj[0], (std::vector<int>{1, 2}));
    EXPECT_EQ(m.adj[1], (std::vector<int>{0, 2}));
    EXPECT_TRUE(m.adj[3].empty());
    EXPECT_TRUE(m.adj[4].empty());
}

TEST(Separators, MinimalSeparatorsEqualBruteForce) {
    std::mt19937 rng(11);
    std::size_t total_sets = 0;
    for (int trial = 0; trial < 300; ++trial) {
        const int n = 3 + static_cast<int>(rng() % 9);
        Graph g = fixtures::random_dag(rng, n, 0.45);
        int x = static_cast<int>(rng() % static_cast<unsigned>(n));
        int y = (x + 1 + static_cast<int>(rng() % static_cast<unsigned>(n - 1))) % n;
        std::vector<int> allowed;
        for (int v = 0; v < n; ++v)
            if (v != x && v != y && rng() % 4 != 0) allowed.push_back(v);
        auto want = brute_force_separators(g, {x}, {y}, allowed);
        auto got = minimal_d_separators(g, {x}, {y}, to_mask(n, allowed));
        std::sort(got.sets.begin(), got.sets.end());
        ASSERT_EQ(got.sets, want) << "trial " << trial;
        total_sets += want.size();
        std::vector<std::int64_t> cost(static_cast<std::size_t>(n), -1);
        for (int v : allowed) cost[static_cast<std::size_t>(v)] = 1;
        auto cheapest = cheapest_d_separator(g, {x}, {y}, cost);
        ASSERT_EQ(cheapest.has_value(), !want.empty()) << "trial " << trial;
        if (cheapest) {
            std::size_t least = want.front().size();
            for (const auto& s : want) least = std::min(least, s.size());
            EXPECT_EQ(cheapest->size(), least) << "trial " << trial;
        }
    }
    EXPECT_GT(total_sets, 100u);  // enough non-trivial questions to mean something
}

TEST(Separators, CheapestFollowsCosts) {
    // X ← A → M → Y: blockable at A or at M, whichever is cheaper [calc].
    Graph g(4);  // 0 = X, 1 = Y, 2 = A, 3 = M
    g.add_edge(2, 0);
    g.add_edge(2, 3);
    g.add_edge(3, 1);
    EXPECT_EQ(*cheapest_d_separator(g, {0}, {1}, {-1, -1, 5, 1}), (std::vector<int>{3}));
    EXPECT_EQ(*cheapest_d_separator(g, {0}, {1}, {-1, -1, 1, 5}), (std::vector<int>{2}));
    EXPECT_FALSE(cheapest_d_separator(g, {0}, {1}, {-1, -1, -1, -1}).has_value());
    Graph adjacent(2);
    adjacent.add_edge(0, 1);
    EXPECT_FALSE(cheapest_d_separator(adjacent, {0}, {1}, {-1, -1}).has_value());
    EXPECT_TRUE(minimal_d_separators(adjacent, {0}, {1}, NodeMask(2, 1)).sets.empty());
    Graph apart(2);
    EXPECT_EQ(minimal_d_separators(apart, {0}, {1}, NodeMask(2, 1)).sets, (std::vector<std::vector<int>>{{}}));
    EXPECT_TRUE(cheapest_d_separator(apart, {0}, {1}, {1, 1})->empty());
}
