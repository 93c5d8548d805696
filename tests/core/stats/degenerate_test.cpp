// Degenerate tables given to the stratified statistics (core/stats/stratified.h), the class
// rules (core/scan/classify.h), the per-comparison analysis (core/scan/rate_scan.h) and the
// slope fits (core/stats/regression.h). Each figure must either be finite and equal to what
// the cited method prescribes for that table, or be NaN (undefined) with the reason the
// header gives; a comparison whose figures are undefined is never classed a reversal.
//
// Sources: Mantel & Haenszel 1959 (a stratum with N = 0, or with one group empty, adds 0 to
// both sums of the MH odds ratio: a d / N = b c / N = 0); Greenland & Robins 1985 (same for the
// MH RR and RD weights n1 n0 / N); the CMH variance n1 n0 m1 m0 / (N^2 (N - 1)) is 0 when any
// margin is 0. Base table: the penicillin-and-rabbits strata from R's mantelhaen.test
// documentation, OR_MH = 7 [src: R output], already used in stratified_test.cpp.
#include "core/scan/classify.h"
#include "core/scan/rate_scan.h"
#include "core/stats/regression.h"
#include "core/stats/stratified.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

using namespace foldline;
using namespace foldline::stats;

namespace {

// R's layout: a = x11, c = x21, b = x12, d = x22 per stratum (see stratified_test.cpp).
Strata penicillin() {
    const double v[] = {0, 0, 6, 5, 3, 0, 3, 6, 6, 2, 0, 4, 5, 6, 1, 0, 2, 5, 0, 0};
    Strata s;
    for (int k = 0; k < 5; ++k) s.push_back({v[4 * k], v[4 * k + 2], v[4 * k + 1], v[4 * k + 3]});
    return s;
}

bool finite_or_nan(double x) { return std::isfinite(x) || std::isnan(x); }

void expect_same(const Estimate& x, const Estimate& y, const char* what) {
    EXPECT_DOUBLE_EQ(x.estimate, y.estimate) << what;
    EXPECT_DOUBLE_EQ(x.se, y.se) << what;
    EXPECT_DOUBLE_EQ(x.ci.lo, y.ci.lo) << what;
    EXPECT_DOUBLE_EQ(x.ci.hi, y.ci.hi) << what;
}

RateFinding analyse(const Strata& s) {
    std::vector<std::vector<std::string>> labels;
    // Built with append(), not "s" + std::to_string(k): GCC 12 reports a false -Wrestrict on the
    // latter (GCC bug 105329).
    for (std::size_t k = 0; k < s.size(); ++k) {
        std::string label = "s";
        label.append(std::to_string(k));
        labels.push_back({label});
    }
    return analyse_strata(s, labels, {"stratum"}, 0.05);
}

}  // namespace

TEST(Degenerate, EmptyStratumAndOneGroupStratumChangeNothing) {
    const Strata base = penicillin();
    Strata more = base;
    more.push_back({0, 0, 0, 0});    // empty stratum
    more.push_back({4, 3, 0, 0});    // focal group only
    more.push_back({0, 0, 2, 9});    // reference group only
    const auto or0 = mh_odds_ratio(base), or1 = mh_odds_ratio(more);
    EXPECT_NEAR(or0.estimate, 7.0, 1e-12);  // R mantelhaen.test: 7 [src]
    expect_same(or0, or1, "MH OR");
    expect_same(mh_risk_ratio(base), mh_risk_ratio(more), "MH RR");
    expect_same(mh_risk_difference(base).greenland_robins, mh_risk_difference(more).greenland_robins, "MH RD");
    EXPECT_DOUBLE_EQ(cmh_test(base).statistic, cmh_test(more).statistic);
    EXPECT_DOUBLE_EQ(breslow_day(base, or0.estimate).statistic, breslow_day(more, or1.estimate).statistic);
    // The finding lists the three added strata as uninformative and keeps its adjusted figures.
    const RateFinding f = analyse(more);
    // Each penicillin stratum has rows in both groups (n1, n0 > 0) [calc by hand]; the three
    // added strata do not.
    EXPECT_EQ(f.informative_strata, 5u);
    EXPECT_EQ(f.uninformative.size(), 3u);
    EXPECT_DOUBLE_EQ(f.adjusted.mh_or.estimate, or0.estimate);
}

