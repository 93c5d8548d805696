// Tests of core/scan/mean_analysis.h: the mean-gap finding and its class.
//
// The pay review (tests/core/stats/data/pay_by_grade.csv, invented) against
// tests/core/stats/mean_gap_reference.json ([calc] scipy 1.10.x / statsmodels 0.13.x, written by
// tests/reference/mean_gap_reference.py): the reversal p is the larger of the one-sided t tails of
// scipy's Welch test and statsmodels' HC1 fixed-effects coefficient. The class cases below are
// built so that each rule of core/scan/classify.h holds by construction (stated beside each).
#include "core/scan/mean_analysis.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <cmath>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/stats/distributions.h"

using namespace foldline;
using foldline::stats::MeanCells;
using foldline::stats::MeanMoments;
using nlohmann::json;

namespace {

const std::string kStatsDir = std::string(FOLDLINE_SOURCE_DIR) + "/tests/core/stats";

json load_reference() {
    std::ifstream in(kStatsDir + "/mean_gap_reference.json");
    EXPECT_TRUE(in.good()) << "mean_gap_reference.json missing";
    return json::parse(in);
}

// Grades G1..G6 as strata 0..5; group B is focal. weighted: row i counts 1 + i % 3 times.
MeanCells pay_cells(bool weighted) {
    std::ifstream in(kStatsDir + "/data/pay_by_grade.csv");
    EXPECT_TRUE(in.good()) << "pay_by_grade.csv missing";
    stats::MeanCellBuilder b(6);
    std::string line;
    std::getline(in, line);
    for (std::size_t i = 0; std::getline(in, line); ++i) {
        std::stringstream s(line);
        std::string id, grade, group, salary;
        std::getline(s, id, ',');
        std::getline(s, grade, ',');
        std::getline(s, group, ',');
        std::getline(s, salary, ',');
        b.add(static_cast<std::size_t>(grade[1] - '1'), group == "B", std::stod(salary),
              weighted ? 1.0 + static_cast<double>(i % 3) : 1.0);
    }
    return b.cells();
}

const std::vector<std::vector<std::string>> kGrades = {{"G1"}, {"G2"}, {"G3"}, {"G4"}, {"G5"}, {"G6"}};
const MeanNames kNames{"salary", "B", "A"};

// A cell of n observations with the given mean and SD.
MeanMoments cell(double n, double mean, double sd) { return MeanMoments::from_mean(n, n, mean, sd * sd * (n - 1)); }

void check_pay(bool weighted) {
    const json ref = load_reference()[weighted ? "repeated" : "rows"];
    const MeanFinding f = analyse_mean_strata(pay_cells(weighted), kGrades, {"grade"}, kNames);
    EXPECT_EQ(f.kind, FindingKind::Mean);
    EXPECT_EQ(f.strata, std::vector<std::string>{"grade"});
    EXPECT_EQ(f.label(), "grade");
    EXPECT_EQ(f.cls, FindingClass::Reversal);  // planted: pooled B below A, B above A in every grade
    EXPECT_TRUE(f.reversal());
    EXPECT_TRUE(f.direction_flip);
    EXPECT_FALSE(f.strata_disagree);
    const double p = ref["p_reversal"];
    EXPECT_NEAR(f.p_reversal / p, 1.0, 1e-7) << "p_reversal " << f.p_reversal << " vs " << p;
    EXPECT_EQ(f.q_value, f.p_reversal);
    EXPECT_NEAR(f.crude.difference.estimate, double(ref["crude"]["difference"]["estimate"]), 1e-9 * 2e4);
    EXPECT_NEAR(f.fixed_effects.estimate, double(ref["fixed_effects"]["estimate"]), 1e-9 * 2e3);
    EXPECT_NEAR(f.fixed_effects.se_hc1, double(ref["fixed_effects"]["se_hc1"]), 1e-9 * 3e2);
    EXPECT_NEAR(f.interaction.p, double(ref["interaction"]["p"]), 1e-8);
    EXPECT_NEAR(f.change, std::fabs(f.crude.difference.estimate - f.fixed_effects.estimate), 1e-9);
    // The crude z carries Welch's one-sided tail: [calc] scipy's two-sided p / 2.
    EXPECT_NEAR(stats::normal_sf(std::fabs(f.class_inputs.crude_z)) / (double(ref["crude"]["difference"]["p"]) / 2),
                1.0, 1e-7);
    // One classifier: the stored inputs re-decide the same class.
    EXPECT_EQ(classify(f.class_inputs, f.p_reversal, 0.05), f.cls);

    ASSERT_EQ(f.strata_table.size(), 6u);
    EXPECT_EQ(f.informative_strata, 5u);
    EXPECT_EQ(f.uninformative, std::vector<std::string>{"G6"});
    const MeanStratumRow& g6 = f.strata_table[5];
    EXPECT_FALSE(g6.informative);
    EXPECT_EQ(g6.reason, "no focal rows");
    EXPECT_EQ(g6.focal.n, 0);
    EXPECT_TRUE(std::isnan(g6.difference.estimate));
    double share_focal = 0, share_reference = 0, share = 0;
    for (std::size_t k = 0; k < 6; ++k) {
        const auto& row = f.strata_table[k];
        const json& r = ref["strata"][k];
        EXPECT_EQ(row.level, std::string(r["grade"]));
        EXPECT_NEAR(row.share_focal, double(r["share_focal"]), 1e-15);
        EXPECT_NEAR(row.share_reference, double(r["share_reference"]), 1e-15);
        if (row.informative) {
            EXPECT_GT(row.difference.estimate, 0) << row.level;  // every within-grade gap favours B
            EXPECT_NEAR(row.difference.p, double(r["difference"]["p"]), 1e-7 * double(r["difference"]["p"]));
        }
        share_focal += row.share_focal;
        share_reference += row.share_reference;
        share += row.share;
    }
    EXPECT_NEAR(share_focal, 1.0, 1e-12);
    EXPECT_NEAR(share_reference, 1.0, 1e-12);
    EXPECT_NEAR(share, 1.0, 1e-12);
    EXPECT_NEAR(f.rows_used, double(ref["crude"]["focal"]["n"]) + double(ref["crude"]["reference"]["n"]), 0);
}

}  // namespace

