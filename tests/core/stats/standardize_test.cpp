#include "core/stats/standardize.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

// Direct standardisation by its definition (Pearl 2009 back-door formula [from memory]; the
// fixed-weight variance is common practice), worked by hand on two strata.
TEST(Standardize, TwoStrataByHand) {
    // Stratum 1: focal 8/10, reference 60/90; stratum 2: focal 45/90, reference 3/10.
    const Strata s{{8, 2, 60, 30}, {45, 45, 3, 7}};
    const auto r = standardized_rd(s);
    // weights 100/200 each
    EXPECT_NEAR(r.rate_focal, 0.5 * 0.8 + 0.5 * 0.5, 1e-12);
    EXPECT_NEAR(r.rate_reference, 0.5 * (60.0 / 90) + 0.5 * 0.3, 1e-12);
    const double var = 0.25 * (0.8 * 0.2 / 10 + (60.0 / 90) * (30.0 / 90) / 90) +
                       0.25 * (0.5 * 0.5 / 90 + 0.3 * 0.7 / 10);
    EXPECT_NEAR(r.se, std::sqrt(var), 1e-12);
    EXPECT_NEAR(r.rd_ci.hi - r.rd, 1.959963985 * std::sqrt(var), 1e-8);
}

TEST(Standardize, UninformativeStrataDropped) {
    const Strata s{{8, 2, 60, 30}, {5, 5, 0, 0}};
    const auto r = standardized_rd(s);
    EXPECT_NEAR(r.rd, 0.8 - 60.0 / 90, 1e-12);
    EXPECT_TRUE(std::isnan(standardized_rd({{1, 1, 0, 0}}).rd));
}
