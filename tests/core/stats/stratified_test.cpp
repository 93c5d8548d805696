#include "core/stats/stratified.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>

using namespace foldline::stats;

namespace {
// R's array(c(x11, x21, x12, x22, ...), dim = c(2, 2, K)) fills column-major: a = x11,
// c = x21, b = x12, d = x22 (methods.md, "layout trap").
Strata from_r_layout(std::initializer_list<double> v) {
    Strata s;
    auto it = v.begin();
    while (it != v.end()) {
        StratumCounts t;
        t.a = *it++;
        t.c = *it++;
        t.b = *it++;
        t.d = *it++;
        s.push_back(t);
    }
    return s;
}

Strata penicillin() {
    return from_r_layout({0, 0, 6, 5, 3, 0, 3, 6, 6, 2, 0, 4, 5, 6, 1, 0, 2, 5, 0, 0});
}
}  // namespace

// Penicillin and rabbits (Cochran's data; Agresti 1990 pp. 231-237), the example in R's
// documentation of mantelhaen.test: OR_MH 7 with 95% CI 1.026713-47.725133 [src]; corrected
// X2 3.9286, p 0.04747 [src: R output]; uncorrected 5.6571, p 0.01738, RR_MH 1.552632
// (1.030638-2.339002), RD_MH 0.228036 with Sato SE 0.094935, Breslow-Day 8.6273 (df 2,
// p 0.01338), Tarone 8.3583, 3 of 5 strata informative [calc, methods.md].
TEST(Stratified, PenicillinRabbits) {
    const Strata s = penicillin();
    const auto orr = mh_odds_ratio(s);
    EXPECT_NEAR(orr.estimate, 7.0, 1e-12);
    EXPECT_NEAR(orr.ci.lo, 1.026713, 5e-6);
    EXPECT_NEAR(orr.ci.hi, 47.725133, 5e-5);

    const auto t = cmh_test(s);
    EXPECT_NEAR(t.statistic_corrected, 3.9286, 5e-5);
    EXPECT_NEAR(t.p_corrected, 0.04747, 5e-6);
    EXPECT_NEAR(t.statistic, 5.6571, 5e-5);
    EXPECT_NEAR(t.p, 0.01738, 5e-6);
    EXPECT_GT(t.z, 0);

    const auto rr = mh_risk_ratio(s);
    EXPECT_NEAR(rr.estimate, 1.552632, 5e-7);
    EXPECT_NEAR(rr.ci.lo, 1.030638, 5e-6);
    EXPECT_NEAR(rr.ci.hi, 2.339002, 5e-6);

    const auto rd = mh_risk_difference(s);
    EXPECT_NEAR(rd.greenland_robins.estimate, 0.228036, 5e-7);
    EXPECT_NEAR(rd.se_sato, 0.094935, 5e-7);

    const auto bd = breslow_day(s, orr.estimate);
    EXPECT_EQ(bd.strata_used, 3u);
    EXPECT_DOUBLE_EQ(bd.df, 2.0);
    EXPECT_NEAR(bd.statistic, 8.6273, 5e-5);
    EXPECT_NEAR(bd.p, 0.01338, 5e-6);
    EXPECT_NEAR(bd.statistic_tarone, 8.3583, 5e-5);
}

// statsmodels' own test values for StratifiedTable, taken from R / DescTools [src, methods.md].
TEST(Stratified, StatsmodelsDocumentedExamples) {
    const Strata s1 = from_r_layout({20, 14, 10, 24, 15, 12, 3, 15, 3, 2, 3, 2, 12, 3, 7, 5, 1, 0, 3, 2});
    const auto o1 = mh_odds_ratio(s1);
    EXPECT_NEAR(o1.estimate, 3.5912, 5e-5);
    EXPECT_NEAR(o1.ci.lo, 1.781135, 5e-6);
    EXPECT_NEAR(o1.ci.hi, 7.240633, 5e-6);
    const auto t1 = cmh_test(s1);
    EXPECT_NEAR(t1.statistic_corrected, 11.8852, 5e-5);
    EXPECT_NEAR(t1.p_corrected, 0.0005658, 5e-8);
    const auto b1 = breslow_day(s1, o1.estimate);
    EXPECT_NEAR(b1.statistic, 1.8438, 5e-5);
    EXPECT_NEAR(b1.p, 0.7645, 5e-5);
    EXPECT_NEAR(b1.statistic_tarone, 1.8436, 5e-5);

    const Strata s2 = from_r_layout({313, 512, 19, 89, 207, 353, 8, 17, 205, 120, 391, 202,
                                     278, 139, 244, 131, 138, 53, 299, 94, 351, 22, 317, 24});
    const auto o2 = mh_odds_ratio(s2);
    EXPECT_NEAR(o2.estimate, 1.101879, 5e-7);
    EXPECT_NEAR(o2.ci.lo, 0.9402012, 5e-8);
    EXPECT_NEAR(o2.ci.hi, 1.2913602, 5e-8);
    const auto t2 = cmh_test(s2);
    EXPECT_NEAR(t2.statistic_corrected, 1.3368, 5e-5);
    EXPECT_NEAR(t2.p_corrected, 0.2476, 5e-5);
    const auto b2 = breslow_day(s2, o2.estimate);
    EXPECT_NEAR(b2.statistic, 18.83297, 5e-6);
    EXPECT_NEAR(b2.p, 0.002064786, 5e-10);
}