TEST(MeanAnalysis, PlantedPayReversalAgainstScipyAndStatsmodels) { check_pay(false); }

TEST(MeanAnalysis, PreCountedCellsGiveTheFindingOfTheirRows) { check_pay(true); }

TEST(MeanAnalysis, KindNamesItselfMean) {
    EXPECT_EQ(to_string(FindingKind::Mean), "mean");
    EXPECT_EQ(to_string(FindingKind::Rate), "rate");
    EXPECT_EQ(to_string(FindingKind::Slope), "slope");
}

// Two strata with gaps of +2 and −2 (SD 1, 50 per cell, equal mixes): crude gap exactly 0, so no
// reversal; the strata disagree and the interaction F is huge.
TEST(MeanAnalysis, OppositeGapsAreHeterogeneous) {
    MeanCells cells(2);
    cells[0] = {cell(50, 12, 1), cell(50, 10, 1)};
    cells[1] = {cell(50, 8, 1), cell(50, 10, 1)};
    const MeanFinding f = analyse_mean_strata(cells, {{"x"}, {"y"}}, {"site"}, kNames);
    EXPECT_TRUE(f.strata_disagree);
    EXPECT_LT(f.interaction.p, 1e-10);
    EXPECT_EQ(f.cls, FindingClass::Heterogeneous);
}

// Equal means within each stratum (10 and 20) but the focal group mostly in the higher one:
// a clear crude gap that the strata explain (within gap exactly 0).
TEST(MeanAnalysis, MixAloneIsExplained) {
    MeanCells cells(2);
    cells[0] = {cell(20, 10, 1), cell(80, 10, 1)};
    cells[1] = {cell(80, 20, 1), cell(20, 20, 1)};
    const MeanFinding f = analyse_mean_strata(cells, {{"low"}, {"high"}}, {"grade"}, kNames);
    EXPECT_LT(f.crude.difference.p, 1e-10);
    EXPECT_NEAR(f.fixed_effects.estimate, 0, 1e-12);
    EXPECT_EQ(f.cls, FindingClass::Explained);
    EXPECT_NEAR(f.decomposition.within, 0, 1e-12);
}

