// Tests of core/audit/run_audit.h, verdicts.h and class_changes.h on the invented sample audits:
// the service both front ends call re-runs a saved project to the classes it recorded, attaches
// verdicts with estimates computed once with the project's own settings, reports failures with
// their kind, and honours the hidden-group hint. The figures themselves are checked against
// reference libraries elsewhere (tests/core/stats, tests/reference); here the references are the
// classes each sample project recorded and the scan's own independent stratified figures.
#include "core/audit/run_audit.h"

#include <gtest/gtest.h>

#include <fstream>

#include "core/audit/class_changes.h"
#include "core/audit/memo_input.h"
#include "core/audit/project_file.h"
#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"
#include "core/report/scan_summary.h"

using namespace foldline;

namespace {

const std::string kSamples = std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/";

project::Project sample(const std::string& name) {
    auto p = project::load_project(kSamples + name);
    EXPECT_TRUE(p.ok()) << (p.ok() ? "" : p.error().to_string());
    return p.ok() ? std::move(*p) : project::Project{};
}

const RateFinding* rate_by(const ScanResult& r, const std::vector<std::string>& strata) {
    for (const auto& f : r.rate_findings)
        if (f.strata == strata) return &f;
    return nullptr;
}

}  // namespace

// Each sample project recorded the classes of its findings; a re-run gives the same classes.
TEST(RunAudit, SampleProjectsReRunToTheClassesTheyRecorded) {
    for (const char* name : {"lender_audit.foldline", "clinic_audit.foldline", "retail_audit.foldline"}) {
        const auto p = sample(name);
        auto run = audit::run_audit(p);
        ASSERT_TRUE(run.ok()) << name << ": " << run.error().to_string();
        EXPECT_TRUE(run->data_change.empty()) << name << ": " << run->data_change;
        EXPECT_FALSE(run->info.sha256.empty());
        EXPECT_EQ(run->info.sha256, p.data.sha256) << name;
        EXPECT_TRUE(audit::class_changes(p, run->result).empty()) << name;
        EXPECT_GT(run->result.rate_findings.size() + run->result.slope_findings.size(), 0u) << name;
    }
}

// The clinic's diagram: severity confounds, days_in_care is a consequence of treatment. The
// verdict on days_in_care points to another set ({severity}); its estimate is computed once with
// the project's settings and equals the severity finding's standardised difference, which the
// scan computed on its own over the same strata.
TEST(RunAudit, VerdictsCarryTheEstimateOverAnotherSet) {
    const auto p = sample("clinic_audit.foldline");
    ASSERT_NE(p.diagram(), nullptr);
    auto run = audit::run_audit(p);
    ASSERT_TRUE(run.ok()) << run.error().to_string();
    const RateFinding* days = rate_by(run->result, {"days_in_care"});
    const RateFinding* severity = rate_by(run->result, {"severity"});
    ASSERT_TRUE(days && severity);
    ASSERT_TRUE(days->verdict.has_value()) << days->verdict_problem;
    EXPECT_EQ(days->verdict->verdict.answer, causal::Answer::OtherSet);
    ASSERT_TRUE(days->verdict->estimate.has_value()) << days->verdict->estimate_problem;
    EXPECT_EQ(days->verdict->estimate->view, AdjustedEstimate::View::Standardised);
    EXPECT_EQ(days->verdict->estimate->over, std::vector<std::string>{"severity"});
    EXPECT_NEAR(days->verdict->estimate->estimate, severity->adjusted.standardized.rd, 1e-12);
    ASSERT_TRUE(severity->verdict.has_value());
    EXPECT_EQ(severity->verdict->verdict.answer, causal::Answer::Stratified);
    EXPECT_EQ(severity->verdict->estimate->estimate, severity->adjusted.standardized.rd);
}

