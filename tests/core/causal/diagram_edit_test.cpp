// Tests of core/causal/diagram_edit.h: every edit either keeps the diagram valid (checked with
// CausalGraph::build) or is refused with a message and no change.
#include "core/causal/diagram_edit.h"

#include <random>

#include <gtest/gtest.h>

using namespace foldline::causal;
using foldline::Ok;
using foldline::Status;

namespace {

Diagram abc() {
    Diagram d;
    for (const char* n : {"a", "b", "c"}) EXPECT_TRUE(add_node(d, n).ok());
    EXPECT_TRUE(add_edge(d, "a", "b").ok());
    EXPECT_TRUE(add_edge(d, "b", "c").ok());
    return d;
}

std::string node_name(unsigned k) {
    std::string s(1, 'n');
    s += std::to_string(k);
    return s;
}

}  // namespace

TEST(DiagramEdit, RefusesCyclesNamingThePath) {
    Diagram d = abc();
    auto st = add_edge(d, "c", "a");
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().message, "the edge \"c\" -> \"a\" would close the cycle \"a\" -> \"b\" -> \"c\" -> \"a\"");
    EXPECT_EQ(d.edges.size(), 2u);
    EXPECT_EQ(add_edge(d, "a", "a").error().message, "a node cannot cause itself (self-loop)");
    EXPECT_EQ(add_edge(d, "a", "b").error().message, "the edge \"a\" -> \"b\" already exists");
    EXPECT_EQ(add_edge(d, "a", "q").error().message, "\"q\" is not a node of the diagram");
    EXPECT_TRUE(add_edge(d, "a", "c").ok());
}

TEST(DiagramEdit, RenameAndRemoveFollowReferences) {
    Diagram d = abc();
    ASSERT_TRUE(set_question(d, "a", "c").ok());
    ASSERT_TRUE(rename_node(d, "a", "income band").ok());
    EXPECT_EQ(d.exposure, "income band");
    EXPECT_EQ(d.edges[0].from, "income band");
    EXPECT_EQ(rename_node(d, "b", "c").error().message, "a node named \"c\" already exists");
    ASSERT_TRUE(remove_node(d, "b").ok());
    EXPECT_TRUE(d.edges.empty());
    ASSERT_TRUE(remove_node(d, "c").ok());
    EXPECT_TRUE(d.outcome.empty());
    EXPECT_FALSE(remove_node(d, "c").ok());
    EXPECT_FALSE(remove_edge(d, "x", "y").ok());
}

TEST(DiagramEdit, QuestionAndObservedStayConsistent) {
    Diagram d = abc();
    ASSERT_TRUE(set_observed(d, "b", false).ok());
    EXPECT_EQ(set_question(d, "b", "c").error().message,
              "exposure \"b\" is marked unobserved; it must be an observed column");
    ASSERT_TRUE(set_question(d, "a", "c").ok());
    EXPECT_EQ(set_observed(d, "c", false).error().message, "\"c\" is the outcome; it must stay observed");
    EXPECT_FALSE(set_question(d, "a", "a").ok());
    EXPECT_FALSE(add_node(d, "a").ok());
    EXPECT_FALSE(add_node(d, "").ok());
}

TEST(DiagramEdit, RandomEditsAlwaysLeaveAValidDiagram) {
    std::mt19937 rng(3);
    Diagram d;
    std::size_t refused = 0, accepted = 0;
    for (int i = 0; i < 3000; ++i) {
        const std::string a = node_name(rng() % 12), b = node_name(rng() % 12);
        Status st = Ok{};
        switch (rng() % 6) {
            case 0: st = add_node(d, a, rng() % 4 != 0); break;
            case 1: case 2: case 3: st = add_edge(d, a, b); break;
            case 4: st = remove_edge(d, a, b); break;
            default: st = (rng() % 4 == 0) ? remove_node(d, a) : set_question(d, a, b);
        }
        (st.ok() ? accepted : refused) += 1;
        auto cg = CausalGraph::build(d);
        ASSERT_TRUE(cg.ok()) << "after edit " << i << ": " << cg.error().to_string();
    }
    EXPECT_GT(accepted, 500u);
    EXPECT_GT(refused, 500u);
}

TEST(DiagramEdit, NodesKeepTheirPlaceAndMove) {
    Diagram d;
    ASSERT_TRUE(add_node(d, DiagramNode{"region", false, 12.5, -40.0}).ok());
    ASSERT_EQ(d.nodes.size(), 1u);
    EXPECT_FALSE(d.nodes[0].observed);
    EXPECT_EQ(d.nodes[0].x, 12.5);
    EXPECT_EQ(d.nodes[0].y, -40.0);
    ASSERT_TRUE(move_node(d, "region", 300.0, 80.0).ok());
    EXPECT_EQ(d.nodes[0].x, 300.0);
    EXPECT_EQ(d.nodes[0].y, 80.0);
    EXPECT_EQ(move_node(d, "branch", 0.0, 0.0).error().message, "\"branch\" is not a node of the diagram");
    // A blank name is no name: refused like an empty one, and nothing is added.
    EXPECT_EQ(add_node(d, DiagramNode{"  \t", true, {}, {}}).error().message, "a node needs a name");
    EXPECT_EQ(add_node(d, DiagramNode{"region", true, {}, {}}).error().message,
              "a node named \"region\" already exists");
    EXPECT_EQ(d.nodes.size(), 1u);
}

TEST(DiagramEdit, ChecksAnswerWhatTheEditWouldAndChangeNothing) {
    Diagram d = abc();
    const std::size_t edges = d.edges.size();
    EXPECT_TRUE(check_new_edge(d, "a", "c").ok());
    EXPECT_EQ(check_new_edge(d, "c", "a").error().message, add_edge(d, "c", "a").error().message);
    EXPECT_EQ(check_new_edge(d, "b", "b").error().message, "a node cannot cause itself (self-loop)");
    EXPECT_EQ(check_new_edge(d, "a", "b").error().message, "the edge \"a\" -> \"b\" already exists");
    EXPECT_EQ(d.edges.size(), edges);
    EXPECT_TRUE(check_new_node(d, "d").ok());
    EXPECT_EQ(check_new_node(d, "b").error().message, "a node named \"b\" already exists");
    EXPECT_EQ(check_new_node(d, "").error().message, "a node needs a name");
    EXPECT_EQ(check_new_node(d, " ").error().message, "a node needs a name");
    EXPECT_EQ(d.nodes.size(), 3u);
}