// 200 random K x 2 x 2 tables against statsmodels 0.13 StratifiedTable, golden values written by
// tests/reference/stratified_statsmodels.py [calc]. statsmodels always subtracts 0.5 in the
// corrected CMH; we subtract it only when |delta| >= 0.5, so that figure is compared only there.
TEST(Stratified, MatchesStatsmodelsOnRandomTables) {
    std::ifstream in(std::string(FOLDLINE_TEST_DATA_DIR) + "/data/stratified_golden.txt");
    ASSERT_TRUE(in) << "golden file missing";
    std::string line;
    int n_tables = 0;
    auto near = [](double got, double want) {
        if (std::isnan(want) || std::isinf(want)) return std::isnan(want) ? std::isnan(got) : got == want;
        return std::fabs(got - want) <= 1e-9 * std::max(1.0, std::fabs(want));
    };
    while (std::getline(in, line)) {
        if (line.empty() || line[0] == '#' || line[0] == 'W') continue;
        std::istringstream is(line);
        int k;
        is >> k;
        Strata s(k);
        for (auto& t : s) is >> t.a >> t.b >> t.c >> t.d;
        std::string bar;
        double v[11];
        is >> bar;
        for (double& x : v) {
            std::string tok;
            is >> tok;
            x = std::strtod(tok.c_str(), nullptr);  // also reads "inf" and "nan"
        }
        const auto o = mh_odds_ratio(s);
        const auto t = cmh_test(s);
        const auto b = breslow_day(s, o.estimate);
        EXPECT_TRUE(near(o.estimate, v[0])) << line;
        EXPECT_TRUE(near(o.ci.lo, v[1])) << line;
        EXPECT_TRUE(near(o.ci.hi, v[2])) << line;
        EXPECT_TRUE(near(t.statistic, v[3])) << line;
        EXPECT_TRUE(near(t.p, v[4])) << line;
        if (std::fabs(t.delta) >= 0.5) {
            EXPECT_TRUE(near(t.statistic_corrected, v[5])) << line;
            EXPECT_TRUE(near(t.p_corrected, v[6])) << line;
        }
        EXPECT_TRUE(near(b.statistic, v[7])) << line << " got " << b.statistic;
        EXPECT_TRUE(near(b.p, v[8])) << line;
        EXPECT_TRUE(near(b.statistic_tarone, v[9])) << line;
        EXPECT_TRUE(near(b.p_tarone, v[10])) << line;
        ++n_tables;
    }
    EXPECT_EQ(n_tables, 200);
}

TEST(Stratified, DegenerateInputs) {
    EXPECT_TRUE(std::isnan(mh_odds_ratio({}).estimate));
    EXPECT_TRUE(std::isnan(cmh_test({}).p));
    EXPECT_TRUE(std::isnan(breslow_day({}, 1.0).p));
    // Only one usable stratum: no homogeneity test.
    const Strata one{{3, 4, 5, 6}};
    EXPECT_TRUE(std::isnan(breslow_day(one, mh_odds_ratio(one).estimate).statistic));
    // No reference events anywhere: OR infinite, no CI.
    const Strata inf{{3, 4, 0, 6}, {2, 2, 0, 5}};
    EXPECT_TRUE(std::isinf(mh_odds_ratio(inf).estimate));
    // A stratum with no reference rows adds nothing to the MH figures.
    Strata with_empty = penicillin();
    with_empty.push_back({4, 1, 0, 0});
    EXPECT_DOUBLE_EQ(mh_odds_ratio(with_empty).estimate, 7.0);
    EXPECT_NEAR(mh_risk_difference(with_empty).greenland_robins.estimate, 0.228036, 5e-7);
}

// A single 2 x 2 table (worked by hand from the definitions): 30/100 vs 20/100.
TEST(Stratified, TwoByTwoAndHaldaneCorrection) {
    const auto t = two_by_two({30, 70, 20, 80});
    EXPECT_DOUBLE_EQ(t.rate_focal, 0.3);
    EXPECT_DOUBLE_EQ(t.rd, 0.3 - 0.2);
    EXPECT_NEAR(t.rr, 1.5, 1e-12);
    EXPECT_NEAR(t.odds_ratio, (30.0 * 80) / (70.0 * 20), 1e-12);
    EXPECT_NEAR(t.selection_ratio, 1.5, 1e-12);
    EXPECT_GT(t.z, 0);
    // Zero cell: 0.5 added to every cell for the ratios only.
    const auto z = two_by_two({0, 10, 5, 5});
    EXPECT_NEAR(z.odds_ratio, (0.5 * 5.5) / (10.5 * 5.5), 1e-12);
    EXPECT_DOUBLE_EQ(z.rate_focal, 0.0);
    EXPECT_DOUBLE_EQ(z.selection_ratio, 0.0);
    const auto e = two_by_two({0, 0, 5, 5});
    EXPECT_TRUE(std::isnan(e.rate_focal));
    EXPECT_TRUE(std::isnan(e.rr));
}