// Errors carry their kind, so each front end maps them without guessing.
TEST(RunAudit, ErrorsCarryTheirKind) {
    auto p = sample("lender_audit.foldline");
    {
        auto q = p;
        q.data.path = kSamples + "no_such_file.csv";
        q.data.sha256.clear();
        auto r = audit::run_audit(q);
        ASSERT_FALSE(r.ok());
        EXPECT_EQ(r.error().kind, ErrorKind::Input);
    }
    auto table = read_csv(kSamples + "lender_approvals.csv");
    ASSERT_TRUE(table.ok());
    {
        auto q = p;
        q.question.outcome = "no_such_column";
        auto r = audit::scan_table(*table, q);
        ASSERT_FALSE(r.ok());
        EXPECT_EQ(r.error().kind, ErrorKind::Usage);
    }
    {
        auto q = p;
        q.scan.alpha = 0.7;
        auto r = audit::scan_table(*table, q);
        ASSERT_FALSE(r.ok());
        EXPECT_EQ(r.error().kind, ErrorKind::Usage);
        EXPECT_NE(r.error().message.find("alpha"), std::string::npos);
    }
    {
        auto q = p;
        q.trend = project::TrendSettings{"income", "product", {}};  // product is not numeric
        auto r = audit::scan_table(*table, q);
        ASSERT_FALSE(r.ok());
        EXPECT_EQ(r.error().kind, ErrorKind::Usage);
        EXPECT_NE(r.error().message.find("product"), std::string::npos);
    }
    {
        auto q = p;
        q.scan.strata = {"branch", "credit_score"};
        q.trend = project::TrendSettings{"income", "loan_amount", {"credit_score"}};
        auto r = audit::scan_table(*table, q);
        ASSERT_FALSE(r.ok());
        EXPECT_EQ(r.error().kind, ErrorKind::Usage);
        EXPECT_NE(r.error().message.find("both a stratifier and a covariate"), std::string::npos);
    }
}

// A rate audit with trend checks: slope findings come with the rate findings, under one FDR.
TEST(RunAudit, TrendChecksJoinTheRateScan) {
    auto p = sample("lender_audit.foldline");
    p.scan.bootstrap = 0;
    p.trend = project::TrendSettings{"income", "loan_amount", {}};
    auto table = read_csv(kSamples + "lender_approvals.csv");
    ASSERT_TRUE(table.ok());
    auto r = audit::scan_table(*table, p);
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    EXPECT_FALSE(r->rate_findings.empty());
    EXPECT_FALSE(r->slope_findings.empty());
    EXPECT_EQ(r->slope_question.x, "income");
    for (const auto& f : r->slope_findings) {
        EXPECT_EQ(f.kind, FindingKind::Slope);
        EXPECT_EQ(f.strata.size(), 1u);  // trend checks stratify by single columns
        EXPECT_FALSE(std::isnan(f.q_value) && !std::isnan(f.p_reversal));
    }
}

