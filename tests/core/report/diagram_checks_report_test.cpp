// The diagram's checks as JSON (diagram_checks_json.h) and as the memo's paragraph beside the
// verdict (memo_content.h).
#include <gtest/gtest.h>

#include <cmath>

#include "core/report/diagram_checks_json.h"
#include "core/report/memo_content.h"

using namespace foldline;

namespace {

causal::DiagramChecks sample() {
    causal::DiagramChecks c;
    causal::DiagramCheck failed;
    failed.a = "branch";
    failed.b = "approved";
    failed.given = {"product", "applicant group"};
    failed.method = causal::CheckMethod::GSquared;
    failed.test = {41.5, 6, 2.3e-7, 1200, NAN};
    failed.q = 4.6e-7;
    failed.contradicted = true;
    failed.sentence = "The diagram says branch and approved are independent given product and applicant group; the "
                      "data disagree, q < 0.001: an arrow or a common cause may be missing.";
    causal::DiagramCheck hidden;
    hidden.a = "site";
    hidden.b = "income";
    hidden.given = {"region"};
    hidden.form = causal::ClaimForm::Untestable;
    hidden.unobserved = {"region"};
    hidden.q = NAN;
    c.checks = {failed, hidden};
    c.tested = 1;
    c.contradicted = 1;
    return c;
}

}  // namespace

TEST(DiagramChecksReport, JsonCarriesFiguresAndNullsForUntestedClaims) {
    const auto j = report::to_json(sample());
    EXPECT_EQ(j["tested"], 1);
    EXPECT_EQ(j["contradicted"], 1);
    ASSERT_EQ(j["claims"].size(), 2u);
    EXPECT_EQ(j["claims"][0]["method"], "g-squared");
    EXPECT_EQ(j["claims"][0]["df"], 6);
    EXPECT_EQ(j["claims"][0]["given"][1], "applicant group");
    EXPECT_TRUE(j["claims"][0]["partial_r"].is_null());
    EXPECT_EQ(j["claims"][1]["form"], "untestable");
    EXPECT_EQ(j["claims"][1]["method"], "none");
    EXPECT_TRUE(j["claims"][1]["p"].is_null());
    EXPECT_TRUE(j["claims"][1]["q"].is_null());
    EXPECT_EQ(j["claims"][1]["unobserved"][0], "region");
}

TEST(DiagramChecksReport, MemoParagraphNamesTheContradictedClaims) {
    EXPECT_EQ(report::diagram_checks_paragraph(sample()),
              "The diagram against the data: 1 of its 1 tested claims are contradicted (q < 0.05), so the verdict "
              "may rest on a diagram that misses an arrow or a common cause. The diagram says branch and approved "
              "are independent given product and applicant group; the data disagree, q < 0.001: an arrow or a "
              "common cause may be missing. 1 claim rests on unobserved variables and cannot be checked.");
    auto quiet = sample();
    quiet.checks.erase(quiet.checks.begin() + 1);
    quiet.checks[0].contradicted = false;
    quiet.contradicted = 0;
    EXPECT_EQ(report::diagram_checks_paragraph(quiet),
              "The diagram against the data: none of its 1 tested claims is contradicted (q < 0.05).");
    EXPECT_EQ(report::diagram_checks_paragraph({}), "");
}
