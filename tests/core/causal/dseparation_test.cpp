// Tests of core/causal/dseparation.h.
//  - Golden cases: answers of networkx 2.8.8 `d_separated` on random DAGs (dsep_golden.txt,
//    written by tests/reference/dsep_reference.py, which also runs the full comparison).
//  - The three canonical connections (Pearl 2009, Causality, Def. 1.2.3 [from memory]):
//    chains and forks are blocked by their middle node, a collider is blocked unless it or a
//    descendant is conditioned on.
#include "core/causal/dseparation.h"

#include <gtest/gtest.h>

#include "tests/core/causal/golden_cases.h"

using namespace foldline::causal;

TEST(DSeparation, MatchesNetworkxGoldenCases) {
    auto graphs = fixtures::read_golden(FOLDLINE_TEST_DATA_DIR "/dsep_golden.txt");
    ASSERT_EQ(graphs.size(), 200u);  // 100 d-separation graphs + 100 adjustment graphs
    std::size_t checked = 0, separated = 0;
    for (const auto& gg : graphs)
        for (const auto& q : gg.queries) {
            if (q.kind != 'D') continue;
            EXPECT_EQ(d_separated(gg.graph, q.x, q.y, q.z), q.separated) << q.text;
            ++checked;
            separated += q.separated ? 1 : 0;
        }
    EXPECT_EQ(checked, 600u);
    EXPECT_GT(separated, 50u);  // both answers occur often enough to matter
    EXPECT_LT(separated, 550u);
}

TEST(DSeparation, ChainForkCollider) {
    Graph chain(3);  // 0 → 1 → 2
    chain.add_edge(0, 1);
    chain.add_edge(1, 2);
    EXPECT_FALSE(d_separated(chain, {0}, {2}, {}));
    EXPECT_TRUE(d_separated(chain, {0}, {2}, {1}));

    Graph fork(3);  // 0 ← 1 → 2
    fork.add_edge(1, 0);
    fork.add_edge(1, 2);
    EXPECT_FALSE(d_separated(fork, {0}, {2}, {}));
    EXPECT_TRUE(d_separated(fork, {0}, {2}, {1}));

    Graph collider(4);  // 0 → 1 ← 2, 1 → 3
    collider.add_edge(0, 1);
    collider.add_edge(2, 1);
    collider.add_edge(1, 3);
    EXPECT_TRUE(d_separated(collider, {0}, {2}, {}));
    EXPECT_FALSE(d_separated(collider, {0}, {2}, {1}));
    EXPECT_FALSE(d_separated(collider, {0}, {2}, {3}));  // a descendant of the collider opens it
}

TEST(DSeparation, EdgeCases) {
    Graph g(2);
    g.add_edge(0, 1);
    EXPECT_TRUE(d_separated(g, {}, {1}, {}));
    EXPECT_FALSE(d_separated(g, {0}, {0}, {}));
    EXPECT_FALSE(d_separated(g, {0}, {1}, {}));
    auto reach = d_connected(g, {0}, to_mask(2, {}));
    EXPECT_EQ(from_mask(reach), (std::vector<int>{0, 1}));
}