// The hidden-group hint runs through the same service when the spec asks for it, and not
// otherwise.
TEST(RunAudit, FindGroupsAddsTheHiddenGroupHint) {
    auto p = sample("retail_audit.foldline");
    p.scan.slope_bootstrap = 0;
    auto table = read_csv(p.data.path);
    ASSERT_TRUE(table.ok());
    auto plain = audit::scan_table(*table, p);
    ASSERT_TRUE(plain.ok()) << plain.error().to_string();
    EXPECT_FALSE(plain->latent.has_value());
    p.scan.find_groups = true;
    auto with = audit::scan_table(*table, p);
    ASSERT_TRUE(with.ok()) << with.error().to_string();
    ASSERT_TRUE(with->latent.has_value());
    EXPECT_GE(with->latent->k, 1);
    EXPECT_EQ(with->latent->seed, p.scan.seed);
    // The memo states it as a hint, never as a finding.
    const auto memo = report::build_memo(audit::memo_input(*with, DataInfo{p.data.path, "", 5000}, &p, &*table, "2026-12-04"));
    EXPECT_NE(memo.summary.find("Hidden-group hint (not a finding): " + with->latent->note), std::string::npos)
        << memo.summary;
    // Too few rows for the mixtures: the findings stand and the hint says why it is missing.
    std::string head;
    {
        std::ifstream in(kSamples + "retail_weeks.csv");
        std::string line;
        for (int i = 0; i < 9 && std::getline(in, line); ++i) head += line + "\n";
    }
    auto few_rows = read_csv_text(head, "retail_weeks.csv (8 rows)");
    ASSERT_TRUE(few_rows.ok()) << few_rows.error().to_string();
    const Table& few = *few_rows;
    project::AuditSpec tiny;
    tiny.question.kind = project::QuestionKind::Slope;
    tiny.question.outcome = "weekly_sales";
    tiny.question.exposure = "promo_spend";
    tiny.scan.find_groups = true;
    tiny.scan.strata = {"footfall"};
    auto small = audit::scan_table(few, tiny);
    ASSERT_TRUE(small.ok()) << small.error().to_string();
    ASSERT_TRUE(small->latent.has_value());
    EXPECT_EQ(small->latent->k, 0);
    EXPECT_EQ(small->latent->note.rfind("no hidden-group hint: ", 0), 0u) << small->latent->note;
    const auto plain_memo = report::build_memo(audit::memo_input(*plain, DataInfo{p.data.path, "", 5000}, &p, &*table, "2026-12-04"));
    EXPECT_EQ(plain_memo.summary.find("Hidden-group hint"), std::string::npos);
}

// A stop request before the scan gives a cancelled result, not an error.
TEST(RunAudit, StopRequestGivesACancelledResult) {
    auto p = sample("lender_audit.foldline");
    auto table = read_csv(p.data.path);
    ASSERT_TRUE(table.ok());
    audit::RunOptions o;
    o.work.stop.request_stop();
    auto r = audit::scan_table(*table, p, o);
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    EXPECT_TRUE(r->cancelled);
}

// Class changes: a saved class that moved, one that vanished, and a newly flagged finding.
TEST(ClassChanges, ReportsMovedVanishedAndNewClasses) {
    ScanResult r;
    RateFinding a;
    a.strata = {"product"};
    a.focal = "B";
    a.reference = "A";
    a.cls = FindingClass::Reversal;
    RateFinding b = a;
    b.strata = {"branch"};
    b.cls = FindingClass::Explained;
    r.rate_findings = {a, b};
    project::Project p;
    p.review_for(audit::key_of(a)).saved_class = FindingClass::Stable;
    p.review_for(project::rate_key({"gone"}, "B", "A")).saved_class = FindingClass::Masked;
    const auto changes = audit::class_changes(p, r);
    ASSERT_EQ(changes.size(), 3u);
    EXPECT_EQ(changes[0].key, audit::key_of(a));
    EXPECT_EQ(*changes[0].after, FindingClass::Reversal);
    EXPECT_FALSE(changes[1].after.has_value());
    EXPECT_FALSE(changes[2].before.has_value());
    EXPECT_EQ(*changes[2].after, FindingClass::Explained);
    audit::record_classes(p, r);
    EXPECT_EQ(audit::class_changes(p, r).size(), 1u);  // the vanished one stays recorded
    project::Project none;
    EXPECT_TRUE(audit::class_changes(none, r).empty());
}

