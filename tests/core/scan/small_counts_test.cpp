// Small-count rules of a rate finding (core/scan/small_counts.h) and their effect on its class.
#include "core/scan/small_counts.h"

#include <gtest/gtest.h>

#include <cmath>

#include "core/scan/rate_scan.h"

using namespace foldline;

namespace {
// R's help page for mantelhaen.test: Mantel's penicillin and rabbits, strata as (no delay cured,
// no delay died, 1.5 h cured, 1.5 h died); no delay is the focal group.
const stats::Strata kRabbits{{0, 6, 0, 5}, {3, 3, 0, 6}, {6, 0, 2, 4}, {5, 1, 6, 0}, {2, 0, 5, 0}};
}  // namespace

// Mantel-Fleiss quantities of the rabbits worked by hand from the criterion's definition
// (Mantel & Fleiss 1980, Am J Epidemiol 112:129, from memory): E_k = 0, 1.5, 4, 5.5, 2 (sum 13);
// L_k = 0, 0, 2, 5, 2 (sum 9); U_k = 0, 3, 6, 6, 2 (sum 17); distance min(4, 4) = 4 < 5.
TEST(SmallCounts, MantelFleissOnTheRabbits) {
    const auto mf = mantel_fleiss(kRabbits);
    EXPECT_DOUBLE_EQ(mf.expected, 13);
    EXPECT_DOUBLE_EQ(mf.lower, 9);
    EXPECT_DOUBLE_EQ(mf.upper, 17);
    EXPECT_DOUBLE_EQ(mf.distance, 4);
    EXPECT_FALSE(mf.satisfied);
    // Ten times the counts: E 130, L 90, U 170 -> distance 40, the criterion holds.
    stats::Strata ten;
    for (auto s : kRabbits) ten.push_back({10 * s.a, 10 * s.b, 10 * s.c, 10 * s.d});
    const auto big = mantel_fleiss(ten);
    EXPECT_DOUBLE_EQ(big.distance, 40);
    EXPECT_TRUE(big.satisfied);
    EXPECT_FALSE(mantel_fleiss({}).satisfied);
}

// Breslow-Day fitted cells at the MH odds ratio 7 (R's help page): three strata with every margin
// positive, 12 cells, 8 below 5 (2.459 3.541 0.541 5.459 | 5.172 0.828 2.828 3.172 |
// 5.860 0.140 5.140 0.860, the quadratic's roots worked by bisection in Python) -> 67% > 20%.
TEST(SmallCounts, BreslowDayValidityOnTheRabbits) {
    const auto v = breslow_day_validity(kRabbits, 7.0);
    EXPECT_EQ(v.fitted_cells, 12u);
    EXPECT_EQ(v.small_cells, 8u);
    EXPECT_NEAR(v.small_share, 8.0 / 12.0, 1e-12);
    EXPECT_FALSE(v.trusted);
    EXPECT_FALSE(breslow_day_validity(kRabbits, NAN).trusted);
}

// On the rabbits the asymptotic Breslow-Day test (Tarone p 0.0153) would class the finding
// heterogeneous; the small-count rules hand both decisions to the exact tests (conditional test
// p 0.03994 as R's mantelhaen.test(exact = TRUE); Zelen p 300/4050 = 0.0741) and it is masked.
TEST(SmallCounts, RabbitsFindingIsMaskedNotHeterogeneous) {
    const auto f = analyse_strata(kRabbits, {}, {"penicillin level"}, 0.05);
    const auto& sc = f.small_counts;
    EXPECT_EQ(sc.adjusted_used, AdjustedTestUsed::Exact);
    EXPECT_NEAR(sc.exact.p_two_sided, 0.0399449, 1e-6);
    EXPECT_EQ(sc.homogeneity_used, HomogeneityUsed::Zelen);
    EXPECT_NEAR(sc.zelen.p, 300.0 / 4050.0, 1e-12);
    EXPECT_EQ(sc.fisher.size(), kRabbits.size());
    EXPECT_EQ(sc.fisher[0].status, stats::ExactStatus::NoInformation);  // a fixed by its margins
    EXPECT_NEAR(sc.fisher[1].p_two_sided, 0.181818, 1e-6);              // R fisher.test
    EXPECT_NE(sc.adjusted_reason.find("exact conditional test"), std::string::npos);
    EXPECT_NE(sc.homogeneity_reason.find("Zelen"), std::string::npos);
    EXPECT_EQ(f.cls, FindingClass::Masked);

    // The same finding decided by the asymptotic tests alone.
    ClassInputs asymptotic = f.class_inputs;
    asymptotic.adjusted_p_exact = asymptotic.adjusted_p_exact_greater = asymptotic.adjusted_p_exact_less = NAN;
    asymptotic.p_homogeneity = f.breslow_day.p_tarone;
    EXPECT_LT(f.breslow_day.p_tarone, 0.05);
    EXPECT_EQ(classify(asymptotic, reversal_p(asymptotic), 0.05), FindingClass::Heterogeneous);
}

// Large strata keep the asymptotic tests; weighted counts keep them with a notice; too many
// tables make homogeneity not assessable, so no heterogeneous class rests on it.
TEST(SmallCounts, FallbacksSayWhy) {
    const stats::Strata large{{120, 80, 90, 110}, {60, 140, 40, 160}, {150, 50, 170, 30}};
    const auto ok = assess_small_counts(large, stats::mh_odds_ratio(large).estimate, 0.05);
    EXPECT_TRUE(ok.mantel_fleiss.satisfied);
    EXPECT_FALSE(ok.exact_run);
    EXPECT_EQ(ok.adjusted_used, AdjustedTestUsed::Cmh);
    EXPECT_EQ(ok.homogeneity_used, HomogeneityUsed::BreslowDay);
    EXPECT_FALSE(ok.flagged());

    stats::Strata weighted = kRabbits;
    weighted[2].a = 6.5;
    const auto w = assess_small_counts(weighted, 7.0, 0.05);
    EXPECT_TRUE(w.exact_run);
    EXPECT_EQ(w.adjusted_used, AdjustedTestUsed::Cmh);
    EXPECT_NE(w.adjusted_reason.find("weighted"), std::string::npos);
    EXPECT_EQ(w.homogeneity_used, HomogeneityUsed::NotAssessable);

    stats::Strata many;
    for (int k = 0; k < 8; ++k) many.push_back({k % 2 ? 1.0 : 4.0, k % 2 ? 4.0 : 1.0, 2, 3});
    SmallCountOptions opt;
    opt.max_tables = 100;
    const auto m = assess_small_counts(many, stats::mh_odds_ratio(many).estimate, 0.05, true, true, opt);
    EXPECT_EQ(m.homogeneity_used, HomogeneityUsed::NotAssessable);
    EXPECT_NE(m.homogeneity_reason.find("not assessable"), std::string::npos);
    ClassInputs in{0.1, 1.0, 0.2, 1.0, true, 0.001};
    use_small_counts(m, 0.001, in);
    EXPECT_TRUE(std::isnan(in.p_homogeneity));
    EXPECT_NE(classify(in, 1.0, 0.05), FindingClass::Heterogeneous);
}
