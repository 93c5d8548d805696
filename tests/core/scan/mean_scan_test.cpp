// Tests of core/scan/mean_scan.h: the mean-gap scan over a table.
//
// The pay review (tests/core/stats/data/pay_by_grade.csv, invented) against
// tests/core/stats/mean_gap_reference.json ([calc] scipy 1.10.x / statsmodels 0.13.x, written by
// tests/reference/mean_gap_reference.py): the scan's figures equal statsmodels' OLS with grade
// dummies (coefficient, classical and HC1 SEs) and scipy's Welch test, from rows and from the
// same rows pre-counted. Medians against the textbook definition (the middle value, or the mean
// of the two middle ones), computed here with std::sort.
#include "core/scan/mean_scan.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <map>
#include <sstream>

#include "core/io/csv_reader.h"
#include "core/scan/scan_result.h"

using namespace foldline;
using nlohmann::json;

namespace {

const std::string kStatsDir = std::string(FOLDLINE_SOURCE_DIR) + "/tests/core/stats";

json reference() {
    std::ifstream in(kStatsDir + "/mean_gap_reference.json");
    EXPECT_TRUE(in.good());
    return json::parse(in);
}

std::string pay_text(bool counted) {
    std::ifstream in(kStatsDir + "/data/pay_by_grade.csv");
    std::string line, out;
    std::getline(in, line);
    out = counted ? line + ",count\n" : line + "\n";
    for (std::size_t i = 0; std::getline(in, line); ++i)
        out += counted ? line + "," + std::to_string(1 + i % 3) + "\n" : line + "\n";
    return out;
}

Table read(const std::string& text) {
    CsvOptions o;
    if (text.find(",count\n") != std::string::npos) o.count_column = "count";
    auto t = read_csv_text(text, "pay.csv", o);
    EXPECT_TRUE(t) << (t ? "" : t.error().message);
    return std::move(*t);
}

MeanQuestion pay_question() {
    MeanQuestion q;
    q.outcome = "salary";
    q.groups.exposure = "group";
    q.groups.focal = {"B"};
    q.groups.reference = "A";
    q.pairs = false;
    return q;
}

CandidateSet grade_only(const Table& t) {
    CandidateOptions o;
    o.columns = {"grade"};
    auto c = select_candidates(t, {"salary", "group"}, o);
    EXPECT_TRUE(c);
    return std::move(*c);
}

void expect_rel(double got, double want, double tol = 1e-9) {
    EXPECT_NEAR(got, want, tol * std::max(1.0, std::fabs(want))) << "want " << want;
}

void expect_matches(const MeanFinding& f, const json& ref) {
    expect_rel(f.crude.difference.estimate, ref["crude"]["difference"]["estimate"]);
    expect_rel(f.crude.difference.se, ref["crude"]["difference"]["se"]);
    expect_rel(f.crude.difference.df, ref["crude"]["difference"]["df"]);
    expect_rel(f.crude.difference.p, ref["crude"]["difference"]["p"], 1e-7);
    const auto& fe = ref["fixed_effects"];
    expect_rel(f.fixed_effects.estimate, fe["estimate"]);
    expect_rel(f.fixed_effects.se, fe["se"]);
    expect_rel(f.fixed_effects.se_hc1, fe["se_hc1"]);
    expect_rel(f.fixed_effects.df, fe["df"]);
    expect_rel(f.p_reversal, ref["p_reversal"], 1e-7);
}

}  // namespace

TEST(MeanScan, RowsMatchStatsmodelsAndScipy) {
    const Table t = read(pay_text(false));
    auto s = scan_means(t, pay_question(), grade_only(t));
    ASSERT_TRUE(s) << s.error().message;
    ASSERT_EQ(s->findings.size(), 1u);
    const auto& f = s->findings[0];
    EXPECT_EQ(f.kind, FindingKind::Mean);
    EXPECT_EQ(f.focal, "B");
    EXPECT_EQ(f.reference, "A");
    expect_matches(f, reference()["rows"]);
}

