// Tests of core/audit/verdicts.h: the adjusted estimate over a set of any size (what a verdict
// pointing to another set quotes, in `foldline run`, the memo and the workbench's diagram step).
// Checked by hand and against statsmodels.
#include "core/audit/verdicts.h"

#include <gtest/gtest.h>

#include <algorithm>

#include "core/audit/project_file.h"
#include "core/audit/run_audit.h"
#include "core/io/csv_reader.h"
#include "core/scan/question.h"

using namespace foldline;

namespace {

Column categorical(const std::string& name, const std::vector<std::string>& cells) {
    std::vector<std::string> levels;
    std::vector<std::uint32_t> codes;
    for (const auto& cell : cells) {
        auto it = std::find(levels.begin(), levels.end(), cell);
        if (it == levels.end()) it = levels.insert(levels.end(), cell);
        codes.push_back(static_cast<std::uint32_t>(it - levels.begin()));
    }
    return Column::categorical(name, levels, codes);
}

}  // namespace

// Three joint strata of (a, b, c): focal/reference 6/10 vs 3/10, 1/5 vs 6/15, 10/20 vs 4/20.
// By hand (direct standardisation to the pooled mix, weights 0.25, 0.25, 0.5):
// 0.25 × 0.3 + 0.25 × (−0.2) + 0.5 × 0.3 = 0.175; Wald 95% limits −0.0299779 and 0.3799779
// (Var = 0.0109375; z = scipy.stats.norm.ppf(0.975)).
TEST(EstimateOverSet, RateDifferenceOverThreeColumns) {
    std::vector<std::string> out, grp, a, b, c;
    auto add = [&](const char* ga, const char* gb, const char* gc, const char* group, int n, int pos) {
        for (int i = 0; i < n; ++i) {
            out.push_back(i < pos ? "1" : "0");
            grp.push_back(group);
            a.push_back(ga), b.push_back(gb), c.push_back(gc);
        }
    };
    add("x", "x", "x", "F", 10, 6);
    add("x", "x", "x", "R", 10, 3);
    add("x", "y", "x", "F", 5, 1);
    add("x", "y", "x", "R", 15, 6);
    add("y", "y", "y", "F", 20, 10);
    add("y", "y", "y", "R", 20, 4);
    Table t;
    t.rows = out.size();
    t.columns = {categorical("cured", out), categorical("group", grp), categorical("a", a), categorical("b", b),
                 categorical("c", c)};
    auto q = resolve_question(t, QuestionSpec{"cured", "1", "group", {"F"}, "R"});
    ASSERT_TRUE(q.ok());
    ScanResult r;
    r.question = *q;
    const audit::EstimateSettings s;
    auto f = audit::estimate_over_set(r, FindingKind::Rate, &t, {"a", "b", "c"}, s);
    ASSERT_TRUE(f.ok()) << f.error().message;
    EXPECT_NEAR(f->estimate, 0.175, 1e-12);
    EXPECT_NEAR(f->ci_low, -0.02997793991388928, 1e-9);
    EXPECT_NEAR(f->ci_high, 0.3799779399138893, 1e-9);
    // Two columns go the same way: over (a, c) the strata are those of (a, b, c) merged where b
    // varies within a level of (a, c): (x, x) holds 7 of 15 focal and 9 of 25 reference
    // positives, so by hand 0.5 × (7/15 − 9/25) + 0.5 × 0.3 = 0.2033333.
    auto two = audit::estimate_over_set(r, FindingKind::Rate, &t, {"a", "c"}, s);
    ASSERT_TRUE(two.ok());
    EXPECT_NEAR(two->estimate, 0.5 * (7.0 / 15.0 - 9.0 / 25.0) + 0.5 * 0.3, 1e-12);
    // Errors say what is wrong.
    EXPECT_FALSE(audit::estimate_over_set(r, FindingKind::Rate, &t, {}, s).ok());
    EXPECT_FALSE(audit::estimate_over_set(r, FindingKind::Rate, nullptr, {"a"}, s).ok());
    auto unknown = audit::estimate_over_set(r, FindingKind::Rate, &t, {"a", "b", "nope"}, s);
    ASSERT_FALSE(unknown.ok());
    EXPECT_NE(unknown.error().message.find("nope"), std::string::npos);
    auto none = audit::estimate_over_set(r, FindingKind::Rate, &t, {"group", "a", "b"}, s);
    ASSERT_FALSE(none.ok());
    EXPECT_NE(none.error().message.find("both groups"), std::string::npos);
}