// A slope question on the committed retail sample, whose generator (sample_data/generate_retail.py)
// plants a reversal of weekly_sales on promo_spend by store_format: the document and the printed
// summary of the audit service, with the hidden-group hint, laid out as docs/json.md says.
TEST(RunAudit, SlopeQuestionDocumentAndSummary) {
    project::AuditSpec spec;
    spec.question.kind = project::QuestionKind::Slope;
    spec.question.outcome = "weekly_sales";
    spec.question.exposure = "promo_spend";
    spec.scan.find_groups = true;
    auto table = read_csv(kSamples + "retail_weeks.csv");
    ASSERT_TRUE(table.ok());
    auto r = audit::scan_table(*table, spec);
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    EXPECT_EQ(r->candidates.size(), 4u);  // store_format, region, quarter, footfall (binned)
    const auto j = scan_to_json(*r, DataInfo{"retail_weeks.csv", "abc", 5000});
    for (const char* k : {"version", "data", "question", "settings", "candidates", "excluded", "summary", "findings"})
        EXPECT_TRUE(j.contains(k)) << k;
    EXPECT_EQ(j["question"]["exposure"], "promo_spend");
    EXPECT_EQ(j["summary"]["checks"], 10);
    ASSERT_EQ(j["findings"].size(), 11u);  // 4 singles + 6 pairs + the latent finding
    EXPECT_EQ(j["findings"].back()["kind"], "latent");
    EXPECT_EQ(j["findings"][0]["kind"], "slope");
    EXPECT_EQ(j["findings"][0]["class"], "reversal");
    bool planted = false;  // the single stratifier the generator planted the reversal in
    for (const auto& f : j["findings"])
        planted = planted || (f["strata"] == nlohmann::json::array({"store_format"}) && f["class"] == "reversal");
    EXPECT_TRUE(planted);
    EXPECT_GE(j["summary"]["classes"]["reversal"].get<int>(), 4);
    const std::string text = scan_summary_text(*r, "retail_weeks.csv", 20);
    EXPECT_NE(text.find("Slope of weekly_sales on promo_spend"), std::string::npos) << text;
    EXPECT_NE(text.find("Hidden-group hint (not a finding)"), std::string::npos) << text;
    EXPECT_NE(text.find("not a legal, lending or clinical determination"), std::string::npos);
}

// A rows filter: run_audit keeps the rows the filter keeps (and says how many it read), and
// scan_table gives the same findings whether it is handed all rows or the filtered ones.
TEST(RunAudit, RowsFilterScansOnlyTheKeptRows) {
    auto p = sample("clinic_audit.foldline");
    p.question.rows = "severity <> 'mild' and site is not missing";
    auto run = audit::run_audit(p);
    ASSERT_TRUE(run.ok()) << run.error().to_string();
    EXPECT_EQ(run->table.filter, "severity <> 'mild' and site is not missing");
    EXPECT_EQ(run->result.rows_filter, run->table.filter);
    EXPECT_EQ(run->info.rows, 8000);  // rows read
    EXPECT_LT(run->result.rows_kept, 8000);
    EXPECT_EQ(run->result.rows_kept, static_cast<double>(run->table.rows));

    auto all = read_csv(p.data.path);
    ASSERT_TRUE(all.ok());
    std::size_t kept = 0;
    const Column* sev = all->column("severity");
    for (std::size_t r = 0; r < all->rows; ++r) kept += !sev->is_missing(r) && sev->levels[sev->code(r)] != "mild";
    EXPECT_EQ(run->table.rows, kept);
    auto direct = audit::scan_table(*all, p);
    ASSERT_TRUE(direct.ok()) << direct.error().to_string();
    const DataInfo info{"clinic", "", 8000};
    EXPECT_EQ(scan_json_text(*direct, info), scan_json_text(run->result, info));
    EXPECT_NE(scan_json_text(*direct, info).find("\"rows\":\"severity <> 'mild' and site is not missing\""),
              std::string::npos);

    // A filter that keeps nothing is an input error; one that names no column a usage error.
    p.question.rows = "severity = 'none such'";
    auto none = audit::run_audit(p);
    ASSERT_FALSE(none.ok());
    EXPECT_EQ(none.error().kind, ErrorKind::Input);
    EXPECT_NE(none.error().message.find("keeps none of the 8000 rows"), std::string::npos) << none.error().message;
    p.question.rows = "sevrity = 'mild'";
    auto typo = audit::scan_table(*all, p);
    ASSERT_FALSE(typo.ok());
    EXPECT_EQ(typo.error().kind, ErrorKind::Usage);
}
