// Tests of core/audit/verdicts.h and its JSON form (core/report/verdict_json.h) on the invented
// sample scenarios. The estimate a verdict
// points to must be the figure the engine already computes for that view: the crude difference
// for "pooled", the finding's standardised difference for "stratified", and for another set
// the standardised difference of a scan stratified by that set (computed independently here).
#include "core/report/verdict_json.h"

#include <gtest/gtest.h>

#include "core/audit/verdicts.h"
#include "core/causal/diagram_file.h"
#include "core/io/csv_reader.h"
#include "core/scan/candidates.h"
#include "core/scan/cube.h"
#include "core/scan/joint_strata.h"
#include "core/scan/rate_scan.h"

using namespace foldline;

namespace {

struct Audit {
    Table table;
    Question question;
    ScanResult result;
    causal::Diagram diagram;
};

Audit run(const std::string& csv, const std::string& diagram, const std::string& outcome,
          const std::string& positive, const std::string& exposure, const std::string& focal,
          const std::string& reference) {
    const std::string dir = std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/";
    Audit a;
    auto t = read_csv(dir + csv);
    EXPECT_TRUE(t.ok());
    a.table = std::move(*t);
    QuestionSpec spec{outcome, positive, exposure, {focal}, reference};
    auto q = resolve_question(a.table, spec);
    EXPECT_TRUE(q.ok());
    a.question = *q;
    auto cands = select_candidates(a.table, {outcome, exposure}, CandidateOptions{}, a.table.column(exposure));
    EXPECT_TRUE(cands.ok());
    RateScanOptions opt;
    opt.bootstrap = 0;
    opt.pairs = false;
    auto r = rate_scan(a.table, a.question, *cands, opt);
    EXPECT_TRUE(r.ok());
    a.result = std::move(*r);
    auto d = causal::read_diagram(dir + diagram);
    EXPECT_TRUE(d.ok());
    a.diagram = std::move(*d);
    return a;
}

const RateFinding& finding(const Audit& a, const std::string& stratum) {
    for (const auto& f : a.result.rate_findings)
        if (f.strata == std::vector<std::string>{stratum}) return f;
    throw std::runtime_error("no finding for " + stratum);
}

nlohmann::json verdict_for(const Audit& a, const RateFinding& f) {
    auto cg = causal::CausalGraph::build(a.diagram);
    EXPECT_TRUE(cg.ok());
    auto v = audit::rate_verdict(*cg, a.result, f, &a.table, audit::EstimateSettings{});
    EXPECT_TRUE(v.ok());
    return report::verdict_to_json(*v);
}

}  // namespace

// Confounder (clinic, severity): the stratified view answers; its estimate is the finding's
// standardised difference.
TEST(VerdictJson, ConfounderPointsToTheStratifiedEstimate) {
    auto a = run("clinic_outcomes.csv", "clinic_outcomes.diagram.json", "recovered", "yes", "treatment",
                 "new_protocol", "standard");
    const auto& f = finding(a, "severity");
    auto j = verdict_for(a, f);
    EXPECT_EQ(j["answer"], "stratified");
    ASSERT_TRUE(j["adjusted_estimate"].is_object());
    EXPECT_EQ(j["adjusted_estimate"]["view"], "stratified");
    EXPECT_DOUBLE_EQ(j["adjusted_estimate"]["estimate"].get<double>(), f.adjusted.standardized.rd);
    EXPECT_GT(j["adjusted_estimate"]["estimate"].get<double>(), 0.0);  // planted: new protocol ahead
    EXPECT_LT(f.crude.rd, 0.0);                                        // planted: pooled says behind
}

// Mediator (lender, product): the pooled view answers the total effect; its estimate is the crude
// difference, and the reason says product is a mediator.
TEST(VerdictJson, MediatorPointsToThePooledEstimate) {
    auto a = run("lender_approvals.csv", "lender_approvals.diagram.json", "approved", "1", "applicant_group", "B",
                 "A");
    const auto& f = finding(a, "product");
    auto j = verdict_for(a, f);
    EXPECT_EQ(j["answer"], "pooled");
    EXPECT_EQ(j["adjusted_estimate"]["view"], "pooled");
    EXPECT_DOUBLE_EQ(j["adjusted_estimate"]["estimate"].get<double>(), f.crude.rd);
    EXPECT_NE(j["reason"].get<std::string>().find("mediator"), std::string::npos);
}

// A collider-type stratifier (clinic, days_in_care) is not the right set; the diagram names
// {severity}; the estimate must equal the severity finding's standardised difference, which the
// scan computed over the severity strata on its own.
TEST(VerdictJson, OtherSetIsStandardisedOverThatSet) {
    auto a = run("clinic_outcomes.csv", "clinic_outcomes.diagram.json", "recovered", "yes", "treatment",
                 "new_protocol", "standard");
    const auto& f = finding(a, "days_in_care");
    auto j = verdict_for(a, f);
    EXPECT_EQ(j["answer"], "other_set");
    ASSERT_TRUE(j["adjusted_estimate"].is_object()) << j.dump();
    EXPECT_EQ(j["adjusted_estimate"]["view"], "standardised");
    EXPECT_EQ(j["adjusted_estimate"]["over"], nlohmann::json::array({"severity"}));
    const auto& severity = finding(a, "severity");
    EXPECT_NEAR(j["adjusted_estimate"]["estimate"].get<double>(), severity.adjusted.standardized.rd, 1e-12);
    EXPECT_NEAR(j["adjusted_estimate"]["ci"][0].get<double>(), severity.adjusted.standardized.rd_ci.lo, 1e-12);
}

TEST(JointStrata, CombinesLevelsAndDropsRowsMissingAny) {
    Table t;
    t.rows = 4;
    t.columns.push_back(Column::categorical("a", {"x", "y"}, {0, 1, 0, 2}));
    t.columns.push_back(Column::categorical("b", {"p", "q"}, {0, 0, 1, 0}));
    auto j = joint_stratifier(t, {"a", "b"});
    ASSERT_TRUE(j.ok());
    EXPECT_EQ(j->levels, (std::vector<std::string>{"x | p", "y | p", "x | q"}));
    EXPECT_TRUE(j->is_missing(3));
    EXPECT_FALSE(joint_stratifier(t, {"nope"}).ok());
}