TEST(Degenerate, NoStrataAtAll) {
    const Strata none;
    EXPECT_TRUE(std::isnan(mh_odds_ratio(none).estimate));
    EXPECT_TRUE(std::isnan(mh_risk_ratio(none).estimate));
    EXPECT_TRUE(std::isnan(mh_risk_difference(none).greenland_robins.estimate));
    EXPECT_TRUE(std::isnan(cmh_test(none).statistic));
    const RateFinding f = analyse(none);
    EXPECT_EQ(f.cls, FindingClass::Stable);  // rate_scan.h: empty strata give class stable
}

TEST(Degenerate, AllOutcomesPositive) {
    // Every row an event (b = d = 0): both MH OR sums are 0, so the OR is undefined (NaN); the
    // rates are 1 in both groups, so RR_MH = 1 and RD_MH = 0 exactly; the CMH variance is 0
    // (m0 = 0), so the test is undefined.
    const Strata s = {{5, 0, 7, 0}, {3, 0, 2, 0}};
    EXPECT_TRUE(std::isnan(mh_odds_ratio(s).estimate));
    EXPECT_DOUBLE_EQ(mh_risk_ratio(s).estimate, 1.0);
    EXPECT_DOUBLE_EQ(mh_risk_difference(s).greenland_robins.estimate, 0.0);
    EXPECT_TRUE(std::isnan(cmh_test(s).statistic));
    const RateFinding f = analyse(s);
    EXPECT_NE(f.cls, FindingClass::Reversal);
    EXPECT_FALSE(f.direction_flip);
}

TEST(Degenerate, AllOutcomesNegative) {
    // No events (a = c = 0): OR sums 0 (NaN), RR 0/0 (NaN), RD 0, CMH undefined.
    const Strata s = {{0, 5, 0, 7}, {0, 3, 0, 2}};
    EXPECT_TRUE(std::isnan(mh_odds_ratio(s).estimate));
    EXPECT_TRUE(std::isnan(mh_risk_ratio(s).estimate));
    EXPECT_DOUBLE_EQ(mh_risk_difference(s).greenland_robins.estimate, 0.0);
    EXPECT_TRUE(std::isnan(cmh_test(s).statistic));
    EXPECT_NE(analyse(s).cls, FindingClass::Reversal);
}

TEST(Degenerate, OneRowPerStratum) {
    // N = 1 in every stratum: one group is always empty, so nothing is informative.
    const Strata s = {{1, 0, 0, 0}, {0, 0, 0, 1}, {0, 1, 0, 0}, {0, 0, 1, 0}};
    EXPECT_TRUE(std::isnan(mh_odds_ratio(s).estimate));
    EXPECT_TRUE(std::isnan(mh_risk_ratio(s).estimate));
    EXPECT_TRUE(std::isnan(cmh_test(s).statistic));
    const RateFinding f = analyse(s);
    EXPECT_EQ(f.informative_strata, 0u);
    EXPECT_EQ(f.uninformative.size(), 4u);
    EXPECT_NE(f.cls, FindingClass::Reversal);
}

