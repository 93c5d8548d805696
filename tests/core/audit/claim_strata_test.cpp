#include "core/audit/claim_strata.h"

#include <gtest/gtest.h>

#include <random>

#include "core/audit/diagram_checks.h"
#include "core/scan/joint_strata.h"

using namespace foldline;

namespace {

Table sample(std::size_t n) {
    std::mt19937_64 rng(7);
    std::uniform_int_distribution<int> k(0, 3);
    std::normal_distribution<double> e(0, 1);
    std::vector<std::uint32_t> a(n), b(n);
    std::vector<double> x(n), y(n);
    for (std::size_t i = 0; i < n; ++i) {
        a[i] = static_cast<std::uint32_t>(k(rng));
        b[i] = i % 17 == 0 ? 3u : static_cast<std::uint32_t>(k(rng) % 3);  // 3 = missing
        x[i] = e(rng) + a[i];
        y[i] = i % 23 == 0 ? std::nan("") : x[i] + e(rng);
    }
    Table t;
    t.rows = n;
    t.columns = {Column::categorical("a", {"p", "q", "r", "s"}, a), Column::categorical("b", {"u", "v", "w"}, b),
                 Column::numeric("x", x), Column::numeric("y", y)};
    return t;
}

}  // namespace

// The shared strata are the same strata joint_stratifier gives claim by claim (same numbering,
// same missing rows), and each numeric column is cut once however many sets use it.
TEST(ClaimStrata, SameStrataAsJointStratifierWithEachColumnCutOnce) {
    const Table t = sample(3000);
    audit::ClaimStrata strata(t, 4, 50);
    const std::vector<std::vector<std::string>> sets = {{"a"}, {"x"}, {"a", "x"}, {"b", "y"}, {"x", "y", "a"}, {"a", "x"}};
    for (const auto& set : sets) {
        auto mine = strata.joint(set);
        auto want = joint_stratifier(t, set, 4, 50);
        ASSERT_TRUE(mine && want);
        ASSERT_EQ((*mine)->levels, want->levels.size());
        for (std::size_t i = 0; i < t.rows; ++i) ASSERT_EQ((*mine)->code(i), want->code(i)) << i;
    }
    EXPECT_EQ(strata.cuts_made(), 2u);   // x and y, once each
    EXPECT_EQ(strata.joints_made(), 5u); // {a, x} the second time comes from the cache
    auto empty = strata.joint({});
    ASSERT_TRUE(empty);
    EXPECT_EQ((*empty)->levels, 1u);
    EXPECT_FALSE(strata.joint({"nope"}));
    EXPECT_FALSE(strata.categorical("nope"));
}

// Over the budget a set's strata are computed for the claim at hand and not kept.
TEST(ClaimStrata, JointStrataBeyondTheBudgetAreNotKept) {
    const Table t = sample(500);
    audit::ClaimStrata strata(t, 4, 50, 0);
    ASSERT_TRUE(strata.joint({"a", "b"}));
    ASSERT_TRUE(strata.joint({"a", "b"}));
    EXPECT_EQ(strata.joints_made(), 2u);
}

// Sharing the cut columns across claims changes no result: every claim tested through one
// ClaimStrata equals the claim tested alone on fresh strata.
TEST(ClaimStrata, SharedStrataGiveTheSameTestsAsFreshOnes) {
    const Table t = sample(2000);
    causal::Diagram d;
    for (const char* n : {"a", "b", "x", "y"}) d.nodes.push_back({n, true, {}, {}});
    d.edges = {{"a", "x"}, {"x", "y"}};
    auto all = audit::check_diagram(d, t, {});
    ASSERT_TRUE(all);
    ASSERT_FALSE(all->checks.empty());
    for (const auto& c : all->checks) {
        causal::DiagramCheck alone = c;
        alone.test = {};
        audit::test_claim(alone, t, {});
        EXPECT_EQ(alone.test.statistic, c.test.statistic) << c.sentence;
        EXPECT_EQ(alone.test.p, c.test.p) << c.sentence;
        EXPECT_EQ(alone.test.df, c.test.df) << c.sentence;
    }
}
