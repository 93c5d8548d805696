// Tests of core/stats/median.h against the textbook definition of the median (the middle value,
// or the mean of the two middle values; a frequency weight stands for repeated values).
#include "core/stats/median.h"

#include <gtest/gtest.h>

#include <cmath>

using foldline::stats::SortedMedians;
using foldline::stats::weighted_median;

TEST(Median, OddAndEvenCounts) {
    EXPECT_DOUBLE_EQ(weighted_median({3, 1, 2}), 2.0);
    EXPECT_DOUBLE_EQ(weighted_median({4, 1, 3, 2}), 2.5);
    EXPECT_DOUBLE_EQ(weighted_median({7}), 7.0);
}

TEST(Median, WeightsStandForRepeatedValues) {
    // {1, 2, 10 (x2)} is {1, 2, 10, 10}: median (2 + 10) / 2 = 6.
    EXPECT_DOUBLE_EQ(weighted_median({10, 1, 2}, {2, 1, 1}), 6.0);
    // {1 (x3), 5}: median 1.
    EXPECT_DOUBLE_EQ(weighted_median({5, 1}, {1, 3}), 1.0);
}

TEST(Median, SkipsNaNAndNonPositiveWeights) {
    EXPECT_DOUBLE_EQ(weighted_median({NAN, 1, 9, 100}, {1, 1, 1, 0}), 5.0);
    EXPECT_TRUE(std::isnan(weighted_median({})));
    EXPECT_TRUE(std::isnan(weighted_median({NAN})));
}

TEST(SortedMedians, CellsFromOneSortedPass) {
    // Cell 0 gets 1, 2, 3; cell 1 gets 2, 4; cell 2 nothing.
    SortedMedians m({3, 2, 0});
    m.add(0, 1);
    m.add(0, 2);
    m.add(1, 2);
    m.add(0, 3);
    m.add(1, 4);
    m.add(7, 5);  // out of range: ignored
    const auto v = m.medians();
    EXPECT_DOUBLE_EQ(v[0], 2.0);
    EXPECT_DOUBLE_EQ(v[1], 3.0);
    EXPECT_TRUE(std::isnan(v[2]));
}
