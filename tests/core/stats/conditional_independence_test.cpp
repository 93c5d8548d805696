#include "core/stats/conditional_independence.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline::stats;

// Two strata (2 × 3, and 3 × 3 with an empty row that is dropped). Reference [calc, scipy 1.10
// Debian]: per stratum scipy.stats.chi2_contingency(table, correction=False,
// lambda_="log-likelihood") on the table without empty rows/columns, G² and df summed:
// G² 14.961317528160126, df 4, p = scipy.stats.chi2.sf = 0.004782123267661212.
TEST(ConditionalIndependence, GSquaredMatchesScipyPerStratumSum) {
    StratifiedCounts c{2, 3, 3, std::vector<double>(18, 0.0)};
    const double s1[2][3] = {{12, 5, 9}, {4, 11, 7}};
    const double s2[3][3] = {{8, 3, 2}, {0, 0, 0}, {2, 9, 6}};
    for (int i = 0; i < 2; ++i)
        for (int j = 0; j < 3; ++j) c.at(0, i, j) = s1[i][j];
    for (int i = 0; i < 3; ++i)
        for (int j = 0; j < 3; ++j) c.at(1, i, j) = s2[i][j];
    const auto t = g_squared_test(c);
    EXPECT_NEAR(t.statistic, 14.961317528160126, 1e-10);
    EXPECT_EQ(t.df, 4);
    EXPECT_NEAR(t.p, 0.004782123267661212, 1e-12);
    EXPECT_EQ(t.n, 78);
}

TEST(ConditionalIndependence, GSquaredWithoutInformationIsNotAssessable) {
    // Each stratum has a single occurring level of X: df 0, no p.
    StratifiedCounts c{2, 2, 2, {5, 3, 0, 0, 0, 0, 4, 4}};
    const auto t = g_squared_test(c);
    EXPECT_EQ(t.df, 0);
    EXPECT_TRUE(std::isnan(t.p));
    EXPECT_TRUE(std::isnan(g_squared_test(StratifiedCounts{}).p));
}

TEST(ConditionalIndependence, PartialCorrelationFromMoments) {
    // No conditioning variable, one stratum: the partial correlation is Pearson's r. Values
    // (x, y) = (1,2), (2,1), (3,4), (4,3): centred sums Sxx 5, Syy 5, Sxy 3 → r = 0.6 (by hand);
    // Fisher z = atanh(0.6) √(4 − 0 − 3) = 0.6931471805599453.
    WithinMoments m;
    m.sscp = Eigen::Matrix2d{{5, 3}, {3, 5}};
    m.n = 4;
    m.strata = 1;
    const auto t = partial_correlation_test(m);
    EXPECT_NEAR(t.partial_r, 0.6, 1e-15);
    EXPECT_NEAR(t.statistic, 0.6931471805599453, 1e-12);
    EXPECT_NEAR(t.p, 2 * 0.5 * std::erfc(0.6931471805599453 / std::sqrt(2.0)), 1e-12);
    m.n = 3;  // n − k − 3 = 0
    EXPECT_TRUE(std::isnan(partial_correlation_test(m).p));
    m.n = 4;
    m.sscp(0, 0) = 0;  // constant X
    EXPECT_TRUE(std::isnan(partial_correlation_test(m).p));
}
