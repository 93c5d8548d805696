// Tests of core/audit/mean_audit.h through the audit service (run_audit.h's scan_table and
// scan_groups) and the project file: a mean-gap question runs from an AuditSpec, its findings
// carry the figures the scan computes (checked against statsmodels and scipy in
// tests/core/scan/mean_scan_test.cpp), and a mean project keeps its kind through save and load.
#include "core/audit/mean_audit.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <fstream>
#include <sstream>

#include "core/audit/project_file.h"
#include "core/audit/run_audit.h"
#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"

using namespace foldline;

namespace {

const std::string kPay = std::string(FOLDLINE_SOURCE_DIR) + "/tests/core/stats/data/pay_by_grade.csv";

project::AuditSpec mean_spec() {
    project::AuditSpec s;
    s.data.path = kPay;
    s.question.kind = project::QuestionKind::Mean;
    s.question.outcome = "salary";
    s.question.exposure = "group";
    s.question.focal = {"B"};
    s.question.reference = "A";
    s.question.pay_gap = true;
    s.scan.strata = {"grade"};
    return s;
}

}  // namespace

TEST(MeanAudit, ScanTableRunsTheMeanQuestion) {
    auto t = read_csv(kPay);
    ASSERT_TRUE(t);
    auto r = audit::scan_table(*t, mean_spec());
    ASSERT_TRUE(r) << r.error().message;
    EXPECT_TRUE(r->mean_scan);
    EXPECT_TRUE(r->rate_findings.empty());
    ASSERT_EQ(r->mean_findings.size(), 1u);
    const auto& f = r->mean_findings[0];
    EXPECT_EQ(f.focal, "B");
    EXPECT_TRUE(f.pay_gap.computed);
    // One finding: its BH q-value is its p-value (Benjamini & Hochberg 1995 with m = 1).
    EXPECT_DOUBLE_EQ(f.q_value, f.p_reversal);
    // JSON: kind "mean" with the mean question beside it.
    const auto doc = nlohmann::json::parse(scan_json_text(*r, DataInfo{kPay, "", 320}));
    ASSERT_EQ(doc["findings"].size(), 1u);
    EXPECT_EQ(doc["findings"][0]["kind"], "mean");
    EXPECT_EQ(doc["mean_question"]["outcome"], "salary");
    EXPECT_EQ(doc["summary"]["mean_checks"], 1);
    EXPECT_EQ(doc, scan_to_json(*r, DataInfo{kPay, "", 320}));
}

TEST(MeanAudit, ErrorsNameTheProblem) {
    auto t = read_csv(kPay);
    ASSERT_TRUE(t);
    auto spec = mean_spec();
    spec.question.outcome = "grade";
    auto r = audit::scan_table(*t, spec);
    ASSERT_FALSE(r);
    EXPECT_EQ(r.error().kind, ErrorKind::Usage);
    EXPECT_NE(r.error().message.find("not numeric"), std::string::npos);
    GroupedCounts none;
    auto g = audit::scan_groups(none, std::nullopt, mean_spec());
    ASSERT_FALSE(g);
    EXPECT_NE(g.error().message.find("needs the rows"), std::string::npos);
}

TEST(MeanAudit, ProjectKeepsTheMeanKindAtVersion3) {
    project::Project p;
    static_cast<project::AuditSpec&>(p) = mean_spec();
    p.question.log_outcome = true;
    EXPECT_EQ(project::required_version(p), 3);
    const std::string text = project::project_to_json_text(p, "/tmp/pay.foldline");
    const auto doc = nlohmann::json::parse(text);
    EXPECT_EQ(doc["version"], 3);
    EXPECT_EQ(doc["question"]["kind"], "mean");
    auto back = project::parse_project(text, "/tmp/pay.foldline");
    ASSERT_TRUE(back) << back.error().message;
    EXPECT_EQ(back->question.kind, project::QuestionKind::Mean);
    EXPECT_TRUE(back->question.log_outcome);
    EXPECT_TRUE(back->question.pay_gap);
    // A version 2 file cannot hold a mean question.
    auto v2 = doc;
    v2["version"] = 2;
    auto bad = project::parse_project(v2.dump(), "/tmp/pay.foldline");
    ASSERT_FALSE(bad);
    EXPECT_NE(bad.error().message.find("mean"), std::string::npos);
}