TEST(Degenerate, PerfectSeparation) {
    // Focal rows all events, reference rows none: S = sum b c / N = 0, so OR_MH = +inf with a
    // NaN interval (stratified.h); RD_MH = 1 exactly; the CMH test is still defined.
    const Strata s = {{4, 0, 0, 6}, {2, 0, 0, 3}};
    const Estimate o = mh_odds_ratio(s);
    EXPECT_TRUE(std::isinf(o.estimate) && o.estimate > 0);
    EXPECT_TRUE(std::isnan(o.ci.lo) && std::isnan(o.ci.hi));
    EXPECT_DOUBLE_EQ(mh_risk_difference(s).greenland_robins.estimate, 1.0);
    const CmhTest t = cmh_test(s);
    EXPECT_TRUE(std::isfinite(t.statistic));
    EXPECT_GT(t.z, 0);
    // The single-table figures add 0.5 to each cell (Haldane-Anscombe): OR = 4.5 * 6.5 / 0.25.
    const TwoByTwo one = two_by_two(s[0]);
    EXPECT_NEAR(one.odds_ratio, 4.5 * 6.5 / (0.5 * 0.5), 1e-9);
    EXPECT_NE(analyse(s).cls, FindingClass::Reversal);
}

TEST(Degenerate, CountsNearTwoToThe53) {
    // Pre-counted data with cells near 2^53: every figure finite, OR equal to a d / (b c) of
    // the single stratum, rates equal to a / (a + b).
    const double big = 9007199254740992.0;  // 2^53
    const Strata s = {{big / 2, big / 4, big / 8, big / 2}};
    const Estimate o = mh_odds_ratio(s);
    EXPECT_NEAR(o.estimate, (big / 2) * (big / 2) / ((big / 4) * (big / 8)), 1e-9);  // = 8
    EXPECT_TRUE(std::isfinite(o.se));
    const TwoByTwo t = two_by_two(s[0]);
    EXPECT_NEAR(t.rate_focal, 2.0 / 3.0, 1e-12);
    EXPECT_NEAR(t.rate_reference, 0.2, 1e-12);
    EXPECT_TRUE(std::isfinite(t.rd_ci.lo) && std::isfinite(t.rd_ci.hi));
    EXPECT_TRUE(std::isfinite(cmh_test(s).statistic));
    const RateFinding f = analyse(s);
    EXPECT_TRUE(std::isfinite(f.crude.rd));
    EXPECT_TRUE(std::isfinite(f.adjusted.mh_rd.greenland_robins.estimate));
}

TEST(Degenerate, EveryFigureFiniteOrNaN) {
    // Over all small tables with cells 0..2 in two strata (3^8 = 6561 tables): no figure is
    // an infinity except the documented MH OR of 0 / +inf, and no undefined comparison is a
    // reversal.
    for (int code = 0; code < 6561; ++code) {
        int c = code;
        Strata s(2);
        for (auto& st : s) {
            st.a = c % 3; c /= 3;
            st.b = c % 3; c /= 3;
            st.c = c % 3; c /= 3;
            st.d = c % 3; c /= 3;
        }
        const RateFinding f = analyse(s);
        ASSERT_TRUE(finite_or_nan(f.crude.rd)) << code;
        ASSERT_TRUE(finite_or_nan(f.crude.z)) << code;
        ASSERT_TRUE(finite_or_nan(f.crude.p)) << code;
        ASSERT_TRUE(finite_or_nan(f.adjusted.mh_rd.greenland_robins.estimate)) << code;
        ASSERT_TRUE(finite_or_nan(f.cmh.z)) << code;
        ASSERT_TRUE(finite_or_nan(f.p_reversal)) << code;
        if (std::isnan(f.cmh.z) || std::isnan(f.crude.z)) {
            ASSERT_NE(f.cls, FindingClass::Reversal) << code;
        }
    }
}

