// The `small_counts` object of a rate finding (core/report/small_counts_json.h, docs/json.md).
#include "core/report/small_counts_json.h"

#include <gtest/gtest.h>

#include "core/report/scan_json.h"
#include "core/scan/rate_scan.h"

using namespace foldline;

// R's mantelhaen.test help page, penicillin and rabbits; p 0.03994 and the Zelen p 300/4050 as
// in tests/core/scan/small_counts_test.cpp; R fisher.test of the 1/4 stratum: p 0.1818, MLE Inf.
TEST(SmallCountsJson, RabbitsSayWhichTestsDecided) {
    const stats::Strata rabbits{{0, 6, 0, 5}, {3, 3, 0, 6}, {6, 0, 2, 4}, {5, 1, 6, 0}, {2, 0, 5, 0}};
    const auto f = analyse_strata(rabbits, {{"1/8"}, {"1/4"}, {"1/2"}, {"1"}, {"4"}}, {"penicillin"}, 0.05);
    const auto j = rate_finding_to_json(f)["small_counts"];
    EXPECT_EQ(j["mantel_fleiss"]["expected"], 13);
    EXPECT_EQ(j["mantel_fleiss"]["distance"], 4);
    EXPECT_EQ(j["mantel_fleiss"]["satisfied"], false);
    EXPECT_EQ(j["adjusted_test"], "exact");
    EXPECT_NEAR(j["exact"]["p"].get<double>(), 0.0399449, 1e-6);
    EXPECT_EQ(j["exact"]["status"], "computed");
    EXPECT_EQ(j["exact"]["s"], 16);
    EXPECT_TRUE(j["exact"]["s_at_bound"].is_null());
    ASSERT_EQ(j["fisher"].size(), 5u);
    EXPECT_EQ(j["fisher"][0]["status"], "no information");
    EXPECT_NEAR(j["fisher"][1]["p"].get<double>(), 0.181818, 1e-6);
    EXPECT_TRUE(j["fisher"][1]["or"].is_null());  // unbounded MLE: null, and the bound says why
    EXPECT_EQ(j["fisher"][1]["s_at_bound"], "upper");
    EXPECT_EQ(j["breslow_day_fit"]["small_cells"], 8);
    EXPECT_EQ(j["breslow_day_fit"]["trusted"], false);
    EXPECT_EQ(j["homogeneity_test"], "zelen");
    EXPECT_NEAR(j["zelen"]["p"].get<double>(), 300.0 / 4050.0, 1e-12);
    EXPECT_EQ(j["zelen"]["tables"], 3);
    EXPECT_NE(j["homogeneity_reason"].get<std::string>().find("Zelen"), std::string::npos);
    EXPECT_EQ(rate_finding_to_json(f)["class"], "masked");
}
