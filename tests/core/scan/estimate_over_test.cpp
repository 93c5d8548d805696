// Tests of core/scan/estimate_over.h: adjusted estimates over a set of three columns, checked
// by hand (direct standardisation, the formula in core/stats/standardize.h) and against
// statsmodels OLS with one intercept per joint stratum.
#include "core/scan/estimate_over.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

using namespace foldline;

namespace {

Column categorical(const std::string& name, const std::vector<std::string>& cells) {
    std::vector<std::string> levels;
    std::vector<std::uint32_t> codes;
    for (const auto& cell : cells) {
        if (cell.empty()) {
            codes.push_back(0xFFFFFFFF);  // fixed below: missing = levels.size()
            continue;
        }
        auto it = std::find(levels.begin(), levels.end(), cell);
        if (it == levels.end()) it = levels.insert(levels.end(), cell);
        codes.push_back(static_cast<std::uint32_t>(it - levels.begin()));
    }
    for (auto& c : codes)
        if (c == 0xFFFFFFFF) c = static_cast<std::uint32_t>(levels.size());
    return Column::categorical(name, levels, codes);
}

// Three joint strata of (a, b, c), as (focal rows, focal positive, reference rows, reference positive):
//   (x, x, x): 10, 6, 10, 3   rates 0.6 vs 0.3, difference +0.3, 20 rows
//   (x, y, x):  5, 1, 15, 6   rates 0.2 vs 0.4, difference -0.2, 20 rows
//   (y, y, y): 20, 10, 20, 4  rates 0.5 vs 0.2, difference +0.3, 40 rows
// plus one focal positive row missing c, which the set leaves out.
Table three_column_table() {
    std::vector<std::string> out, grp, a, b, c;
    auto add = [&](const char* ga, const char* gb, const char* gc, const char* group, int n, int pos) {
        for (int i = 0; i < n; ++i) {
            out.push_back(i < pos ? "1" : "0");
            grp.push_back(group);
            a.push_back(ga), b.push_back(gb), c.push_back(gc);
        }
    };
    add("x", "x", "x", "F", 10, 6);
    add("x", "x", "x", "R", 10, 3);
    add("x", "y", "x", "F", 5, 1);
    add("x", "y", "x", "R", 15, 6);
    add("y", "y", "y", "F", 20, 10);
    add("y", "y", "y", "R", 20, 4);
    add("y", "y", "", "F", 1, 1);
    Table t;
    t.rows = out.size();
    t.columns = {categorical("cured", out), categorical("group", grp), categorical("a", a), categorical("b", b),
                 categorical("c", c)};
    return t;
}

RowCells cells(const Table& t) {
    QuestionSpec s;
    s.outcome = "cured";
    s.positive = "1";
    s.exposure = "group";
    s.focal = {"F"};
    s.reference = "R";
    auto q = resolve_question(t, s);
    EXPECT_TRUE(q.ok());
    return encode_rows(t, *q);
}

}  // namespace

TEST(EstimateOver, StandardisedDifferenceOverThreeColumnsByHand) {
    const Table t = three_column_table();
    auto e = standardised_rd_over(t, cells(t), {"a", "b", "c"}, 0);
    ASSERT_TRUE(e.ok()) << e.error().to_string();
    // By hand: weights 20/80, 20/80, 40/80 → 0.25 × 0.3 + 0.25 × (−0.2) + 0.5 × 0.3 = 0.175.
    // Var = Σ w² [r1(1 − r1)/n1 + r0(1 − r0)/n0] = 0.0625 × 0.045 + 0.0625 × 0.048 + 0.25 × 0.0205
    // = 0.0109375; 95% Wald limits 0.175 ∓ 1.959964 × 0.1045825 = −0.0299779, 0.3799779
    // (z from scipy.stats.norm.ppf(0.975)).
    EXPECT_NEAR(e->estimate, 0.175, 1e-12);
    EXPECT_NEAR(e->ci_low, -0.02997793991388928, 1e-9);
    EXPECT_NEAR(e->ci_high, 0.3799779399138893, 1e-9);
    EXPECT_EQ(e->strata, 3u);
    EXPECT_EQ(e->over, (std::vector<std::string>{"a", "b", "c"}));
    // The order of the set does not matter.
    auto swapped = standardised_rd_over(t, cells(t), {"c", "a", "b"}, 0);
    ASSERT_TRUE(swapped.ok());
    EXPECT_NEAR(swapped->estimate, 0.175, 1e-12);
    // Empty set: one stratum, the pooled difference of every row: 18/36 − 13/45 (by hand).
    auto pooled = standardised_rd_over(t, cells(t), {}, 0);
    ASSERT_TRUE(pooled.ok());
    EXPECT_NEAR(pooled->estimate, 18.0 / 36.0 - 13.0 / 45.0, 1e-12);
    // Unknown column: an error that names it.
    auto bad = standardised_rd_over(t, cells(t), {"a", "nope"}, 0);
    ASSERT_FALSE(bad.ok());
    EXPECT_NE(bad.error().message.find("nope"), std::string::npos) << bad.error().message;
}

TEST(EstimateOver, NoStratumWithBothGroupsIsNaN) {
    const Table t = three_column_table();
    // Stratifying by the groups themselves leaves no stratum with both.
    auto e = standardised_rd_over(t, cells(t), {"group", "a", "b"}, 0);
    ASSERT_TRUE(e.ok());
    EXPECT_TRUE(std::isnan(e->estimate));
    EXPECT_EQ(e->strata, 0u);
}

// 60 generated rows (formula below); statsmodels 0.13.5 OLS y ~ x + C(a:b:c) [calc]: slope
// 0.49717398365857973, 95% CI 0.4939180743876249 to 0.5004298929295345 (12 joint strata);
// pooled y ~ x: 0.589518215241316.
TEST(EstimateOver, WithinSlopeOverThreeColumnsMatchesStatsmodels) {
    std::vector<double> x, y;
    std::vector<std::string> a, b, c;
    for (int i = 0; i < 60; ++i) {
        const int ia = i % 2, ib = (i / 2) % 2, ic = (i / 4) % 3;
        x.push_back(i % 10 + 0.1 * (i % 7));
        y.push_back(3 * ia + 2 * ib - ic + 0.5 * x.back() - 0.01 * ((i * i) % 13));
        // Labels a0/a1, b0/b1, c0..c2 (built by appending: GCC 12 warns falsely on "a" + string).
        a.push_back(std::string(1, 'a') + char('0' + ia));
        b.push_back(std::string(1, 'b') + char('0' + ib));
        c.push_back(std::string(1, 'c') + char('0' + ic));
    }
    Table t;
    t.rows = 60;
    t.columns = {Column::numeric("x", x), Column::numeric("y", y), categorical("a", a), categorical("b", b),
                 categorical("c", c)};
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto e = within_slope_over(t, q, {"a", "b", "c"});
    ASSERT_TRUE(e.ok()) << e.error().to_string();
    EXPECT_NEAR(e->estimate, 0.49717398365857973, 1e-10);
    EXPECT_NEAR(e->ci_low, 0.4939180743876249, 1e-8);
    EXPECT_NEAR(e->ci_high, 0.5004298929295345, 1e-8);
    EXPECT_EQ(e->strata, 12u);
    auto pooled = within_slope_over(t, q, {});
    ASSERT_TRUE(pooled.ok());
    EXPECT_NEAR(pooled->estimate, 0.589518215241316, 1e-10);
    q.y = "a";
    EXPECT_FALSE(within_slope_over(t, q, {"b"}).ok());  // y not numeric
}
