// Tests of core/causal/diagram.h: validation messages for every kind of bad diagram.
#include "core/causal/diagram.h"

#include <gtest/gtest.h>

#include "tests/core/causal/test_graphs.h"

using namespace foldline::causal;
using foldline::causal::fixtures::make_diagram;

namespace {

std::string error_of(const Diagram& d) {
    auto r = CausalGraph::build(d, "d.diagram.json");
    return r ? std::string("(valid)") : r.error().to_string();
}

}  // namespace

TEST(Diagram, BuildsIndicesAndKeepsNames) {
    auto d = make_diagram({"a b", "say \"hi\"", "c"}, {{"a b", "c"}, {"say \"hi\"", "c"}}, {"u"}, "a b", "c");
    auto cg = CausalGraph::build(d);
    ASSERT_TRUE(cg.ok()) << cg.error().to_string();
    EXPECT_EQ(cg->size(), 4);
    EXPECT_EQ(cg->index_of("say \"hi\""), 1);
    EXPECT_EQ(cg->index_of("nope"), -1);
    EXPECT_FALSE(cg->observed(3));
    EXPECT_EQ(cg->exposure(), 0);
    EXPECT_EQ(cg->outcome(), 2);
    EXPECT_EQ(cg->graph().parents(2), (std::vector<int>{0, 1}));
    EXPECT_TRUE(CausalGraph::build(Diagram{}).ok());
}

TEST(Diagram, NamesTheCycle) {
    auto d = make_diagram({"a", "b", "c", "d"}, {{"d", "a"}, {"a", "b"}, {"b", "c"}, {"c", "a"}});
    EXPECT_EQ(error_of(d),
              "d.diagram.json: the diagram has a cycle: \"a\" -> \"b\" -> \"c\" -> \"a\"; a causal diagram must be acyclic");
}

TEST(Diagram, RejectsSelfLoopUnknownNodeAndDuplicateEdge) {
    EXPECT_EQ(error_of(make_diagram({"a"}, {{"a", "a"}})),
              "d.diagram.json: edge 1 (\"a\" -> \"a\"): a node cannot cause itself (self-loop)");
    EXPECT_EQ(error_of(make_diagram({"a", "b"}, {{"a", "b"}, {"a", "zz"}})),
              "d.diagram.json: edge 2 (\"a\" -> \"zz\"): \"zz\" is not a node of the diagram");
    EXPECT_EQ(error_of(make_diagram({"a", "b"}, {{"a", "b"}, {"a", "b"}})),
              "d.diagram.json: edge 2 (\"a\" -> \"b\"): this edge is listed twice");
    EXPECT_EQ(error_of(make_diagram({"a", "a"}, {})), "d.diagram.json: node \"a\" is declared twice");
    EXPECT_EQ(error_of(make_diagram({""}, {})), "d.diagram.json: node 1 has an empty name");
}

TEST(Diagram, RejectsUnobservedOrUnknownExposureAndOutcome) {
    EXPECT_EQ(error_of(make_diagram({"y"}, {{"x", "y"}}, {"x"}, "x", "y")),
              "d.diagram.json: exposure \"x\" is marked unobserved; it must be an observed column");
    EXPECT_EQ(error_of(make_diagram({"x"}, {{"x", "y"}}, {"y"}, "x", "y")),
              "d.diagram.json: outcome \"y\" is marked unobserved; it must be an observed column");
    EXPECT_EQ(error_of(make_diagram({"x"}, {}, {}, "x", "q")), "d.diagram.json: outcome \"q\" is not a node of the diagram");
    EXPECT_EQ(error_of(make_diagram({"x"}, {}, {}, "x", "x")), "d.diagram.json: exposure and outcome are the same node \"x\"");
}

TEST(Diagram, QuestionChecksNames) {
    auto cg = CausalGraph::build(make_diagram({"x", "y"}, {{"x", "y"}}, {"u"}));
    ASSERT_TRUE(cg.ok());
    auto q = cg->question("x", "y");
    ASSERT_TRUE(q.ok());
    EXPECT_EQ(q->first, 0);
    EXPECT_FALSE(cg->question("u", "y").ok());
    EXPECT_EQ(cg->question("x", "").error().message, "no outcome is set");
    EXPECT_EQ(cg->question("x", "x").error().message, "exposure and outcome are the same node \"x\"");
}

TEST(Diagram, ObservedNodesMustBeDataColumns) {
    auto cg = CausalGraph::build(make_diagram({"x", "y", "z"}, {{"x", "y"}}, {"u"}));
    ASSERT_TRUE(cg.ok());
    EXPECT_TRUE(check_columns(*cg, {"x", "y", "z", "other"}).ok());
    EXPECT_EQ(check_columns(*cg, {"x", "y"}, "d.diagram.json").error().to_string(),
              "d.diagram.json: node \"z\" is marked observed but not a column of the data; mark unobserved or rename "
              "to match a column");
    EXPECT_EQ(check_columns(*cg, {"x"}).error().message.substr(0, 18), "nodes \"y\", \"z\" are");
}
