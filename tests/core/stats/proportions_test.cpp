#include "core/stats/proportions.h"

#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <sstream>
#include <string>

#include "core/stats/distributions.h"

using namespace foldline::stats;

// Newcombe R.G. (1998) Two-sided confidence intervals for the single proportion: comparison of
// seven methods. Stat Med 17:857-872, Table II (Wilson score, method 3) [src via methods.md].
TEST(Wilson, Newcombe1998WorkedExamples) {
    auto w = wilson(81, 263);
    EXPECT_NEAR(w.lo, 0.2553, 5e-5);
    EXPECT_NEAR(w.hi, 0.3662, 5e-5);
    w = wilson(15, 148);
    EXPECT_NEAR(w.lo, 0.0624, 5e-5);
    EXPECT_NEAR(w.hi, 0.1605, 5e-5);
    w = wilson(0, 20);
    EXPECT_EQ(w.lo, 0.0);
    EXPECT_NEAR(w.hi, 0.1611, 5e-5);
    w = wilson(1, 29);
    EXPECT_NEAR(w.lo, 0.0061, 5e-5);
    EXPECT_NEAR(w.hi, 0.1718, 5e-5);
}

TEST(Wilson, EmptyAndInvalidAreNaN) {
    EXPECT_TRUE(std::isnan(wilson(0, 0).lo));
    EXPECT_TRUE(std::isnan(wilson(5, 3).hi));
    EXPECT_TRUE(std::isnan(proportion(1, 0)));
    EXPECT_EQ(wilson(7, 7).hi, 1.0);
}

// statsmodels 0.13 proportion_confint(method="wilson") on 100 random (x, n) pairs; golden lines
// "W x n | lo hi" written by tests/reference/stratified_statsmodels.py [calc].
TEST(Wilson, MatchesStatsmodelsProportionConfint) {
    std::ifstream in(std::string(FOLDLINE_TEST_DATA_DIR) + "/data/stratified_golden.txt");
    ASSERT_TRUE(in) << "golden file missing";
    std::string line;
    int n_checked = 0;
    while (std::getline(in, line)) {
        if (line.rfind("W ", 0) != 0) continue;
        std::istringstream is(line.substr(2));
        double x, n, lo, hi;
        std::string bar;
        is >> x >> n >> bar >> lo >> hi;
        const auto w = wilson(x, n);
        EXPECT_NEAR(w.lo, lo, 1e-10) << line;
        EXPECT_NEAR(w.hi, hi, 1e-10) << line;
        ++n_checked;
    }
    EXPECT_EQ(n_checked, 100);
}

// Newcombe R.G. (1998) Interval estimation for the difference between independent proportions:
// comparison of eleven methods. Stat Med 17:873-890, Table II, method 10 [src via methods.md].
TEST(Newcombe, HybridScoreWorkedExamples) {
    struct Case { double x1, n1, x2, n2, lo, hi; };
    const Case cases[] = {
        {56, 70, 48, 80, 0.0524, 0.3339}, {9, 10, 3, 10, 0.1705, 0.8090},
        {6, 7, 2, 7, 0.0582, 0.8062},     {5, 56, 0, 29, -0.0381, 0.1926},
        {0, 10, 0, 20, -0.1611, 0.2775},  {0, 10, 0, 10, -0.2775, 0.2775},
        {10, 10, 0, 20, 0.6791, 1.0000},  {10, 10, 0, 10, 0.6075, 1.0000},
    };
    for (const auto& c : cases) {
        const auto d = newcombe_difference(c.x1, c.n1, c.x2, c.n2);
        EXPECT_NEAR(d.lo, c.lo, 5e-5) << c.x1 << "/" << c.n1 << " - " << c.x2 << "/" << c.n2;
        EXPECT_NEAR(d.hi, c.hi, 5e-5) << c.x1 << "/" << c.n1 << " - " << c.x2 << "/" << c.n2;
    }
    EXPECT_TRUE(std::isnan(newcombe_difference(1, 0, 1, 2).lo));
}

// Standard normal and chi-square tails, textbook table values [from memory]: P(Z > 1.959964)
// = 0.025; P(chi2_1 > 3.841459) = 0.05; and a far tail where 1 - cdf would lose every digit.
TEST(Distributions, SurvivalFunctions) {
    EXPECT_NEAR(normal_sf(1.959963985), 0.025, 1e-9);
    EXPECT_NEAR(z_for_alpha(0.05), 1.959963985, 1e-8);
    EXPECT_NEAR(chi_square_sf(3.841458821, 1), 0.05, 1e-9);
    EXPECT_GT(chi_square_sf(400, 1), 0.0);
    EXPECT_LT(chi_square_sf(400, 1), 1e-80);
    EXPECT_EQ(chi_square_sf(0, 3), 1.0);
    EXPECT_TRUE(std::isnan(chi_square_sf(1, 0)));
}
