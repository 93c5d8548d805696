// tests/core/causal/combined_exposure_test.cpp <-> core/causal/combined_exposure.h
#include "core/causal/combined_exposure.h"

#include <gtest/gtest.h>

#include "core/causal/adjustment.h"

using namespace foldline::causal;

namespace {

Diagram parts_diagram() {
    // region confounds ethnicity and hiring; department lies on the path from both parts.
    Diagram d;
    for (const char* n : {"region", "sex", "ethnicity", "department", "hired"})
        d.nodes.push_back({n, true, 10.0, 20.0});
    d.nodes[1].x = 0.0;
    d.nodes[2].x = 100.0;
    d.edges = {{"region", "ethnicity"}, {"region", "hired"}, {"sex", "department"}, {"ethnicity", "department"},
               {"department", "hired"}, {"sex", "hired"}, {"sex", "ethnicity"}};
    d.exposure = "sex";
    d.outcome = "hired";
    return d;
}

std::vector<std::string> names(const CausalGraph& g, const std::vector<int>& set) {
    std::vector<std::string> out;
    for (int v : set) out.push_back(g.name(v));
    std::sort(out.begin(), out.end());
    return out;
}

}  // namespace

TEST(CombinedExposure, OneNodeWithThePartsParentsAndChildren) {
    const Diagram c = combine_exposure(parts_diagram(), {"sex", "ethnicity"}, "sex+ethnicity");
    ASSERT_EQ(c.nodes.size(), 4u);
    EXPECT_EQ(c.nodes[1].name, "sex+ethnicity");
    EXPECT_EQ(*c.nodes[1].x, 50.0);  // between the parts
    EXPECT_EQ(c.exposure, "sex+ethnicity");
    // region -> ethnicity becomes region -> sex+ethnicity; sex -> ethnicity (between parts)
    // vanishes; the two arrows into department become one.
    const std::vector<DiagramEdge> want = {{"region", "sex+ethnicity"}, {"region", "hired"}, {"sex+ethnicity", "department"},
                                           {"department", "hired"}, {"sex+ethnicity", "hired"}};
    ASSERT_EQ(c.edges.size(), want.size());
    for (std::size_t i = 0; i < want.size(); ++i) {
        EXPECT_EQ(c.edges[i].from, want[i].from);
        EXPECT_EQ(c.edges[i].to, want[i].to);
    }
    // Unchanged when the combined node is drawn already, or a part is missing.
    EXPECT_EQ(combine_exposure(c, {"sex", "ethnicity"}, "sex+ethnicity").nodes.size(), 4u);
    EXPECT_EQ(combine_exposure(parts_diagram(), {"sex", "age"}, "sex+age").nodes.size(), 5u);
}

TEST(CombinedExposure, BackDoorReadsTheCombinationAsOneVariable) {
    // Back-door criterion (Pearl 2009, Causality, 2nd ed., definition 3.3.1): the only back-door
    // path from the combined groups to hiring runs through region (a parent of one part), so
    // {region} is the one minimal adjustment set; department is a descendant (a mediator) and
    // may not be adjusted for the total effect.
    const Diagram c = combine_exposure(parts_diagram(), {"sex", "ethnicity"}, "sex+ethnicity");
    auto g = CausalGraph::build(c);
    ASSERT_TRUE(g.ok()) << g.error().to_string();
    const int x = g->index_of("sex+ethnicity"), y = g->index_of("hired");
    const auto sets = minimal_adjustment_sets(g->graph(), {x}, {y}, g->observed_mask());
    ASSERT_EQ(sets.sets.size(), 1u);
    EXPECT_EQ(names(*g, sets.sets[0]), (std::vector<std::string>{"region"}));
    EXPECT_FALSE(is_valid_adjustment(g->graph(), {x}, {y}, {g->index_of("department")}));
}
