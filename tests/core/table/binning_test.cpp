#include "core/table/binning.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline;

// Quantile cut points by their definition (the value at share j/bins of the sorted values,
// like R's quantile type 1 [from memory]); checked on 1..100, where the quartile cuts are 26, 51, 76.
TEST(Binning, QuartilesOfOneToHundred) {
    std::vector<double> v;
    for (int i = 100; i >= 1; --i) v.push_back(i);
    v.push_back(NAN);
    const auto c = quantile_bins(Column::numeric("x", v), 4);
    ASSERT_TRUE(c);
    EXPECT_EQ(c->levels, (std::vector<std::string>{"[1, 26)", "[26, 51)", "[51, 76)", "[76, 100]"}));
    EXPECT_EQ(c->code(0), 3u);    // 100
    EXPECT_EQ(c->code(99), 0u);   // 1
    EXPECT_EQ(c->code(75), 0u);   // 25
    EXPECT_EQ(c->code(74), 1u);   // 26 goes to the bin above the cut
    EXPECT_TRUE(c->is_missing(100));
    // Weighted with unit weights: the same bins.
    const auto w = quantile_bins(Column::numeric("x", v), 4, std::vector<double>(v.size(), 1.0));
    EXPECT_EQ(w->levels, c->levels);
}

TEST(Binning, TiesMergeBinsAndDegenerateInput) {
    const auto c = quantile_bins(Column::numeric("x", {1, 1, 1, 1, 1, 2, 2, 3}), 4);
    ASSERT_TRUE(c);
    // Cuts at sorted positions 2, 4, 6 are 1, 1, 2: the two at the minimum merge away.
    EXPECT_EQ(c->levels, (std::vector<std::string>{"[1, 2)", "[2, 3]"}));
    const auto same = quantile_bins(Column::numeric("x", {5, 5}), 4);
    EXPECT_EQ(same->levels.size(), 1u);
    EXPECT_EQ(quantile_bins(Column::numeric("x", {NAN}), 4)->levels.size(), 0u);
    EXPECT_FALSE(quantile_bins(Column::numeric("x", {1, 2}), 1));
}

TEST(Binning, IntegerLevels) {
    const auto c = integer_levels(Column::numeric("kids", {3, 0, 1, NAN, 3, -1}), 50);
    ASSERT_TRUE(c);
    EXPECT_EQ(c->levels, (std::vector<std::string>{"-1", "0", "1", "3"}));
    EXPECT_EQ(c->code(0), 3u);
    EXPECT_TRUE(c->is_missing(3));
    EXPECT_FALSE(integer_levels(Column::numeric("x", {0.5, 1}), 50));
    EXPECT_FALSE(integer_levels(Column::numeric("x", {1, 2, 3}), 2));
    EXPECT_TRUE(integer_levels(Column::numeric("x", {0, 1e12}), 50));  // wide range, few values
    EXPECT_EQ(format_number(0.1 + 0.2), "0.3");
}
