// Tests of the mean-gap reports: core/report/mean_json.h, mean_csv.h, mean_memo.h and
// mean_summary.h, on the invented pay review (tests/core/stats/data/pay_by_grade.csv). The
// figures are the scan's (checked against statsmodels and scipy in tests/core/scan); here: each
// report writes them where its format says, with the pay-review caution.
#include "core/report/mean_json.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>

#include "core/audit/mean_audit.h"
#include "core/io/csv_reader.h"
#include "core/report/csv_export.h"
#include "core/report/mean_csv.h"
#include "core/report/mean_memo.h"
#include "core/report/scan_summary.h"
#include "core/scan/mean_analysis.h"

using namespace foldline;

namespace {

const std::string kPay = std::string(FOLDLINE_SOURCE_DIR) + "/tests/core/stats/data/pay_by_grade.csv";

ScanResult pay_scan(bool pay_gap, bool log_outcome = false) {
    auto t = read_csv(kPay);
    EXPECT_TRUE(t);
    project::AuditSpec s;
    s.question.kind = project::QuestionKind::Mean;
    s.question.outcome = "salary";
    s.question.exposure = "group";
    s.question.focal = {"B"};
    s.question.reference = "A";
    s.question.pay_gap = pay_gap;
    s.question.log_outcome = log_outcome;
    s.scan.strata = {"grade"};
    auto r = audit::scan_mean_question(*t, s, 1, {});
    EXPECT_TRUE(r) << (r ? "" : r.error().message);
    return std::move(*r);
}

std::size_t lines(const std::string& s) { return static_cast<std::size_t>(std::count(s.begin(), s.end(), '\n')); }

}  // namespace

TEST(MeanReport, JsonCarriesTheFiguresAndNullForUndefined) {
    const ScanResult r = pay_scan(true);
    const auto& f = r.mean_findings.at(0);
    const auto j = to_json(f);
    EXPECT_EQ(j["kind"], "mean");
    EXPECT_DOUBLE_EQ(j["fixed_effects"]["se_hc1"].get<double>(), f.fixed_effects.se_hc1);
    EXPECT_DOUBLE_EQ(j["crude"]["difference"]["estimate"].get<double>(), f.crude.difference.estimate);
    EXPECT_EQ(j["pay_gap"]["medians_from"], "rows");
    EXPECT_EQ(j["strata_table"].size(), f.strata_table.size());
    EXPECT_FALSE(j.contains("percent"));  // not a log outcome
    // No cells: every figure undefined, written as null.
    EXPECT_TRUE(to_json(analyse_mean_strata({}, {}, {}, {}))["crude"]["difference"]["estimate"].is_null());
    EXPECT_TRUE(to_json(pay_scan(false, true).mean_findings.at(0)).contains("percent"));
}

TEST(MeanReport, CsvFilesAndRows) {
    const ScanResult r = pay_scan(true);
    const auto paths = report::csv_export_paths(r, "out");
    ASSERT_EQ(paths.size(), 2u);
    EXPECT_EQ(paths[0], "out-mean-findings.csv");
    EXPECT_EQ(paths[1], "out-mean-strata.csv");
    const std::string findings = report::mean_findings_csv(r);
    EXPECT_EQ(lines(findings), 2u);
    EXPECT_NE(findings.find(",mean,"), std::string::npos);
    const std::string strata = report::mean_strata_csv(r);
    EXPECT_EQ(lines(strata), 1 + r.mean_findings[0].strata_table.size());
}

TEST(MeanReport, MemoAndSummaryCarryTheCaution) {
    const ScanResult r = pay_scan(true);
    report::MemoInput in;
    in.scan = &r;
    const auto m = report::build_memo(in);
    EXPECT_NE(m.question.find("mean of salary"), std::string::npos) << m.question;
    EXPECT_NE(m.caution.find("equal-pay law"), std::string::npos);
    EXPECT_EQ(m.findings.rows.size(), 1u);  // one comparison: listed whether flagged or not
    for (const auto& note : m.method_notes) EXPECT_EQ(note.find("Mantel-Haenszel"), std::string::npos) << note;
    const std::string text = scan_summary_text(r, "pay.csv", 10);
    EXPECT_NE(text.find("Mean of salary"), std::string::npos) << text;
    EXPECT_NE(text.find("equal-pay law"), std::string::npos) << text;
}
