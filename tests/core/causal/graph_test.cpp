// Tests of core/causal/graph.h: ancestors, descendants and cycle finding on hand-checked graphs.
#include "core/causal/graph.h"

#include <gtest/gtest.h>

using namespace foldline::causal;

TEST(Graph, AncestorsAndDescendantsAreInclusive) {
    Graph g(5);  // 0 → 1 → 2, 3 → 2, 4 isolated
    g.add_edge(0, 1);
    g.add_edge(1, 2);
    g.add_edge(3, 2);
    EXPECT_EQ(from_mask(ancestors(g, {2})), (std::vector<int>{0, 1, 2, 3}));
    EXPECT_EQ(from_mask(descendants(g, {0})), (std::vector<int>{0, 1, 2}));
    EXPECT_EQ(from_mask(descendants(g, {4})), (std::vector<int>{4}));
    EXPECT_TRUE(from_mask(ancestors(g, {})).empty());
    NodeMask blocked = to_mask(5, {1});
    EXPECT_EQ(from_mask(ancestors_avoiding(g, {2}, blocked)), (std::vector<int>{2, 3}));
    EXPECT_TRUE(g.has_edge(0, 1));
    EXPECT_FALSE(g.has_edge(1, 0));
    EXPECT_FALSE(g.has_edge(7, 0));
    EXPECT_EQ(g.edge_count(), 3u);
}

TEST(Graph, FindsTheCycleInOrder) {
    Graph g(4);  // 0 → 1 → 2 → 3 → 1
    g.add_edge(0, 1);
    g.add_edge(1, 2);
    g.add_edge(2, 3);
    g.add_edge(3, 1);
    EXPECT_EQ(find_cycle(g), (std::vector<int>{1, 2, 3}));
    Graph dag(3);
    dag.add_edge(0, 1);
    dag.add_edge(0, 2);
    dag.add_edge(1, 2);
    EXPECT_TRUE(find_cycle(dag).empty());
    EXPECT_TRUE(find_cycle(Graph(0)).empty());
}