TEST(MeanScan, PrecountedRowsGiveTheRepeatedRowsFigures) {
    const Table t = read(pay_text(true));
    ASSERT_TRUE(t.weighted());
    auto s = scan_means(t, pay_question(), grade_only(t));
    ASSERT_TRUE(s) << s.error().message;
    expect_matches(s->findings.at(0), reference()["repeated"]);
}

TEST(MeanScan, PayGapMediansAndThreshold) {
    const Table t = read(pay_text(false));
    MeanQuestion q = pay_question();
    q.pay_gap = true;
    auto s = scan_means(t, q, grade_only(t));
    ASSERT_TRUE(s) << s.error().message;
    const auto& g = s->findings.at(0).pay_gap;
    ASSERT_TRUE(g.computed);
    // Textbook medians per (grade, group) and per group, from the rows.
    std::map<std::pair<std::string, std::string>, std::vector<double>> by;
    std::ifstream in(kStatsDir + "/data/pay_by_grade.csv");
    std::string line;
    std::getline(in, line);
    while (std::getline(in, line)) {
        std::stringstream ss(line);
        std::string id, grade, group, salary;
        std::getline(ss, id, ',');
        std::getline(ss, grade, ',');
        std::getline(ss, group, ',');
        std::getline(ss, salary, ',');
        by[{grade, group}].push_back(std::stod(salary));
        by[{"", group}].push_back(std::stod(salary));
    }
    auto median = [](std::vector<double> v) {
        if (v.empty()) return std::nan("");
        std::sort(v.begin(), v.end());
        const std::size_t n = v.size();
        return n % 2 ? v[n / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
    };
    EXPECT_DOUBLE_EQ(g.median_focal, median(by[{"", "B"}]));
    EXPECT_DOUBLE_EQ(g.median_reference, median(by[{"", "A"}]));
    const auto ref = reference()["rows"]["crude"];
    const double mf = ref["focal"]["mean"], mr = ref["reference"]["mean"];
    expect_rel(g.mean_gap_percent, (mr - mf) / mr * 100);
    ASSERT_FALSE(g.strata.empty());
    for (const auto& st : g.strata) {
        const double mf_k = median(by[{st.level, "B"}]), mr_k = median(by[{st.level, "A"}]);
        if (std::isnan(mf_k)) EXPECT_TRUE(std::isnan(st.median_focal)) << st.level;
        else EXPECT_DOUBLE_EQ(st.median_focal, mf_k) << st.level;
        if (std::isnan(mr_k)) EXPECT_TRUE(std::isnan(st.median_reference)) << st.level;
        else EXPECT_DOUBLE_EQ(st.median_reference, mr_k) << st.level;
        EXPECT_EQ(st.reaches_threshold, std::fabs(st.mean_gap_percent) >= 5) << st.level;
    }
}

TEST(MeanScan, GapPercentAtTheThreshold) {
    EXPECT_DOUBLE_EQ(gap_percent(95, 100), 5.0);
    EXPECT_DOUBLE_EQ(gap_percent(110, 100), -10.0);
    EXPECT_TRUE(std::isnan(gap_percent(1, 0)));
    stats::MeanCells cells(2);
    cells[0].focal.add(95);
    cells[0].reference.add(100);
    cells[1].focal.add(96);
    cells[1].reference.add(100);
    const PayGap g = pay_gap(cells, {"a", "b"}, {95, 96}, {100, 100}, 95.5, 100);
    ASSERT_EQ(g.flagged.size(), 1u);
    EXPECT_EQ(g.flagged[0], "a");
}

TEST(MeanScan, LogOutcomeRefusesNonPositiveNamingTheRow) {
    const Table t = read("g,s,y\nA,x,10\nB,x,12\nA,y,0\nB,y,-4\n");
    MeanQuestion q;
    q.outcome = "y";
    q.groups.exposure = "g";
    q.groups.focal = {"B"};
    q.groups.reference = "A";
    q.log_outcome = true;
    auto s = check_mean_question(t, q);
    ASSERT_FALSE(s);
    EXPECT_NE(s.error().message.find("data row 3"), std::string::npos) << s.error().message;
    EXPECT_NE(s.error().message.find("'y'"), std::string::npos) << s.error().message;
}

TEST(MeanScan, LogOutcomeFiguresAreOfLogValuesWithPercentages) {
    const Table t = read(pay_text(false));
    MeanQuestion q = pay_question();
    q.log_outcome = true;
    auto s = scan_means(t, q, grade_only(t));
    ASSERT_TRUE(s) << s.error().message;
    const auto& f = s->findings.at(0);
    EXPECT_TRUE(f.log_outcome);
    // The crude difference is the difference of the groups' mean log salaries.
    stats::MeanMoments a, b;
    const Column& y = *t.column("salary");
    const Column& g = *t.column("group");
    for (std::size_t i = 0; i < t.rows; ++i) (g.levels[g.code(i)] == "B" ? b : a).add(std::log(y.values[i]));
    expect_rel(f.crude.difference.estimate, b.mean() - a.mean(), 1e-12);
    expect_rel(f.crude_percent.estimate, std::expm1(f.crude.difference.estimate), 1e-12);
    expect_rel(f.fixed_effects_percent.ci_low, std::expm1(f.fixed_effects.robust.ci_low), 1e-12);
}

TEST(MeanScan, PairsAndEveryFocalGroup) {
    // Three groups (A reference, B and C focal), two stratifiers: 2 singles + 1 pair, 2 each.
    std::string text = "g,s1,s2,y\n";
    const char* groups[] = {"A", "A", "B", "C"};
    for (int i = 0; i < 80; ++i)
        text += std::string(groups[i % 4]) + "," + (i % 3 ? "x" : "y") + "," + (i % 5 ? "u" : "v") + "," +
                std::to_string(100 + (i * 37) % 23) + "\n";
    const Table t = read(text);
    MeanQuestion q;
    q.outcome = "y";
    q.groups.exposure = "g";
    auto c = select_candidates(t, {"y", "g"}, CandidateOptions{});
    ASSERT_TRUE(c);
    ASSERT_EQ(c->candidates.size(), 2u);
    auto s = scan_means(t, q, *c);
    ASSERT_TRUE(s) << s.error().message;
    EXPECT_EQ(s->groups.reference, "A");
    ASSERT_EQ(s->findings.size(), 6u);
    EXPECT_EQ(s->findings[4].strata.size(), 2u);
    EXPECT_EQ(s->findings[0].focal, "B");
    EXPECT_EQ(s->findings[1].focal, "C");
}

TEST(MeanScan, OutcomeMustBeNumeric) {
    const Table t = read("g,s,y\nA,x,a\nB,x,b\n");
    MeanQuestion q;
    q.outcome = "y";
    q.groups.exposure = "g";
    auto s = check_mean_question(t, q);
    ASSERT_FALSE(s);
    EXPECT_NE(s.error().message.find("not numeric"), std::string::npos);
}

TEST(MeanScan, EValueOfTheStandardisedDifference) {
    // VanderWeele & Ding 2017 conversion, by hand: RR = exp(0.91 d).
    const auto e = stats::e_value_smd(0.5, 0.1);
    EXPECT_NEAR(e.rr, std::exp(0.455), 1e-12);
    EXPECT_NEAR(e.rr_ci.lo, std::exp(0.91 * (0.5 - 1.959963984540054 * 0.1)), 1e-9);
    EXPECT_NEAR(e.e.estimate, e.rr + std::sqrt(e.rr * (e.rr - 1)), 1e-12);
}

TEST(MeanScan, OneFalseDiscoveryFamilyWithTheOtherKinds) {
    // Benjamini & Hochberg (1995) step-up by hand over p = 0.01, 0.04 (mean) and 0.03 (slope):
    // sorted 0.01, 0.03, 0.04 -> q = min(3 x 0.01 / 1, ...) = 0.03, then 0.04, 0.04.
    ScanResult r;
    r.mean_findings.resize(2);
    r.mean_findings[0].p_reversal = 0.01;
    r.mean_findings[1].p_reversal = 0.04;
    r.slope_findings.resize(1);
    r.slope_findings[0].p_reversal = 0.03;
    apply_fdr(r);
    EXPECT_NEAR(r.mean_findings[0].q_value, 0.03, 1e-12);
    EXPECT_NEAR(r.mean_findings[1].q_value, 0.04, 1e-12);
    EXPECT_NEAR(r.slope_findings[0].q_value, 0.04, 1e-12);
}

namespace {

// Means and SDs of every stratum × group cell by the two-pass textbook formula (mean first, then
// Σ (y − mean)² / (n − 1)) in long double: the reference for the scan's one-pass cell sums.
struct TwoPass {
    std::map<std::string, std::vector<long double>> cells;
    void add(const std::string& key, double y) { cells[key].push_back(y); }
    std::pair<long double, long double> mean_sd(const std::string& key) const {
        const auto& v = cells.at(key);
        long double m = 0;
        for (auto y : v) m += y;
        m /= v.size();
        long double ss = 0;
        for (auto y : v) ss += (y - m) * (y - m);
        return {m, v.size() > 1 ? std::sqrt(ss / (v.size() - 1)) : NAN};
    }
};

// Rows with values near `level` (strata `spread` apart) and a unit spread within cells, two
// stratifiers; with `constant`, the first level of s2 constant within each cell (an SD of 0).
void check_against_two_pass(double level, double spread, bool constant) {
    std::string text = "g,s1,s2,y\n";
    TwoPass ref;
    for (int i = 0; i < 6000; ++i) {
        const std::string g = i % 2 ? "B" : "A", s1 = std::string(1, 'a') + char('0' + i % 3), s2 = std::string(1, 'b') + char('0' + i % 5);
        const double y = constant && s2 == "b0" ? level + 7 * (i % 3) : level + spread * (i % 3) + ((i * 7919) % 1000) / 500.0 - 1;
        char buf[64];
        std::snprintf(buf, sizeof buf, "%.17g", y);
        text += g + "," + s1 + "," + s2 + "," + buf + "\n";
        const double back = std::strtod(buf, nullptr);
        ref.add(g + "|" + s1, back);
        ref.add(g + "|" + s2, back);
        ref.add(g + "|" + s1 + " | " + s2, back);
    }
    const Table t = read(text);
    MeanQuestion q;
    q.outcome = "y";
    q.groups.exposure = "g";
    q.groups.focal = {"B"};
    q.groups.reference = "A";
    auto c = select_candidates(t, {"y", "g"}, CandidateOptions{});
    ASSERT_TRUE(c);
    auto s = scan_means(t, q, *c);
    ASSERT_TRUE(s) << s.error().message;
    ASSERT_EQ(s->findings.size(), 3u);
    std::size_t compared = 0;
    for (const auto& f : s->findings)
        for (const auto& r : f.strata_table) {
            for (const auto& [g, gm] : {std::pair{std::string("B"), r.focal}, std::pair{std::string("A"), r.reference}}) {
                const auto [m, sd] = ref.mean_sd(g + "|" + r.level);
                EXPECT_NEAR(gm.mean, static_cast<double>(m), 1e-9 * std::fabs(static_cast<double>(m))) << r.level;
                if (sd == 0) EXPECT_EQ(gm.sd, 0.0) << r.level;
                else EXPECT_NEAR(gm.sd, static_cast<double>(sd), 1e-9 * static_cast<double>(sd)) << g << " " << r.level;
                ++compared;
            }
        }
    EXPECT_EQ(compared, 2u * (3 + 5 + 15));
}

}  // namespace

// Cells whose values are all equal are summed again about their first value: SD exactly 0.
TEST(MeanScan, CellSumsMatchTwoPassNearAMillion) { check_against_two_pass(1e6, 3, true); }

TEST(MeanScan, CellSumsMatchTwoPassWhenStrataLieFarApart) {
    // Strata 1e8 apart at 1e9 with a unit spread within cells: a cell's origin (its parent's
    // mean) lies far from its own mean.
    check_against_two_pass(1e9, 1e8, false);
}