// A within gap of +1 in both strata with focal mix 60/40 and reference mix 50/50: crude
// 0.6·11 + 0.4·21 − (0.5·10 + 0.5·20) = 0 exactly, so the gap is masked.
TEST(MeanAnalysis, CompositionHidingAGapIsMasked) {
    MeanCells cells(2);
    cells[0] = {cell(60, 11, 1), cell(50, 10, 1)};
    cells[1] = {cell(40, 21, 1), cell(50, 20, 1)};
    const MeanFinding f = analyse_mean_strata(cells, {{"low"}, {"high"}}, {"grade"}, kNames);
    EXPECT_NEAR(f.crude.difference.estimate, 0, 1e-12);
    EXPECT_NEAR(f.fixed_effects.estimate, 1, 1e-12);
    EXPECT_EQ(f.cls, FindingClass::Masked);
}

// No gap anywhere: stable.
TEST(MeanAnalysis, NoGapIsStable) {
    MeanCells cells(2);
    cells[0] = {cell(30, 10, 1), cell(30, 10, 1)};
    cells[1] = {cell(30, 20, 2), cell(30, 20, 2)};
    const MeanFinding f = analyse_mean_strata(cells, {{"low"}, {"high"}}, {"grade"}, kNames);
    EXPECT_EQ(f.cls, FindingClass::Stable);
    EXPECT_FALSE(f.direction_flip);
}

// No cells, or one group only: NaN figures, class stable, never a throw.
TEST(MeanAnalysis, EmptyOrOneGroupIsStable) {
    const MeanFinding none = analyse_mean_strata({}, {}, {"grade"}, kNames);
    EXPECT_EQ(none.cls, FindingClass::Stable);
    EXPECT_TRUE(none.strata_table.empty());
    EXPECT_TRUE(std::isnan(none.crude.difference.estimate));
    EXPECT_TRUE(std::isnan(none.p_reversal) || none.p_reversal == 1.0);

    MeanCells one(2);
    one[0].reference = cell(5, 3, 1);
    const MeanFinding f = analyse_mean_strata(one, {{"a"}}, {"grade"}, kNames);  // a label short
    EXPECT_EQ(f.cls, FindingClass::Stable);
    ASSERT_EQ(f.strata_table.size(), 1u);  // the empty stratum is skipped
    EXPECT_EQ(f.strata_table[0].reason, "no focal rows");
    EXPECT_EQ(f.uninformative, std::vector<std::string>{"a"});
}

// Swapping focal and reference negates every difference and keeps the class and the reversal
// p; reordering the strata changes nothing but the order of the table.
TEST(MeanAnalysis, SwapAndReorderInvariance) {
    const MeanCells cells = pay_cells(false);
    const MeanFinding f = analyse_mean_strata(cells, kGrades, {"grade"}, kNames);
    MeanCells swapped = cells, reordered;
    for (auto& c : swapped) std::swap(c.focal, c.reference);
    std::vector<std::vector<std::string>> labels;
    for (std::size_t k = cells.size(); k-- > 0;) {
        reordered.push_back(cells[k]);
        labels.push_back(kGrades[k]);
    }
    const MeanFinding s = analyse_mean_strata(swapped, kGrades, {"grade"}, MeanNames{"salary", "A", "B"});
    const MeanFinding r = analyse_mean_strata(reordered, labels, {"grade"}, kNames);
    EXPECT_EQ(s.cls, f.cls);
    EXPECT_EQ(r.cls, f.cls);
    EXPECT_NEAR(s.p_reversal / f.p_reversal, 1.0, 1e-9);
    EXPECT_NEAR(r.p_reversal / f.p_reversal, 1.0, 1e-9);
    EXPECT_NEAR(s.crude.difference.estimate, -f.crude.difference.estimate, 1e-9);
    EXPECT_NEAR(s.fixed_effects.estimate, -f.fixed_effects.estimate, 1e-9);
    EXPECT_NEAR(s.fixed_effects.se_hc1, f.fixed_effects.se_hc1, 1e-9);
    EXPECT_NEAR(s.standardised.estimate, -f.standardised.estimate, 1e-9);
    EXPECT_NEAR(s.decomposition.within, -f.decomposition.within, 1e-9);
    EXPECT_NEAR(s.interaction.f, f.interaction.f, 1e-9);
    EXPECT_NEAR(r.fixed_effects.estimate, f.fixed_effects.estimate, 1e-9);
    EXPECT_NEAR(r.cochran_q.q, f.cochran_q.q, 1e-9);
    EXPECT_NEAR(r.decomposition.composition, f.decomposition.composition, 1e-8);
    EXPECT_EQ(s.uninformative, std::vector<std::string>{"G6"});
    EXPECT_EQ(s.strata_table[5].reason, "no reference rows");
    EXPECT_EQ(r.strata_table[0].level, "G6");
}