// sample_data/pay_review.csv (invented employer); statsmodels 0.13.5 OLS
// base_pay ~ woman + C(grade:site), cov_type="HC1" [calc]: coefficient 538.9567791791526, HC1 SE
// 120.35535440941304, df_resid 2381, t interval (scipy.stats.t.ppf(0.975, 2381))
// 302.9446451156914 to 774.9689132426138.
TEST(EstimateOverSet, MeanGapFixedEffectsOverTwoColumns) {
    auto t = read_csv(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/pay_review.csv");
    ASSERT_TRUE(t.ok());
    QuestionSpec spec;
    spec.outcome = "base_pay";
    spec.exposure = "gender";
    spec.focal = {"woman"};
    spec.reference = "man";
    auto groups = resolve_groups(*t, spec);
    ASSERT_TRUE(groups.ok()) << groups.error().message;
    ScanResult r;
    r.question = *groups;
    auto f = audit::estimate_over_set(r, FindingKind::Mean, &*t, {"grade", "site"}, audit::EstimateSettings{});
    ASSERT_TRUE(f.ok()) << f.error().message;
    EXPECT_NEAR(f->estimate, 538.9567791791526, 1e-7);
    EXPECT_NEAR(f->ci_low, 302.9446451156914, 1e-6);
    EXPECT_NEAR(f->ci_high, 774.9689132426138, 1e-6);
    EXPECT_EQ(f->strata, 18u);  // 6 grades × 3 sites (pandas nunique), every one holding both groups
    // Errors say what is wrong: an unknown column, no rows.
    EXPECT_FALSE(audit::estimate_over_set(r, FindingKind::Mean, &*t, {"grade", "nope"}, {}).ok());
    EXPECT_FALSE(audit::estimate_over_set(r, FindingKind::Mean, nullptr, {"grade"}, {}).ok());
}

// The saved pay review (sample_data/pay_audit.foldline) through the audit service: its diagram
// has gender -> grade -> base_pay and no arrow into gender, so for the total difference the
// pooled view answers (back-door criterion, no confounder to adjust for) and the verdict quotes
// the Welch pooled difference; a diagram with grade as a confounder (grade -> gender) points to
// the within-grade fixed-effects difference with its HC1 interval, as the class uses it.
TEST(MeanVerdict, PooledForAMediatorWithinForAConfounder) {
    auto p = project::load_project(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/pay_audit.foldline");
    ASSERT_TRUE(p.ok()) << p.error().message;
    auto run = audit::run_audit(*p);
    ASSERT_TRUE(run.ok()) << run.error().message;
    const MeanFinding* grade = nullptr;
    for (const auto& f : run->result.mean_findings)
        if (f.strata == std::vector<std::string>{"grade"}) grade = &f;
    ASSERT_NE(grade, nullptr);
    ASSERT_TRUE(grade->verdict.has_value()) << grade->verdict_problem;
    ASSERT_TRUE(grade->verdict->estimate.has_value());
    const AdjustedEstimate& e = *grade->verdict->estimate;
    EXPECT_EQ(e.view, AdjustedEstimate::View::Pooled);
    EXPECT_EQ(e.measure, "mean_difference");
    EXPECT_DOUBLE_EQ(e.estimate, grade->crude.difference.estimate);
    EXPECT_LT(e.estimate, 0);  // pooled, women earn less in the invented sample

    causal::Diagram d = p->diagram() ? *p->diagram() : causal::Diagram{};
    for (auto& edge : d.edges)
        if (edge.from == "gender" && edge.to == "grade") std::swap(edge.from, edge.to);
    auto v = audit::judge(d, "gender", "base_pay", {"grade"}, &run->result, &run->table, audit::EstimateSettings{});
    ASSERT_TRUE(v.ok()) << v.error().message;
    ASSERT_TRUE(v->estimate.has_value());
    EXPECT_EQ(v->estimate->view, AdjustedEstimate::View::Stratified);
    EXPECT_DOUBLE_EQ(v->estimate->estimate, grade->fixed_effects.estimate);
    EXPECT_DOUBLE_EQ(v->estimate->ci_low, grade->fixed_effects.robust.ci_low);
    // statsmodels 0.13.5 OLS base_pay ~ woman + C(grade), HC1 [calc]: 524.5695513506938, t
    // interval 278.52261299182544 to 770.6164897095622.
    EXPECT_NEAR(v->estimate->estimate, 524.5695513506938, 1e-7);
    EXPECT_NEAR(v->estimate->ci_low, 278.52261299182544, 1e-6);
    EXPECT_NEAR(v->estimate->ci_high, 770.6164897095622, 1e-6);
}

// sample_data/retail_weeks.csv; statsmodels 0.13.5 OLS weekly_sales ~ promo_spend +
// C(store_format:region:quarter) [calc]: slope −3.7510981662171075, 95% CI
// −3.978314799084222 to −3.523881533349993 (80 joint strata).
TEST(EstimateOverSet, WithinSlopeOverThreeColumns) {
    auto t = read_csv(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/retail_weeks.csv");
    ASSERT_TRUE(t.ok());
    ScanResult r;
    r.slope_question.x = "promo_spend";
    r.slope_question.y = "weekly_sales";
    auto f = audit::estimate_over_set(r, FindingKind::Slope, &*t, {"store_format", "region", "quarter"},
                                      audit::EstimateSettings{});
    ASSERT_TRUE(f.ok()) << f.error().message;
    EXPECT_NEAR(f->estimate, -3.7510981662171075, 1e-9);
    EXPECT_NEAR(f->ci_low, -3.978314799084222, 1e-8);
    EXPECT_NEAR(f->ci_high, -3.523881533349993, 1e-8);
}

// Before any scan, the diagram alone gives a verdict without an estimate; an invalid diagram is
// an error naming the problem.
TEST(Judge, DiagramAloneGivesAVerdictWithoutEstimate) {
    causal::Diagram d;
    d.nodes = {{"z", true, {}, {}}, {"x", true, {}, {}}, {"y", true, {}, {}}};
    d.edges = {{"z", "x"}, {"z", "y"}, {"x", "y"}};
    auto v = audit::judge(d, "x", "y", {"z"}, nullptr, nullptr, audit::EstimateSettings{});
    ASSERT_TRUE(v.ok()) << v.error().message;
    EXPECT_EQ(v->verdict.answer, causal::Answer::Stratified);  // z is a common cause: back-door criterion
    EXPECT_FALSE(v->estimate.has_value());
    d.edges.push_back({"y", "z"});  // a cycle
    auto bad = audit::judge(d, "x", "y", {"z"}, nullptr, nullptr, audit::EstimateSettings{});
    ASSERT_FALSE(bad.ok());
    EXPECT_NE(bad.error().message.find("cycle"), std::string::npos) << bad.error().message;
}

// A diagram that lacks a finding's columns names them (core/causal/missing_columns), in judge and
// in every finding's verdict problem, instead of reading a verdict off a partial diagram.
TEST(Judge, MissingColumnsAreNamed) {
    causal::Diagram d;
    d.nodes = {{"x", true, {}, {}}, {"y", true, {}, {}}};
    d.edges = {{"x", "y"}};
    auto v = audit::judge(d, "x", "y", {"z", "w"}, nullptr, nullptr, audit::EstimateSettings{});
    ASSERT_FALSE(v.ok());
    EXPECT_EQ(v.error().message, "the diagram lacks the finding's columns \"z\" and \"w\"; add them to the "
                                 "diagram to learn which view answers the question");
    ScanResult r;
    r.question.exposure = "x";
    r.question.outcome = "y";
    RateFinding f;
    f.strata = {"z"};
    r.rate_findings = {f};
    f.strata = {};
    r.rate_findings.push_back(f);
    const std::string problem = audit::attach_verdicts(r, nullptr, d, audit::EstimateSettings{});
    EXPECT_NE(problem.find("lacks the finding's column \"z\""), std::string::npos) << problem;
    EXPECT_EQ(r.rate_findings[0].verdict_problem, problem);
    EXPECT_FALSE(r.rate_findings[0].verdict.has_value());
    EXPECT_TRUE(r.rate_findings[1].verdict_problem.empty());  // no stratifier: the diagram holds x and y
}
