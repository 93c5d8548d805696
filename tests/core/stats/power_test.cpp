#include "core/stats/power.h"

#include <gtest/gtest.h>

#include <cmath>

using foldline::stats::rows_per_group_for_power;

// Reference values from statsmodels 0.14 (Debian python3-statsmodels):
//   NormalIndPower().solve_power(effect_size=proportion_effectsize(p1, p2), alpha=0.05, power=0.8, ratio=1)
//   (0.5, 0.6) -> 387.1677;  (0.78, 0.726) -> 998.5796
// and Cohen 1988, Table 6.4.1: h = 0.2, two-sided alpha 0.05, power 0.80 -> n = 392 per group
// (Cohen's table rounds z and h; from memory).
TEST(Power, TwoRatesAgainstStatsmodels) {
    EXPECT_NEAR(rows_per_group_for_power(0.5, 0.6, 0.05, 0.8), 387.1677, 0.5);
    EXPECT_NEAR(rows_per_group_for_power(0.78, 0.726, 0.05, 0.8), 998.5796, 0.5);
    EXPECT_NEAR(rows_per_group_for_power(0.6, 0.5, 0.05, 0.8), 387.1677, 0.5);  // symmetric
}

TEST(Power, UndefinedInputs) {
    EXPECT_TRUE(std::isnan(rows_per_group_for_power(0.5, 0.5, 0.05, 0.8)));
    EXPECT_TRUE(std::isnan(rows_per_group_for_power(1.2, 0.5, 0.05, 0.8)));
    EXPECT_TRUE(std::isnan(rows_per_group_for_power(0.4, 0.5, 0, 0.8)));
}
