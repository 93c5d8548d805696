#include "core/stats/bootstrap.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

TEST(Bootstrap, KeepsGroupTotalsAndIsDeterministic) {
    const Strata s{{30, 70, 20, 80}, {5, 15, 40, 10}};
    std::mt19937_64 r1(42), r2(42);
    const auto a = resample_strata(s, r1);
    const auto b = resample_strata(s, r2);
    double n1 = 0, n0 = 0;
    for (std::size_t z = 0; z < s.size(); ++z) {
        EXPECT_EQ(a[z].a, b[z].a);
        EXPECT_EQ(a[z].d, b[z].d);
        n1 += a[z].n_focal();
        n0 += a[z].n_reference();
    }
    EXPECT_EQ(n1, 120);
    EXPECT_EQ(n0, 150);
    EXPECT_TRUE(std::isnan(bootstrap_share(s, 0, 1, [](const Strata&) { return true; })));
}

// The multinomial redraw has the right mean: the average focal events in stratum 1 over many
// draws is close to 30 (the binomial mean n p; sd of the mean about 0.46/sqrt(draws) * ...).
TEST(Bootstrap, MultinomialMeanMatchesCounts) {
    const Strata s{{30, 70, 20, 80}, {5, 15, 40, 10}};
    std::mt19937_64 rng(7);
    double sum = 0;
    const int draws = 4000;
    for (int i = 0; i < draws; ++i) sum += resample_strata(s, rng)[0].a;
    // sd of one draw = sqrt(120 * 0.25 * 0.75) = 4.74; of the mean 0.075; 5 sd = 0.375.
    EXPECT_NEAR(sum / draws, 30.0, 0.375);
    // Share of draws where focal events in stratum 1 exceed 30: about one half.
    const double share = bootstrap_share(s, 2000, 11, [](const Strata& t) { return t[0].a > 30; });
    EXPECT_GT(share, 0.35);
    EXPECT_LT(share, 0.55);
}
