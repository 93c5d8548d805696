#include "core/stats/bootstrap.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

TEST(Bootstrap, KeepsGroupTotalsAndIsDeterministic) {
    const Strata s{{30, 70, 20, 80}, {5, 15, 40, 10}};
    Xoshiro256 r1(42), r2(42);
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
    Xoshiro256 rng(7);
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

// Large cells take the normal-approximation path: the redrawn count still has the binomial
// mean n p and variance n p (1 - p) (here n = 200000, p = 0.3: mean 60000, sd 204.9).
TEST(Bootstrap, LargeCellsKeepBinomialMoments) {
    const Strata s{{60000, 140000, 50, 50}};
    Xoshiro256 rng(99);
    const int draws = 3000;
    double sum = 0, sum2 = 0;
    for (int i = 0; i < draws; ++i) {
        const double a = resample_strata(s, rng)[0].a;
        sum += a;
        sum2 += a * a;
    }
    const double mean = sum / draws, sd = std::sqrt(sum2 / draws - mean * mean);
    EXPECT_NEAR(mean, 60000, 5 * 204.9 / std::sqrt(draws));
    EXPECT_NEAR(sd, 204.9, 0.1 * 204.9);
}

// The generator: same seed, same stream; uniform mean 1/2 and normal mean 0, variance 1 (the
// defining moments; tolerances are about 5 standard errors at 100000 draws).
TEST(Bootstrap, GeneratorIsDeterministicAndUniform) {
    Xoshiro256 a(123), b(123), c(124);
    EXPECT_EQ(a(), b());
    EXPECT_NE(a(), c());
    double sum = 0;
    Xoshiro256 u(5);
    for (int i = 0; i < 100000; ++i) sum += u.uniform();
    EXPECT_NEAR(sum / 100000, 0.5, 0.005);  // sd of the mean 0.0009
    double s1 = 0, s2 = 0;
    for (int i = 0; i < 100000; ++i) {
        const double z = u.normal();
        s1 += z;
        s2 += z * z;
    }
    EXPECT_NEAR(s1 / 100000, 0.0, 0.02);
    EXPECT_NEAR(s2 / 100000, 1.0, 0.02);
}

// Normal deviates have the standard normal's tail shares: P(Z > 1.959964) = 0.025 and
// P(|Z| > 3) = 0.0027 [from memory, standard normal table]; tolerances about 5 standard errors
// at 400000 draws. The ziggurat's base-layer tail (beyond 3.44) must be reached too.
TEST(Bootstrap, NormalTails) {
    Xoshiro256 u(2024);
    const int n = 400000;
    int above196 = 0, beyond3 = 0, beyond344 = 0;
    for (int i = 0; i < n; ++i) {
        const double z = u.normal();
        above196 += z > 1.959964;
        beyond3 += std::fabs(z) > 3;
        beyond344 += std::fabs(z) > 3.442619855899;
    }
    EXPECT_NEAR(static_cast<double>(above196) / n, 0.025, 5 * std::sqrt(0.025 * 0.975 / n));
    EXPECT_NEAR(static_cast<double>(beyond3) / n, 0.0026998, 5 * std::sqrt(0.0027 / n));
    EXPECT_GT(beyond344, 0);
}

// Large cells drawn jointly keep the multinomial's covariance: for n = 100000 over shares
// 0.5, 0.3, 0.2 the first two cells have covariance -n p1 p2 = -15000 (correlation
// -sqrt(p1 p2 / ((1 - p1)(1 - p2))) = -0.655), and the group total never changes.
TEST(Bootstrap, LargeCellsKeepMultinomialCovariance) {
    const Strata s{{50000, 30000, 10, 10}, {20000, 0, 10, 10}};
    Xoshiro256 rng(31);
    const int draws = 4000;
    double sx = 0, sy = 0, sxy = 0, sxx = 0, syy = 0;
    for (int i = 0; i < draws; ++i) {
        const auto r = resample_strata(s, rng);
        EXPECT_EQ(r[0].a + r[0].b + r[1].a + r[1].b, 100000);
        EXPECT_EQ(r[1].b, 0);  // an empty cell stays empty
        sx += r[0].a;
        sy += r[0].b;
        sxy += r[0].a * r[0].b;
        sxx += r[0].a * r[0].a;
        syy += r[0].b * r[0].b;
    }
    const double mx = sx / draws, my = sy / draws;
    const double cov = sxy / draws - mx * my;
    const double corr = cov / std::sqrt((sxx / draws - mx * mx) * (syy / draws - my * my));
    EXPECT_NEAR(mx, 50000, 5 * std::sqrt(25000.0 / draws));
    EXPECT_NEAR(corr, -0.655, 0.05);
}