TEST(DegenerateClass, UndefinedAdjustedIsNeverAReversal) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    // Crude strongly positive, adjusted undefined: reversal_p is 1 (classify.h) and the class
    // is not a reversal whatever the evidence threshold.
    ClassInputs in{0.3, 8.0, nan, nan, false, nan};
    EXPECT_EQ(reversal_p(in), 1.0);
    EXPECT_FALSE(direction_flips(in));
    EXPECT_NE(classify(in, reversal_p(in), 0.05), FindingClass::Reversal);
    EXPECT_NE(classify(in, 0.0, 0.05), FindingClass::Reversal);  // even with a forced q of 0
    ClassInputs crude_undefined{nan, nan, -0.5, -8.0, false, nan};
    EXPECT_EQ(reversal_p(crude_undefined), 1.0);
    EXPECT_NE(classify(crude_undefined, 0.0, 0.05), FindingClass::Reversal);
    ClassInputs zero_crude{0.0, 0.0, -0.5, -8.0, false, nan};
    EXPECT_EQ(reversal_p(zero_crude), 1.0);
    EXPECT_NE(classify(zero_crude, 0.0, 0.05), FindingClass::Reversal);
}

// Slopes.

TEST(DegenerateSlope, ConstantXInAStratum) {
    BivariateMoments flat;
    for (double y : {1.0, 2.0, 5.0}) flat.add(3.0, y);
    const LineFit f = fit_line(flat);
    EXPECT_FALSE(f.informative);
    EXPECT_EQ(f.reason, "no spread in x");
    EXPECT_TRUE(std::isnan(f.slope.slope));
    // Within-stratum fit: the flat stratum adds nothing to Sxx, the other gives the slope 2.
    BivariateMoments line;
    for (double x : {0.0, 1.0, 2.0, 3.0}) line.add(x, 2 * x + 1 + (x == 1 ? 0.1 : 0) - (x == 2 ? 0.1 : 0));
    const WithinFit w = fit_within({flat, line});
    EXPECT_NEAR(w.slope.slope, fit_line(line).slope.slope, 1e-12);
}

TEST(DegenerateSlope, TwoPointsGiveASlopeWithoutError) {
    BivariateMoments m;
    m.add(1, 3);
    m.add(3, 7);
    const LineFit f = fit_line(m);
    EXPECT_FALSE(f.informative);  // n < 3 (regression.h)
    EXPECT_DOUBLE_EQ(f.slope.slope, 2.0);
    EXPECT_TRUE(std::isnan(f.slope.se));
    EXPECT_TRUE(std::isnan(f.slope.p));
}

TEST(DegenerateSlope, CollinearCovariateIsSingular) {
    // z = (x, c, y) with c = 2 x + 1 exactly: the design is singular, slope NaN (regression.h).
    MomentMatrix m(3);
    for (int i = 0; i < 20; ++i) {
        const double x = i, z[3] = {x, 2 * x + 1, 0.5 * x + std::sin(i)};
        m.add(z);
    }
    EXPECT_TRUE(std::isnan(fit_adjusted(m).slope));
    MomentMatrix constant_cov(3);
    for (int i = 0; i < 20; ++i) {
        const double x = i, z[3] = {x, 4.0, 0.5 * x + std::cos(i)};
        constant_cov.add(z);
    }
    EXPECT_TRUE(std::isnan(fit_adjusted(constant_cov).slope));
}

TEST(DegenerateSlope, HugeOffsetsDoNotLosePrecision) {
    // y = 3 x + noise around x near 1e12 and y near 1e15: the slope must match the same data
    // shifted to the origin (OLS is invariant to shifting x and y; Welford-style centred
    // updates keep the digits, Welford 1962).
    BivariateMoments near0, far;
    for (int i = 0; i < 50; ++i) {
        const double x = i * 0.25, y = 3 * x + ((i * 7) % 5) * 0.25;  // exact at both offsets
        near0.add(x, y);
        far.add(x + 1e12, y + 1e15);
    }
    const LineFit a = fit_line(near0), b = fit_line(far);
    EXPECT_NEAR(b.slope.slope, a.slope.slope, 1e-6 * std::abs(a.slope.slope));
    EXPECT_NEAR(b.slope.se, a.slope.se, 1e-3 * a.slope.se);
    EXPECT_NEAR(b.r, a.r, 1e-9);
}
