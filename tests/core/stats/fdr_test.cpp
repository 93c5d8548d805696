#include "core/stats/fdr.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

// R: p.adjust(c(0.01, 0.04, 0.03, 0.005, 0.5), "BH") = 0.025 0.05 0.05 0.025 0.5 [calc, R 4.2
// stats; recomputed by hand from the step-up definition of Benjamini & Hochberg 1995].
TEST(Fdr, BenjaminiHochbergStepUp) {
    const auto q = benjamini_hochberg({0.01, 0.04, 0.03, 0.005, 0.5});
    const double want[] = {0.025, 0.05, 0.05, 0.025, 0.5};
    for (int i = 0; i < 5; ++i) EXPECT_NEAR(q[i], want[i], 1e-12) << i;
}

TEST(Fdr, NaNIgnoredAndEmpty) {
    const auto q = benjamini_hochberg({0.02, NAN, 0.04});
    EXPECT_NEAR(q[0], 0.04, 1e-12);
    EXPECT_TRUE(std::isnan(q[1]));
    EXPECT_NEAR(q[2], 0.04, 1e-12);
    EXPECT_TRUE(benjamini_hochberg({}).empty());
    EXPECT_DOUBLE_EQ(benjamini_hochberg({0.9, 0.95})[0], 0.95);
}
