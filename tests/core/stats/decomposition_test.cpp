#include "core/stats/decomposition.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

// Das Gupta (1993), Standardization and Decomposition of Rates, Table 5.1: household headship
// rates per 100, US 1985 vs 1970 over 13 age groups [src data]; crude 47.6940 vs 44.7268,
// gap 2.9672 = rate part 1.7403 + composition part 1.2269 [calc, methods.md].
TEST(Decomposition, DasGuptaHeadship) {
    const std::vector<double> mix70{12.9, 10.9, 9.5, 8.0, 7.8, 8.4, 8.6, 7.8, 7.0, 5.9, 4.7, 3.6, 4.9};
    const std::vector<double> mix85{10.1, 11.2, 11.6, 10.9, 9.4, 7.7, 6.3, 6.0, 6.3, 5.9, 5.1, 4.0, 5.5};
    const std::vector<double> r70{1.9, 25.8, 45.7, 49.6, 51.2, 51.6, 51.8, 54.9, 58.7, 60.4, 62.8, 66.6, 66.8};
    const std::vector<double> r85{2.2, 24.3, 45.8, 52.5, 56.1, 55.6, 56.0, 57.4, 57.2, 61.2, 63.9, 68.6, 72.2};
    std::vector<double> m70, m85;
    for (double x : mix70) m70.push_back(x / 100);
    for (double x : mix85) m85.push_back(x / 100);
    const auto d = kitagawa(m85, r85, m70, r70);
    EXPECT_NEAR(d.crude_gap, 2.9672, 5e-4);
    EXPECT_NEAR(d.within, 1.7403, 5e-4);
    EXPECT_NEAR(d.composition, 1.2269, 5e-4);
    EXPECT_NEAR(d.within + d.composition, d.crude_gap, 1e-12);
}

// On a count cube the two parts add up exactly to the crude RD, also when a stratum lacks one
// group (algebraic identity of the Kitagawa form).
TEST(Decomposition, CubeAddsUpExactly) {
    const Strata s{{10, 90, 40, 60}, {50, 50, 5, 5}, {3, 1, 0, 0}};
    const auto d = decompose_crude_rd(s);
    const auto p = pooled(s);
    const double crude = p.a / (p.a + p.b) - p.c / (p.c + p.d);
    EXPECT_NEAR(d.crude_gap, crude, 1e-14);
    EXPECT_NEAR(d.within + d.composition, crude, 1e-14);
    EXPECT_TRUE(std::isnan(decompose_crude_rd({{1, 1, 0, 0}}).within));
    EXPECT_TRUE(std::isnan(kitagawa({}, {}, {}, {}).within));
}
