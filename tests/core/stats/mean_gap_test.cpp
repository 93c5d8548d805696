// Tests of core/stats/mean_gap.h.
//
// Reference values: tests/core/stats/mean_gap_reference.json, written by
// tests/reference/mean_gap_reference.py ([calc] scipy 1.10.x ttest_ind(equal_var=False) and
// t.ppf; statsmodels 0.13.x OLS y ~ g + C(grade) with classical and HC1 SEs, anova_lm of the
// interaction, combine_effects for Cochran's Q; numpy for the standardised difference and the
// decomposition) on the invented pay review tests/core/stats/data/pay_by_grade.csv. ctest
// re-derives the golden file (reference_mean_gap). The accuracy test at 1e9 ± 1 uses the
// two-pass reference of Chan, Golub & LeVeque (1983, Am. Stat. 37:242) in long double, as
// tests/core/stats/moments_test.cpp does.
#include "core/stats/mean_gap.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <iostream>
#include <map>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "core/stats/distributions.h"

using namespace foldline;
using namespace foldline::stats;
using nlohmann::json;

namespace {

// Largest relative deviation from the reference seen by `close` in this run (printed at the end).
double g_max_deviation = 0;
std::string g_max_where;

// |actual − expected| <= tol · max(|expected|, floor); records the relative deviation.
void close(double actual, double expected, double tol, const std::string& where, double floor = 1e-300) {
    const double scale = std::max(std::fabs(expected), floor);
    const double dev = std::fabs(actual - expected) / scale;
    if (dev > g_max_deviation) {
        g_max_deviation = dev;
        g_max_where = where;
    }
    EXPECT_LE(dev, tol) << where << ": got " << actual << ", reference " << expected;
}

struct Row {
    std::string grade;
    bool focal;
    double salary;
};

std::vector<Row> read_pay() {
    std::ifstream in(std::string(FOLDLINE_TEST_DATA_DIR) + "/data/pay_by_grade.csv");
    EXPECT_TRUE(in.good()) << "pay_by_grade.csv missing";
    std::vector<Row> rows;
    std::string line;
    std::getline(in, line);  // header: employee,grade,group,salary
    while (std::getline(in, line)) {
        std::stringstream s(line);
        std::string id, grade, group, salary;
        std::getline(s, id, ',');
        std::getline(s, grade, ',');
        std::getline(s, group, ',');
        std::getline(s, salary, ',');
        rows.push_back({grade, group == "B", std::stod(salary)});
    }
    EXPECT_EQ(rows.size(), 320u);
    return rows;
}

json load_reference() {
    std::ifstream in(std::string(FOLDLINE_TEST_DATA_DIR) + "/mean_gap_reference.json");
    EXPECT_TRUE(in.good()) << "mean_gap_reference.json missing";
    return json::parse(in);
}

std::size_t grade_code(const std::string& g) { return static_cast<std::size_t>(g[1] - '1'); }  // G1..G6

// The three variants of the reference script: "rows", "near_1e6", "repeated" (row i counted
// 1 + i % 3 times, here as one weighted row).
MeanCells cells_of(const std::vector<Row>& rows, const std::string& variant) {
    MeanCellBuilder b(6);
    for (std::size_t i = 0; i < rows.size(); ++i) {
        const Row& r = rows[i];
        double y = r.salary, w = 1;
        if (variant == "near_1e6") y = 1e6 + (r.salary - 50000.0) / 8000.0;
        if (variant == "repeated") w = 1.0 + static_cast<double>(i % 3);
        b.add(grade_code(r.grade), r.focal, y, w);
    }
    return b.cells();
}

void check_estimate(const GapEstimate& e, const json& r, const std::string& where, bool welch) {
    close(e.estimate, r["estimate"], 1e-9, where + ".estimate");
    close(e.se, r["se"], 1e-9, where + ".se");
    if (welch) {
        close(e.df, r["df"], 1e-9, where + ".df");
        close(e.stat, r["t"], 1e-9, where + ".t");
    }
    // scipy's t quantile is about 1e-9 off at small df (DEVELOPERS.md): limits to 1e-8.
    close(e.ci_low, r["ci"][0], 1e-8, where + ".ci_low", std::fabs(double(r["estimate"])));
    close(e.ci_high, r["ci"][1], 1e-8, where + ".ci_high", std::fabs(double(r["estimate"])));
    close(e.p, r["p"], 1e-7, where + ".p");
}

// Means of the near-1e6 variant are compared after taking 1e6 off both (absolute 1e-9).
void check_mean(double actual, double expected, const std::string& variant, const std::string& where) {
    if (variant == "near_1e6")
        close(actual - 1e6, expected - 1e6, 1e-9, where, 1.0);
    else
        close(actual, expected, 1e-12, where);
}

void check_variant(const std::string& variant) {
    const json ref = load_reference()[variant];
    const MeanCells cells = cells_of(read_pay(), variant);
    const std::string v = variant + ".";

    const CrudeMeans c = crude_means(cells);
    for (const auto& [name, g] : {std::pair{"focal", c.focal}, std::pair{"reference", c.reference}}) {
        const json& r = ref["crude"][name];
        close(g.n, r["n"], 1e-15, v + name + ".n");
        check_mean(g.mean, r["mean"], variant, v + name + ".mean");
        close(g.sd, r["sd"], 1e-9, v + name + ".sd");
        check_mean(g.ci_low, r["ci"][0], variant, v + name + ".ci_low");
        check_mean(g.ci_high, r["ci"][1], variant, v + name + ".ci_high");
    }
    check_estimate(c.difference, ref["crude"]["difference"], v + "crude.difference", true);
    if (variant != "near_1e6") close(c.ratio, ref["crude"]["ratio"], 1e-12, v + "crude.ratio");

    for (std::size_t k = 0; k < cells.size(); ++k) {
        const json& r = ref["strata"][k];
        const auto& cell = cells[k];
        const std::string where = v + std::string(r["grade"]);
        close(cell.focal.w, r["n_focal"], 0, where + ".n_focal", 1);
        close(cell.reference.w, r["n_reference"], 0, where + ".n_reference", 1);
        EXPECT_EQ(cell.informative(), bool(r["informative"])) << where;
        if (!cell.informative()) continue;
        check_mean(cell.focal.mean(), r["mean_focal"], variant, where + ".mean_focal");
        check_mean(cell.reference.mean(), r["mean_reference"], variant, where + ".mean_reference");
        close(std::sqrt(cell.focal.variance()), r["sd_focal"], 1e-9, where + ".sd_focal");
        close(std::sqrt(cell.reference.variance()), r["sd_reference"], 1e-9, where + ".sd_reference");
        check_estimate(welch_difference(cell.focal, cell.reference), r["difference"], where + ".difference", true);
    }

    const FixedEffectsGap fe = fixed_effects_difference(cells);
    const json& rf = ref["fixed_effects"];
    close(fe.estimate, rf["estimate"], 1e-9, v + "fe.estimate");
    close(fe.se, rf["se"], 1e-9, v + "fe.se");
    close(fe.se_hc1, rf["se_hc1"], 1e-9, v + "fe.se_hc1");
    close(fe.df, rf["df"], 1e-15, v + "fe.df");
    close(fe.rss, rf["rss"], 1e-9, v + "fe.rss");
    close(fe.classical.ci_low, rf["ci"][0], 1e-8, v + "fe.ci_low");
    close(fe.classical.ci_high, rf["ci"][1], 1e-8, v + "fe.ci_high");
    close(fe.classical.p, rf["p"], 1e-7, v + "fe.p");
    close(fe.robust.ci_low, rf["ci_hc1"][0], 1e-8, v + "fe.ci_hc1_low");
    close(fe.robust.ci_high, rf["ci_hc1"][1], 1e-8, v + "fe.ci_hc1_high");
    close(fe.robust.p, rf["p_hc1"], 1e-7, v + "fe.p_hc1");
    EXPECT_EQ(fe.strata, 5u);

    const GapEstimate ds = standardised_difference(cells);
    const json& rd = ref["standardised"];
    close(ds.estimate, rd["estimate"], 1e-9, v + "ds.estimate");
    close(ds.se, rd["se"], 1e-9, v + "ds.se");
    close(ds.ci_low, rd["ci"][0], 1e-9, v + "ds.ci_low");
    close(ds.ci_high, rd["ci"][1], 1e-9, v + "ds.ci_high");
    close(ds.p, rd["p"], 1e-7, v + "ds.p");

    const InteractionTest it = interaction_f_test(cells);
    close(it.f, ref["interaction"]["f"], 1e-9, v + "interaction.f");
    close(it.df1, ref["interaction"]["df1"], 0, v + "interaction.df1", 1);
    close(it.df2, ref["interaction"]["df2"], 0, v + "interaction.df2", 1);
    close(it.p, ref["interaction"]["p"], 1e-8, v + "interaction.p");

    const CochranQ q = cochran_q(cells);
    close(q.q, ref["cochran_q"]["q"], 1e-9, v + "q");
    close(q.df, ref["cochran_q"]["df"], 0, v + "q.df", 1);
    close(q.p, ref["cochran_q"]["p"], 1e-8, v + "q.p");
    close(q.pooled, ref["cochran_q"]["pooled"], 1e-9, v + "q.pooled");
    close(q.i_squared, ref["cochran_q"]["i_squared"], 1e-9, v + "q.i_squared");

    const Decomposition dc = decompose_crude_mean_gap(cells);
    close(dc.crude_gap, ref["decomposition"]["crude_gap"], 1e-9, v + "decomposition.crude_gap");
    close(dc.within, ref["decomposition"]["within"], 1e-9, v + "decomposition.within");
    close(dc.composition, ref["decomposition"]["composition"], 1e-9, v + "decomposition.composition");
    // The split is exact: the parts add up to the crude gap (up to rounding of the sums).
    EXPECT_NEAR(dc.within + dc.composition, dc.crude_gap, 1e-12 * std::fabs(dc.composition));
    std::cout << variant << ": largest relative deviation from the reference so far " << g_max_deviation << " ("
              << g_max_where << ")\n";
}

}  // namespace

