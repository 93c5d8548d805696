// Tests of core/causal/verdict.h: the five answers on textbook structures and the verdicts on
// the sample scenarios' diagrams (sample_data/*.diagram.json, invented scenarios).
// Textbook readings: Hernán & Robins, Causal Inference: What If (2020), ch. 7-8 (adjust for a
// confounder; not for a mediator when the total effect is wanted; not for a collider)
// [from memory]. The controlled direct effect needs the mediator plus a set blocking the
// mediator-outcome back-door paths: Pearl 2001, "Direct and indirect effects" (UAI);
// Cole & Hernán 2002, Int J Epidemiol 31:163-165 ("Fallibility in estimating direct
// effects", the mediator-outcome confounder case) [from memory].
#include "core/causal/verdict.h"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <random>

#include <gtest/gtest.h>

#include "core/causal/diagram_file.h"
#include "tests/core/causal/test_graphs.h"

using namespace foldline::causal;
using foldline::causal::fixtures::make_diagram;

namespace {

CausalGraph must_build(const Diagram& d) {
    auto cg = CausalGraph::build(d);
    EXPECT_TRUE(cg.ok()) << (cg.ok() ? "" : cg.error().to_string());
    return std::move(*cg);
}

Verdict must_decide(const CausalGraph& cg, const char* x, const char* y, std::vector<std::string> s) {
    auto v = decide(cg, x, y, s);
    EXPECT_TRUE(v.ok()) << (v.ok() ? "" : v.error().to_string());
    return std::move(*v);
}

CausalGraph load_sample(const std::string& name) {
    auto d = read_diagram(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/" + name);
    EXPECT_TRUE(d.ok()) << (d.ok() ? "" : d.error().to_string());
    return must_build(*d);
}

}  // namespace

TEST(Verdict, ConfounderMeansStratified) {
    auto cg = must_build(make_diagram({"Z", "X", "Y"}, {{"Z", "X"}, {"Z", "Y"}, {"X", "Y"}}));
    auto v = must_decide(cg, "X", "Y", {"Z"});
    EXPECT_EQ(v.answer, Answer::Stratified);
    EXPECT_EQ(v.standardise_over, std::vector<std::string>{"Z"});
    EXPECT_EQ(v.reason,
              "The stratified view answers the total effect of \"X\" on \"Y\": stratifying by \"Z\" blocks every "
              "back-door path, while the pooled comparison is confounded by \"Z\".");
    EXPECT_FALSE(v.direct_effect.applies);
}

TEST(Verdict, MediatorMeansPooledAndOffersTheDirectEffect) {
    auto cg = must_build(make_diagram({"X", "M", "Y"}, {{"X", "M"}, {"M", "Y"}, {"X", "Y"}}));
    auto v = must_decide(cg, "X", "Y", {"M"});
    EXPECT_EQ(v.answer, Answer::Pooled);
    EXPECT_EQ(v.standardise_over, std::vector<std::string>{});
    EXPECT_NE(v.reason.find("\"M\" is a mediator"), std::string::npos) << v.reason;
    ASSERT_TRUE(v.direct_effect.applies);
    EXPECT_TRUE(v.direct_effect.identifiable);
    EXPECT_TRUE(v.direct_effect.stratifier_suffices);  // no mediator-outcome confounding here
    EXPECT_EQ(v.direct_effect.conditioning_set, std::vector<std::string>{"M"});
}

TEST(Verdict, ColliderAndOutcomeDescendantMeanPooled) {
    auto cg = must_build(make_diagram({"X", "C", "Y", "K"}, {{"X", "C"}, {"Q", "C"}, {"Q", "Y"}, {"X", "Y"}, {"Y", "K"}}, {"Q"}));
    auto v = must_decide(cg, "X", "Y", {"C"});
    EXPECT_EQ(v.answer, Answer::Pooled);
    EXPECT_NE(v.reason.find("\"C\" is a collider"), std::string::npos) << v.reason;
    auto k = must_decide(cg, "X", "Y", {"K"});
    EXPECT_EQ(k.answer, Answer::Pooled);
    EXPECT_NE(k.reason.find("\"K\" is a descendant of the outcome"), std::string::npos) << k.reason;
}

TEST(Verdict, PrecisionVariableMeansBoth) {
    auto cg = must_build(make_diagram({"X", "P", "Y"}, {{"P", "Y"}, {"X", "Y"}}));
    auto v = must_decide(cg, "X", "Y", {"P"});
    EXPECT_EQ(v.answer, Answer::Both);
    EXPECT_EQ(v.standardise_over, std::vector<std::string>{});
    auto pooled = must_decide(cg, "X", "Y", {});
    EXPECT_EQ(pooled.answer, Answer::Pooled);
}

TEST(Verdict, InsufficientStratifierPointsToAnotherSet) {
    // Two confounders; stratifying by one leaves the other's back-door path open [calc].
    auto cg = must_build(make_diagram({"A", "B", "X", "Y"}, {{"A", "X"}, {"A", "Y"}, {"B", "X"}, {"B", "Y"}, {"X", "Y"}}));
    auto v = must_decide(cg, "X", "Y", {"A"});
    EXPECT_EQ(v.answer, Answer::OtherSet);
    EXPECT_EQ(v.standardise_over, (std::vector<std::string>{"A", "B"}));
    EXPECT_EQ(v.valid_sets, (std::vector<std::vector<std::string>>{{"A", "B"}}));
    EXPECT_NE(v.reason.find("stratifying by \"A\" is not enough because it leaves a back-door path"), std::string::npos)
        << v.reason;
}

TEST(Verdict, UnobservedConfounderIsNotIdentifiable) {
    auto cg = must_build(make_diagram({"X", "Y", "S"}, {{"U", "X"}, {"U", "Y"}, {"S", "Y"}, {"X", "Y"}}, {"U"}));
    auto v = must_decide(cg, "X", "Y", {"S"});
    EXPECT_EQ(v.answer, Answer::NotIdentifiable);
    EXPECT_FALSE(v.standardise_over.has_value());
    EXPECT_EQ(v.unobserved_needed, std::vector<std::string>{"U"});
    EXPECT_EQ(v.reason,
              "The total effect of \"X\" on \"Y\" is not identifiable by adjustment from this diagram: no set of "
              "observed columns is valid, and the unobserved \"U\" would have to be measured.");
}

TEST(Verdict, BadStratifierIsAnError) {
    auto cg = must_build(make_diagram({"X", "Y"}, {{"X", "Y"}}, {"U"}));
    EXPECT_EQ(decide(cg, "X", "Y", {"nope"}).error().message, "stratifier \"nope\" is not a node of the diagram");
    EXPECT_EQ(decide(cg, "X", "Y", {"U"}).error().message,
              "stratifier \"U\" is a data column but the diagram marks it unobserved");
    EXPECT_FALSE(decide(cg, "X", "Y", {"X"}).ok());
    EXPECT_FALSE(decide(cg, "X", "U", {}).ok());
}

TEST(Verdict, LenderSampleProductIsAMediatorSoThePooledViewAnswers) {
    auto cg = load_sample("lender_approvals.diagram.json");
    auto v = must_decide(cg, "applicant_group", "approved", {"product"});
    EXPECT_EQ(v.answer, Answer::Pooled);
    ASSERT_EQ(v.stratifier_roles.size(), 1u);
    EXPECT_EQ(v.stratifier_roles[0].role, Role::Mediator);
    EXPECT_TRUE(v.empty_set_valid);
    // Direct effect not through product: income_band drives both product and approval, so
    // the stratified table alone is not enough (mediator-outcome confounding, Cole & Hernán 2002).
    ASSERT_TRUE(v.direct_effect.applies);
    EXPECT_TRUE(v.direct_effect.identifiable);
    EXPECT_FALSE(v.direct_effect.stratifier_suffices);
    EXPECT_EQ(v.direct_effect.conditioning_set, (std::vector<std::string>{"product", "income_band"}));
    // Stratifying by a precision variable is harmless.
    EXPECT_EQ(must_decide(cg, "applicant_group", "approved", {"credit_score"}).answer, Answer::Both);
}

TEST(Verdict, ClinicSampleSeverityIsAConfounderSoTheStratifiedViewAnswers) {
    auto cg = load_sample("clinic_outcomes.diagram.json");
    auto v = must_decide(cg, "treatment", "recovered", {"severity"});
    EXPECT_EQ(v.answer, Answer::Stratified);
    EXPECT_EQ(v.stratifier_roles[0].role, Role::Confounder);
    auto stay = must_decide(cg, "treatment", "recovered", {"days_in_care"});
    EXPECT_EQ(stay.answer, Answer::OtherSet);
    EXPECT_EQ(stay.stratifier_roles[0].role, Role::Collider);
    EXPECT_EQ(stay.standardise_over, std::vector<std::string>{"severity"});
    EXPECT_NE(stay.reason.find("is itself biased because \"days_in_care\" is a collider"), std::string::npos) << stay.reason;
}

TEST(Verdict, RetailSampleStoreFormatIsAConfounderSoTheStratifiedViewAnswers) {
    auto cg = load_sample("retail_weeks.diagram.json");
    auto v = must_decide(cg, "promo_spend", "weekly_sales", {"store_format"});
    EXPECT_EQ(v.answer, Answer::Stratified);
    EXPECT_EQ(v.stratifier_roles[0].role, Role::Confounder);
    auto footfall = must_decide(cg, "promo_spend", "weekly_sales", {"footfall"});
    // footfall follows sales (the sample's generator): stratifying by it biases the slope, and the
    // pooled view is confounded by store format, so the answer is to standardise over store_format.
    EXPECT_EQ(footfall.answer, Answer::OtherSet);
    EXPECT_EQ(footfall.stratifier_roles[0].role, Role::OutcomeDescendant);
    EXPECT_EQ(footfall.standardise_over, std::vector<std::string>{"store_format"});
}

TEST(Verdict, AdjustmentReportForTheSamples) {
    auto cg = load_sample("clinic_outcomes.diagram.json");
    auto r = analyse_adjustment(cg, "treatment", "recovered");
    ASSERT_TRUE(r.ok());
    EXPECT_FALSE(r->empty_set_valid);
    EXPECT_EQ(r->minimal_sets, (std::vector<std::vector<std::string>>{{"severity"}}));
    EXPECT_EQ(r->smallest, std::vector<std::string>{"severity"});
    EXPECT_TRUE(r->identifiable);
    EXPECT_EQ(r->roles.size(), 5u);
    auto lender = analyse_adjustment(load_sample("lender_approvals.diagram.json"), "applicant_group", "approved");
    ASSERT_TRUE(lender.ok());
    EXPECT_TRUE(lender->empty_set_valid);
    EXPECT_EQ(lender->minimal_sets, (std::vector<std::vector<std::string>>{{}}));
}

TEST(Verdict, SixtyNodeVerdictIsInteractive) {
    // Timing, not a reference value: the whole verdict (roles, all minimal sets, smallest set,
    // identifiability, direct-effect sets) on a 60-node DAG with about two parents per node.
    // Generous bound; the strict figure is printed.
    std::mt19937 rng(61);
    const int n = 60;
    Graph g = fixtures::random_dag(rng, n, 4.0 / n);
    Diagram d;
    for (int v = 0; v < n; ++v) d.nodes.push_back({"column " + std::to_string(v), v % 9 != 4, {}, {}});
    for (int v = 0; v < n; ++v)
        for (int c : g.children(v)) d.edges.push_back({d.nodes[static_cast<std::size_t>(v)].name, d.nodes[static_cast<std::size_t>(c)].name});
    auto cg = must_build(d);
    // Exposure: the observed node with most ancestors among those with a mediated path to a
    // descendant; outcome: that descendant. Stratifier: one of the mediators.
    int x = -1, y = -1, m = -1;
    std::size_t best = 0;
    for (int a = 0; a < n; ++a) {
        if (!cg.observed(a)) continue;
        auto anc = ancestors(g, {a});
        auto size = static_cast<std::size_t>(std::count(anc.begin(), anc.end(), 1));
        for (int c : g.children(a))
            for (int gc : g.children(c))
                if (cg.observed(c) && cg.observed(gc) && size > best) {
                    best = size;
                    x = a;
                    m = c;
                    y = gc;
                }
    }
    ASSERT_GE(x, 0);
    std::vector<double> ms;
    Verdict v;
    for (int rep = 0; rep < 21; ++rep) {
        auto t0 = std::chrono::steady_clock::now();
        v = must_decide(cg, cg.name(x).c_str(), cg.name(y).c_str(), {cg.name(m)});
        auto t1 = std::chrono::steady_clock::now();
        ms.push_back(std::chrono::duration<double, std::milli>(t1 - t0).count());
    }
    std::sort(ms.begin(), ms.end());
    std::printf("60-node verdict (%zu edges): answer %s, %zu minimal sets, %zu direct-effect sets; median %.3f ms, "
                "max %.3f ms\n",
                g.edge_count(), std::string(to_string(v.answer)).c_str(), v.valid_sets.size(),
                v.direct_effect.extra_sets.size(), ms[ms.size() / 2], ms.back());
    EXPECT_EQ(v.stratifier_roles[0].role, Role::Mediator);
    EXPECT_LT(ms[ms.size() / 2], 500.0);
}
