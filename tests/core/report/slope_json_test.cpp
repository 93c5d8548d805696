// Tests of core/report/slope_json.h against the key list the JSON interface promises for
// findings of kind "slope" and "latent" (the `foldline scan` JSON section of the README), and
// against JSON's own rule (RFC 8259 §6) that NaN and infinities are not numbers: they must be
// written as null.
#include "core/report/slope_json.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

using namespace foldline;

namespace {

SlopeFinding sample() {
    SlopeFinding f;
    f.x = "promo_spend";
    f.y = "weekly_sales";
    f.strata = {"store_format"};
    f.cls = FindingClass::Reversal;
    f.reversal = true;
    f.p_reversal = 0.001;
    f.q_value = std::numeric_limits<double>::quiet_NaN();
    f.pooled = {.slope = 2.0, .ci_low = 1.5, .ci_high = 2.5, .se = 0.25, .p = 1e-6, .df = 98,
                .se_robust = 0.3, .r = 0.4, .r_ci_low = 0.2, .r_ci_high = 0.6, .n = 100};
    f.within.slope = -1.0;
    f.within.ci_low = -1.4;
    f.within.ci_high = -0.6;
    f.within.se = 0.2;
    SlopeGroup g;
    g.level = "kiosk";
    g.levels = {"kiosk"};
    g.n = 2;
    g.slope = std::numeric_limits<double>::quiet_NaN();
    g.informative = false;
    g.reason = "fewer than 3 rows";
    f.groups.push_back(g);
    f.uninformative = {"kiosk"};
    return f;
}

}  // namespace

TEST(SlopeJson, SlopeFindingCarriesThePromisedKeys) {
    const auto j = to_json(sample());
    for (const char* k : {"kind", "strata", "class", "reversal", "p_reversal", "q_value",
                          "stability", "pooled", "within", "groups", "uninformative"})
        EXPECT_TRUE(j.contains(k)) << k;
    for (const char* k : {"slope", "slope_ci", "se", "se_robust", "r", "r_ci", "n"})
        EXPECT_TRUE(j["pooled"].contains(k)) << k;
    for (const char* k : {"slope", "slope_ci", "se"}) EXPECT_TRUE(j["within"].contains(k)) << k;
    for (const char* k : {"level", "n", "slope", "slope_ci", "r"})
        EXPECT_TRUE(j["groups"][0].contains(k)) << k;
    EXPECT_EQ(j["kind"], "slope");
    EXPECT_EQ(j["class"], "reversal");
    EXPECT_EQ(j["pooled"]["slope_ci"], nlohmann::json::array({1.5, 2.5}));
    EXPECT_DOUBLE_EQ(j["pooled"]["se_robust"].get<double>(), 0.3);
    EXPECT_DOUBLE_EQ(j["pooled"]["p"].get<double>(), 1e-6);
    EXPECT_EQ(j["pooled"]["r_ci"], nlohmann::json::array({0.2, 0.6}));
    EXPECT_EQ(j["uninformative"][0], "kiosk");
    EXPECT_FALSE(j.contains("adjusted"));
}

TEST(SlopeJson, UndefinedFiguresAreNull) {
    const auto j = to_json(sample());
    EXPECT_TRUE(j["q_value"].is_null());
    EXPECT_TRUE(j["groups"][0]["slope"].is_null());
    // The dump must parse back: no NaN literals.
    nlohmann::json back;
    EXPECT_NO_THROW(back = nlohmann::json::parse(j.dump()));
    EXPECT_EQ(back, j);
}

TEST(SlopeJson, LatentFindingCarriesThePromisedKeys) {
    LatentFinding f;
    f.x = "x";
    f.y = "y";
    f.k = 2;
    f.bic = {10, 5, std::numeric_limits<double>::quiet_NaN(), 7, 8, 9};
    f.components.push_back({0.5, 50, 1, 2, 1, 1, -0.5, -0.5});
    f.components.push_back({0.5, 50, 4, 6, 1, 1, -0.5, -0.5});
    const auto j = to_json(f);
    EXPECT_EQ(j["kind"], "latent");
    ASSERT_EQ(j["components"].size(), 2u);
    for (const char* k : {"weight", "mean", "slope"}) EXPECT_TRUE(j["components"][0].contains(k)) << k;
    EXPECT_EQ(j["components"][1]["mean"], nlohmann::json::array({4.0, 6.0}));
    EXPECT_EQ(j["bic"].size(), 6u);
    EXPECT_TRUE(j["bic"][2].is_null());
}

// The README's JSON section promises that counts are integers (RFC 8259 §6 has one number type;
// the text form is what a reader sees): whole counts print without a fraction, a fractional
// weighted count keeps it, an undefined one is null; estimates stay doubles.
TEST(SlopeJson, CountsAreIntegersWhenWhole) {
    SlopeFinding f = sample();
    f.rows_used = 200;
    f.pooled.n = 200;
    f.groups[0].n = 2;
    SlopeGroup weighted = f.groups[0];
    weighted.level = "mall";
    weighted.n = 12.5;
    f.groups.push_back(weighted);
    SlopeGroup undefined = f.groups[0];
    undefined.level = "outlet";
    undefined.n = std::numeric_limits<double>::quiet_NaN();
    f.groups.push_back(undefined);
    const auto j = to_json(f);
    EXPECT_TRUE(j["rows"].is_number_integer());
    EXPECT_EQ(j["rows"].get<long long>(), 200);
    EXPECT_TRUE(j["pooled"]["n"].is_number_integer());
    EXPECT_TRUE(j["groups"][0]["n"].is_number_integer());
    EXPECT_TRUE(j["groups"][1]["n"].is_number_float());
    EXPECT_DOUBLE_EQ(j["groups"][1]["n"].get<double>(), 12.5);
    EXPECT_TRUE(j["groups"][2]["n"].is_null());
    const std::string text = j.dump();
    EXPECT_NE(text.find("\"rows\":200,"), std::string::npos) << text;
    EXPECT_EQ(text.find("200.0"), std::string::npos) << text;
    // An estimate that happens to be whole is still a double (the pooled slope is 2.0).
    EXPECT_TRUE(j["pooled"]["slope"].is_number_float());
}