// Every figure of the invented pay review against scipy / statsmodels (see the file header).
TEST(MeanGap, PayReviewAgreesWithScipyAndStatsmodels) { check_variant("rows"); }

// Values near 1e6 with a spread of a few units: differences, SEs and tests to 1e-9 relative of
// the reference computed on the exactly shifted values. Raw sums (Σy² near 3e14 against centred
// sums near 1e3) would keep only about four significant digits of the centred sums.
TEST(MeanGap, ValuesNearOneMillionKeepTheirDigits) { check_variant("near_1e6"); }

// Pre-counted cells (row i with weight 1 + i % 3) against the reference on the rows they stand
// for (each row repeated that often).
TEST(MeanGap, WeightedCellsEqualTheRowsTheyStandFor) {
    check_variant("repeated");
    // And inside the library: the weighted cells equal cells of the repeated rows.
    const auto rows = read_pay();
    MeanCellBuilder expanded(6);
    for (std::size_t i = 0; i < rows.size(); ++i)
        for (std::size_t c = 0; c < 1 + i % 3; ++c) expanded.add(grade_code(rows[i].grade), rows[i].focal, rows[i].salary);
    const MeanCells weighted = cells_of(rows, "repeated");
    const FixedEffectsGap a = fixed_effects_difference(weighted), b = fixed_effects_difference(expanded.cells());
    EXPECT_NEAR(a.estimate, b.estimate, 1e-12 * std::fabs(b.estimate));
    EXPECT_NEAR(a.se_hc1, b.se_hc1, 1e-12 * b.se_hc1);
    EXPECT_NEAR(interaction_f_test(weighted).f, interaction_f_test(expanded.cells()).f, 1e-10);
}

