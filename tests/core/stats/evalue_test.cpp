#include "core/stats/evalue.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

// VanderWeele & Ding (2017) Ann Intern Med 167:268, worked examples [src, methods.md]; the first
// two also recomputed from the formula [calc].
TEST(EValue, VanderWeeleDing2017) {
    auto e = e_value(3.9, {1.8, 8.7});
    EXPECT_NEAR(e.estimate, 7.263034, 5e-7);
    EXPECT_NEAR(e.ci_limit, 3.0, 1e-12);
    e = e_value(0.80, {0.71, 0.91});
    EXPECT_NEAR(e.estimate, 1.809017, 5e-7);
    EXPECT_NEAR(e.ci_limit, 1.428571, 5e-7);
    e = e_value(10.73, {8.02, 14.36});
    EXPECT_NEAR(e.estimate, 20.94777, 5e-5);
    EXPECT_NEAR(e.ci_limit, 15.52336, 5e-5);
}

TEST(EValue, CiContainingOneAndUndefined) {
    EXPECT_DOUBLE_EQ(e_value(1.3, {0.9, 1.8}).ci_limit, 1.0);
    EXPECT_DOUBLE_EQ(e_value(1.0), 1.0);
    EXPECT_TRUE(std::isnan(e_value(0.0)));
    EXPECT_TRUE(std::isnan(e_value(INFINITY)));
}
