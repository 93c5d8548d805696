// Tests of core/causal/roles.h: roles on diagrams whose textbook reading is known, and
// identifiability with the unobserved nodes responsible.
// Role vocabulary as in Hernán & Robins, Causal Inference: What If (2020), ch. 6-8, and
// Greenland, Pearl & Robins 1999 (Epidemiology 10:37-48) for colliders and M-bias [from memory].
#include "core/causal/roles.h"

#include <gtest/gtest.h>

#include "tests/core/causal/test_graphs.h"

using namespace foldline::causal;
using foldline::causal::fixtures::make_diagram;

namespace {

Role role_of(const CausalGraph& cg, const std::vector<Role>& roles, const char* name) {
    return roles[static_cast<std::size_t>(cg.index_of(name))];
}

}  // namespace

TEST(Roles, EveryRoleOnOneDiagram) {
    // X → Y with: C confounds, M mediates (M → T: descendant of a mediator), Y → K (descendant
    // of the outcome), X → L ← Q → Y (L collider, L → L2 its descendant), I → X (instrument-
    // like), P → Y (precision), X → E (effect of X off the causal paths), R alone (unrelated).
    auto cg = CausalGraph::build(make_diagram(
        {"X", "Y", "C", "M", "T", "K", "L", "L2", "Q", "I", "P", "E", "R"},
        {{"X", "Y"}, {"C", "X"}, {"C", "Y"}, {"X", "M"}, {"M", "Y"}, {"M", "T"}, {"Y", "K"}, {"X", "L"},
         {"Q", "L"}, {"Q", "Y"}, {"L", "L2"}, {"I", "X"}, {"P", "Y"}, {"X", "E"}}));
    ASSERT_TRUE(cg.ok());
    auto roles = assign_roles(cg->graph(), cg->index_of("X"), cg->index_of("Y"));
    EXPECT_EQ(role_of(*cg, roles, "X"), Role::Exposure);
    EXPECT_EQ(role_of(*cg, roles, "Y"), Role::Outcome);
    EXPECT_EQ(role_of(*cg, roles, "C"), Role::Confounder);
    EXPECT_EQ(role_of(*cg, roles, "M"), Role::Mediator);
    EXPECT_EQ(role_of(*cg, roles, "T"), Role::MediatorDescendant);
    EXPECT_EQ(role_of(*cg, roles, "K"), Role::OutcomeDescendant);
    EXPECT_EQ(role_of(*cg, roles, "L"), Role::Collider);
    EXPECT_EQ(role_of(*cg, roles, "L2"), Role::ColliderDescendant);
    EXPECT_EQ(role_of(*cg, roles, "Q"), Role::OutcomeCause);
    EXPECT_EQ(role_of(*cg, roles, "I"), Role::ExposureCause);
    EXPECT_EQ(role_of(*cg, roles, "P"), Role::OutcomeCause);
    EXPECT_EQ(role_of(*cg, roles, "E"), Role::ExposureDescendant);
    EXPECT_EQ(role_of(*cg, roles, "R"), Role::Unrelated);
    EXPECT_EQ(to_string(Role::OutcomeCause), "outcome_cause");
    EXPECT_TRUE(always_biases(Role::Mediator));
    EXPECT_FALSE(always_biases(Role::Confounder));
}

TEST(Roles, MBiasNodeIsACollider) {
    auto cg = CausalGraph::build(
        make_diagram({"X", "M", "Y"}, {{"U1", "X"}, {"U1", "M"}, {"U2", "M"}, {"U2", "Y"}, {"X", "Y"}}, {"U1", "U2"}));
    ASSERT_TRUE(cg.ok());
    auto roles = assign_roles(cg->graph(), cg->index_of("X"), cg->index_of("Y"));
    EXPECT_EQ(role_of(*cg, roles, "M"), Role::Collider);
    EXPECT_EQ(role_of(*cg, roles, "U1"), Role::ExposureCause);
    EXPECT_EQ(role_of(*cg, roles, "U2"), Role::OutcomeCause);
}

TEST(Roles, UnobservedConfounderMakesTheEffectNotIdentifiable) {
    // A common cause that is not measured leaves no valid adjustment set (Pearl 2009, §3.3
    // [from memory]); measuring it would.
    auto cg = CausalGraph::build(make_diagram({"X", "Y", "Z"}, {{"U", "X"}, {"U", "Y"}, {"Z", "X"}, {"Z", "Y"}, {"X", "Y"}}, {"U"}));
    ASSERT_TRUE(cg.ok());
    auto id = identifiability(*cg, cg->index_of("X"), cg->index_of("Y"));
    EXPECT_FALSE(id.identifiable);
    EXPECT_EQ(cg->names_of(id.unobserved_needed), (std::vector<std::string>{"U"}));
    EXPECT_FALSE(id.outcome_causes_exposure);
}

TEST(Roles, UnobservedCauseBehindAnObservedProxyIsHarmless) {
    // X ← U → W → Y: conditioning on the observed W blocks the path through U [calc].
    auto cg = CausalGraph::build(make_diagram({"X", "Y", "W"}, {{"U", "X"}, {"U", "W"}, {"W", "Y"}, {"X", "Y"}}, {"U"}));
    ASSERT_TRUE(cg.ok());
    auto id = identifiability(*cg, cg->index_of("X"), cg->index_of("Y"));
    EXPECT_TRUE(id.identifiable);
    EXPECT_EQ(cg->names_of(id.smallest), (std::vector<std::string>{"W"}));
    EXPECT_TRUE(id.unobserved_needed.empty());
}

TEST(Roles, TwoUnobservedConfoundersAreBothNamed) {
    auto cg = CausalGraph::build(make_diagram({"X", "Y", "A"},
                                              {{"U1", "X"}, {"U1", "Y"}, {"U2", "A"}, {"A", "X"}, {"U2", "Y"}, {"X", "Y"}},
                                              {"U1", "U2"}));
    ASSERT_TRUE(cg.ok());
    auto id = identifiability(*cg, cg->index_of("X"), cg->index_of("Y"));
    EXPECT_FALSE(id.identifiable);
    // U1 must be measured; the path through U2 is already blocked by the observed A [calc].
    EXPECT_EQ(cg->names_of(id.unobserved_needed), (std::vector<std::string>{"U1"}));
}

TEST(Roles, OutcomeCausingExposureIsReported) {
    auto cg = CausalGraph::build(make_diagram({"X", "Y"}, {{"Y", "X"}}));
    ASSERT_TRUE(cg.ok());
    auto id = identifiability(*cg, 0, 1);
    EXPECT_FALSE(id.identifiable);
    EXPECT_TRUE(id.outcome_causes_exposure);
    EXPECT_TRUE(id.unobserved_needed.empty());
}