// Values around 1e9 with a spread of about 1: the weighted update and the merge of parts agree
// with the two-pass reference to 1e-9 relative (as moments_test demands of the slope moments).
TEST(MeanGap, HugeOffsetSmallSpreadAgreesWithTwoPass) {
    std::mt19937_64 rng(29);
    std::normal_distribution<double> noise(0.0, 1.0);
    std::vector<double> y;
    for (int i = 0; i < 200000; ++i) y.push_back(1e9 + noise(rng));
    long double mean = 0;
    for (double v : y) mean += v;
    mean /= y.size();
    long double css = 0;
    for (double v : y) css += (v - mean) * (v - mean);

    MeanMoments one;
    for (double v : y) one.add(v);
    EXPECT_NEAR((one.mean() - double(mean)) / 1.0, 0.0, 1e-9 * 1.0);  // mean to 1e-9 of the spread
    EXPECT_NEAR(one.css / double(css), 1.0, 1e-9);

    MeanMoments parts[3];
    for (std::size_t i = 0; i < y.size(); ++i) parts[i % 3].add(y[i]);
    MeanMoments merged;
    for (const auto& p : parts) merged.merge(p);
    EXPECT_NEAR(merged.mean() - double(mean), 0.0, 1e-9);
    EXPECT_NEAR(merged.css / double(css), 1.0, 1e-9);
    EXPECT_EQ(merged.rows, 200000);

    // Weighted: each value twice by weight 2 equals the values twice.
    MeanMoments weighted, doubled;
    for (std::size_t i = 0; i < 1000; ++i) {
        weighted.add(y[i], 2.0);
        doubled.add(y[i]);
        doubled.add(y[i]);
    }
    EXPECT_NEAR(weighted.mean() - doubled.mean(), 0.0, 1e-9);
    EXPECT_NEAR(weighted.css / doubled.css, 1.0, 1e-12);
    EXPECT_EQ(weighted.w, 2000);
}

