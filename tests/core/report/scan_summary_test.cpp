// Tests of core/report/scan_summary.h on constructed results (a fictional lender's approvals by
// applicant group, with branch and product as stratifiers; a fictional retailer's sales trend):
// the table of flagged findings, and the line printed when nothing is flagged, which tells
// point estimates that change direction (not significant) apart from no change at all.
#include "core/report/scan_summary.h"

#include <gtest/gtest.h>

#include <limits>

using namespace foldline;

namespace {

bool contains(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

RateFinding rate(const std::string& stratum, FindingClass cls, bool flip, double crude_rd, double mh_rd) {
    RateFinding f{};
    f.focal = "group_b";
    f.reference = "group_a";
    f.strata = {stratum};
    f.cls = cls;
    f.direction_flip = flip;
    f.crude.rd = crude_rd;
    f.adjusted.mh_rd.greenland_robins.estimate = mh_rd;
    f.q_value = cls == FindingClass::Stable ? 0.4 : 0.01;
    f.stability.share = std::numeric_limits<double>::quiet_NaN();
    return f;
}

ScanResult lender() {
    ScanResult r;
    r.question.outcome = "approved";
    r.question.positive = "yes";
    r.question.exposure = "applicant_group";
    r.question.focal = {"group_b"};
    r.question.reference = "group_a";
    r.candidates = {"branch", "product"};
    r.rows = 1200;
    return r;
}

SlopeFinding slope(const std::string& stratum, FindingClass cls, double pooled, double within) {
    SlopeFinding f;
    f.x = "promo_spend";
    f.y = "weekly_sales";
    f.strata = {stratum};
    f.cls = cls;
    f.pooled.slope = pooled;
    f.within.slope = within;
    f.q_value = cls == FindingClass::Stable ? 0.3 : 0.02;
    return f;
}

ScanResult with_trend(ScanResult r) {
    r.slope_question.x = "promo_spend";
    r.slope_question.y = "weekly_sales";
    return r;
}

}  // namespace

TEST(ScanSummary, NothingChangesSaysSo) {
    ScanResult r = lender();
    r.rate_findings = {rate("branch", FindingClass::Stable, false, 0.05, 0.04),
                       rate("product", FindingClass::Stable, false, 0.05, 0.06)};
    const std::string text = scan_summary_text(r, "loans.csv", 20);
    EXPECT_EQ(text.rfind("Scan of loans.csv: 1200 rows\n", 0), 0u) << text;
    EXPECT_TRUE(contains(text, "2 comparisons: 0 reversal, 0 explained, 0 masked, 0 heterogeneous, 2 stable")) << text;
    EXPECT_TRUE(contains(text, "(no comparison changes under stratification)\n")) << text;
    EXPECT_FALSE(contains(text, "direction flips")) << text;
    EXPECT_TRUE(contains(text, "not a legal, lending or clinical determination")) << text;
}

TEST(ScanSummary, UnflaggedDirectionFlipsAreCounted) {
    ScanResult r = lender();
    r.rate_findings = {rate("branch", FindingClass::Stable, true, 0.05, -0.01),
                       rate("product", FindingClass::Stable, true, 0.05, -0.02),
                       rate("branch \u00d7 product", FindingClass::Stable, false, 0.05, 0.03)};
    const std::string text = scan_summary_text(r, "loans.csv", 20);
    EXPECT_TRUE(contains(text, "(direction flips in 2 comparisons, none significant)\n")) << text;
    EXPECT_FALSE(contains(text, "no comparison changes")) << text;

    r.rate_findings.resize(1);
    EXPECT_TRUE(contains(scan_summary_text(r, "loans.csv", 20), "(direction flips in 1 comparison, none significant)\n"));
}

TEST(ScanSummary, FlaggedFindingsAreListedWithoutTheNoChangeLine) {
    ScanResult r = lender();
    r.rate_findings = {rate("branch", FindingClass::Reversal, true, 0.05, -0.03),
                       rate("product", FindingClass::Stable, true, 0.05, -0.01)};
    const std::string text = scan_summary_text(r, "loans.csv", 20);
    EXPECT_TRUE(contains(text, "reversal       branch")) << text;
    EXPECT_TRUE(contains(text, "+0.0500")) << text;
    EXPECT_TRUE(contains(text, "-0.0300")) << text;
    EXPECT_FALSE(contains(text, "direction flips")) << text;
    EXPECT_FALSE(contains(text, "no comparison changes")) << text;
    // --top 0 lists none and points to the JSON instead of claiming nothing changed.
    const std::string none = scan_summary_text(r, "loans.csv", 0);
    EXPECT_TRUE(contains(none, "... 1 more flagged (see the JSON)")) << none;
    EXPECT_FALSE(contains(none, "no comparison changes")) << none;
}

TEST(ScanSummary, SlopeLinesTellFlipsFromNoChange) {
    ScanResult r = with_trend(lender());
    r.rate_findings = {rate("branch", FindingClass::Stable, false, 0.05, 0.04)};
    r.slope_findings = {slope("store_format", FindingClass::Stable, 21.6, -3.1),
                        slope("region", FindingClass::Stable, 21.6, 19.0)};
    std::string text = scan_summary_text(r, "weeks.csv", 20);
    EXPECT_TRUE(contains(text, "Slope of weekly_sales on promo_spend: 2 checks:")) << text;
    EXPECT_TRUE(contains(text, "(slope direction flips in 1 check, none significant)\n")) << text;
    EXPECT_FALSE(contains(text, "no slope changes")) << text;
    EXPECT_TRUE(contains(text, "(no comparison changes under stratification)\n")) << text;

    r.slope_findings[0].within.slope = 5.0;  // same sign as the pooled slope
    text = scan_summary_text(r, "weeks.csv", 20);
    EXPECT_TRUE(contains(text, "(no slope changes under stratification)\n")) << text;
    EXPECT_FALSE(contains(text, "slope direction flips")) << text;

    // With covariates the adjusted slopes are the ones shown and compared.
    r.slope_findings[0].adjusted = true;
    r.slope_findings[0].adjusted_pooled.slope = 4.0;
    r.slope_findings[0].adjusted_within.slope = -0.5;
    text = scan_summary_text(r, "weeks.csv", 20);
    EXPECT_TRUE(contains(text, "(slope direction flips in 1 check, none significant)\n")) << text;

    // An undefined within slope is not a flip.
    r.slope_findings[0].adjusted_within.slope = std::numeric_limits<double>::quiet_NaN();
    EXPECT_TRUE(contains(scan_summary_text(r, "weeks.csv", 20), "(no slope changes under stratification)\n"));
}

TEST(ScanSummary, FlaggedSlopeIsListed) {
    ScanResult r = with_trend(ScanResult{});
    r.slope_findings = {slope("store_format", FindingClass::Reversal, 21.6, -3.1)};
    const std::string text = scan_summary_text(r, "weeks.csv", 20);
    EXPECT_TRUE(contains(text, "reversal       store_format")) << text;
    EXPECT_TRUE(contains(text, "+21.6")) << text;
    EXPECT_TRUE(contains(text, "-3.1")) << text;
    EXPECT_FALSE(contains(text, "slope direction flips")) << text;
    EXPECT_FALSE(contains(text, "no slope changes")) << text;
    // A slope-only scan has no rate question: no rate table.
    EXPECT_FALSE(contains(text, "comparisons:")) << text;
}