// Cochran's Q on a tiny table checked by hand: differences d = (1, 2, 4) with Welch variances
// v = (1, 1, 0.25), weights (1, 1, 4): pooled = (1 + 2 + 16) / 6 = 19/6,
// Q = (13/6)² + (7/6)² + 4 (5/6)² = 318/36 [hand calculation]; df 2, p = exp(−Q/2) (the
// chi-square(2) tail [handbook formula]).
TEST(MeanGap, CochranQOfATinyTableByHand) {
    // Cells of two observations each: variance = css, so v = (css1 + css0) / 2.
    MeanCells cells(3);
    cells[0] = {MeanMoments::from_mean(2, 2, 11, 1), MeanMoments::from_mean(2, 2, 10, 1)};
    cells[1] = {MeanMoments::from_mean(2, 2, 12, 1), MeanMoments::from_mean(2, 2, 10, 1)};
    cells[2] = {MeanMoments::from_mean(2, 2, 14, 0.25), MeanMoments::from_mean(2, 2, 10, 0.25)};
    const CochranQ q = cochran_q(cells);
    EXPECT_NEAR(q.pooled, 19.0 / 6, 1e-14);
    EXPECT_NEAR(q.q, 318.0 / 36, 1e-13);
    EXPECT_EQ(q.df, 2);
    EXPECT_NEAR(q.p, std::exp(-q.q / 2), 1e-14);
    EXPECT_EQ(q.strata, 3u);
}

// t → z keeps the one-sided tail: [calc] scipy 1.10.1 stats.norm.isf(stats.t.sf(2.5, 7)) =
// 2.043608705405894 and stats.norm.isf(stats.t.sf(1.3, 3.5)) = 1.0971051806664638.
TEST(MeanGap, TToZKeepsTheTail) {
    EXPECT_NEAR(t_to_z(2.5, 7), 2.043608705405894, 1e-9);
    EXPECT_NEAR(t_to_z(-1.3, 3.5), -1.0971051806664638, 1e-9);
    EXPECT_EQ(t_to_z(0.0, 5), 0.0);
    EXPECT_TRUE(std::isnan(t_to_z(NAN, 5)));
    EXPECT_TRUE(std::isnan(t_to_z(1.0, 0)));
    EXPECT_NEAR(t_to_z(1e10, 3), 11.455560687258581, 1e-6);  // [calc] scipy 1.10.1 norm.isf(t.sf(1e10, 3))
    EXPECT_EQ(t_to_z(1e10, 50), INFINITY);   // a tail near 1e-500 underflows
}

// Empty, one-group and single-observation cells: NaN figures, never a throw.
TEST(MeanGap, DegenerateCellsGiveNaN) {
    const MeanCells none;
    EXPECT_TRUE(std::isnan(crude_means(none).difference.estimate));
    EXPECT_TRUE(std::isnan(fixed_effects_difference(none).estimate));
    EXPECT_TRUE(std::isnan(standardised_difference(none).estimate));
    EXPECT_TRUE(std::isnan(interaction_f_test(none).f));
    EXPECT_TRUE(std::isnan(cochran_q(none).q));
    EXPECT_TRUE(std::isnan(decompose_crude_mean_gap(none).crude_gap));

    MeanCells one_group(2);
    one_group[0].focal.add(3);
    one_group[1].focal.add(5);
    EXPECT_TRUE(std::isnan(crude_means(one_group).difference.estimate));
    EXPECT_TRUE(std::isnan(fixed_effects_difference(one_group).estimate));
    EXPECT_TRUE(std::isnan(decompose_crude_mean_gap(one_group).within));

    MeanCells singles(1);
    singles[0].focal.add(3);
    singles[0].reference.add(1);
    const GapEstimate w = welch_difference(singles[0].focal, singles[0].reference);
    EXPECT_EQ(w.estimate, 2);
    EXPECT_TRUE(std::isnan(w.se));
    const FixedEffectsGap fe = fixed_effects_difference(singles);
    EXPECT_EQ(fe.estimate, 2);
    EXPECT_TRUE(std::isnan(fe.se));  // N − K − 1 = 0
    EXPECT_TRUE(std::isnan(standardised_difference(singles).se));

    MeanMoments m;
    m.add(NAN);
    m.add(1, 0);
    m.add(1, -1);
    m.add(INFINITY);
    EXPECT_TRUE(m.empty());
    EXPECT_TRUE(std::isnan(m.mean()));
    EXPECT_TRUE(std::isnan(group_mean(m).mean));

    // Equal values in both groups: zero spread gives SE 0 and undefined tests.
    MeanCells flat(1);
    for (int i = 0; i < 3; ++i) {
        flat[0].focal.add(7);
        flat[0].reference.add(7);
    }
    const GapEstimate wf = welch_difference(flat[0].focal, flat[0].reference);
    EXPECT_EQ(wf.estimate, 0);
    EXPECT_EQ(wf.se, 0);
    EXPECT_TRUE(std::isnan(wf.p));
}
