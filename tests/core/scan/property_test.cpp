// Properties every statistic of the rate scan must have, whatever the data:
//   - permuting the rows, renaming stratum levels, or listing the strata in another order
//     changes no figure (each figure is a function of the 2 x 2 x K table of counts, with the
//     strata as an unordered set: Mantel & Haenszel 1959, Greenland & Robins 1985, Breslow &
//     Day 1980 all define their sums over strata without an order);
//   - swapping the focal and the reference group (a <-> c, b <-> d in every stratum) flips the
//     sign of every signed effect (RD, ln OR, ln RR, z) and leaves every two-sided test as is.
// Equalities are exact where the code does the same arithmetic in both cases and within a
// few units in the last place where only the order of a sum changes.
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>
#include <string>
#include <vector>

#include "tests/core/scan/synthetic_table.h"

using namespace foldline;
using namespace foldline::stats;

namespace {

// Relative agreement up to the rounding of a reordered sum.
void expect_close(double x, double y, const std::string& what) {
    if (std::isnan(x) || std::isnan(y)) {
        EXPECT_TRUE(std::isnan(x) && std::isnan(y)) << what << ": " << x << " vs " << y;
        return;
    }
    if (std::isinf(x) || std::isinf(y)) {
        EXPECT_EQ(x, y) << what;
        return;
    }
    EXPECT_NEAR(x, y, 1e-12 * std::max(1.0, std::abs(x))) << what;
}

void expect_same_figures(const RateFinding& x, const RateFinding& y, const std::string& ctx) {
    expect_close(x.crude.rd, y.crude.rd, ctx + " crude RD");
    expect_close(x.crude.z, y.crude.z, ctx + " crude z");
    expect_close(x.crude.odds_ratio, y.crude.odds_ratio, ctx + " crude OR");
    expect_close(x.adjusted.mh_or.estimate, y.adjusted.mh_or.estimate, ctx + " MH OR");
    expect_close(x.adjusted.mh_or.ci.lo, y.adjusted.mh_or.ci.lo, ctx + " MH OR lo");
    expect_close(x.adjusted.mh_or.ci.hi, y.adjusted.mh_or.ci.hi, ctx + " MH OR hi");
    expect_close(x.adjusted.mh_rr.estimate, y.adjusted.mh_rr.estimate, ctx + " MH RR");
    expect_close(x.adjusted.mh_rd.greenland_robins.estimate, y.adjusted.mh_rd.greenland_robins.estimate, ctx + " MH RD");
    expect_close(x.adjusted.mh_rd.greenland_robins.se, y.adjusted.mh_rd.greenland_robins.se, ctx + " MH RD se");
    expect_close(x.adjusted.mh_rd.se_sato, y.adjusted.mh_rd.se_sato, ctx + " Sato se");
    expect_close(x.adjusted.standardized.rd, y.adjusted.standardized.rd, ctx + " standardized RD");
    expect_close(x.cmh.statistic, y.cmh.statistic, ctx + " CMH");
    expect_close(x.cmh.p, y.cmh.p, ctx + " CMH p");
    expect_close(x.breslow_day.statistic, y.breslow_day.statistic, ctx + " Breslow-Day");
    expect_close(x.decomposition.within, y.decomposition.within, ctx + " within part");
    expect_close(x.p_reversal, y.p_reversal, ctx + " reversal p");
    EXPECT_EQ(x.cls, y.cls) << ctx;
    EXPECT_EQ(x.informative_strata, y.informative_strata) << ctx;
}

Strata random_strata(std::mt19937_64& rng, int k) {
    std::uniform_int_distribution<int> cell(0, 40);
    Strata s(static_cast<std::size_t>(k));
    for (auto& t : s) t = {double(cell(rng)), double(cell(rng)), double(cell(rng)), double(cell(rng))};
    return s;
}

RateFinding analyse(const Strata& s, const std::string& prefix) {
    std::vector<std::vector<std::string>> labels;
    for (std::size_t k = 0; k < s.size(); ++k) labels.push_back({prefix + std::to_string(k)});
    return analyse_strata(s, labels, {"stratum"}, 0.05);
}

}  // namespace

TEST(Property, StrataOrderAndLevelNamesChangeNoFigure) {
    std::mt19937_64 rng(2024);
    for (int trial = 0; trial < 300; ++trial) {
        Strata s = random_strata(rng, 2 + trial % 6);
        const RateFinding base = analyse(s, "level_");
        std::shuffle(s.begin(), s.end(), rng);
        const RateFinding shuffled = analyse(s, "renamed ");
        expect_same_figures(base, shuffled, "trial " + std::to_string(trial));
    }
}

TEST(Property, SwappingFocalAndReferenceFlipsEverySignedEffect) {
    std::mt19937_64 rng(77);
    for (int trial = 0; trial < 300; ++trial) {
        const Strata s = random_strata(rng, 2 + trial % 5);
        Strata w = s;
        for (auto& t : w) {
            std::swap(t.a, t.c);
            std::swap(t.b, t.d);
        }
        const RateFinding x = analyse(s, "s"), y = analyse(w, "s");
        const std::string ctx = "trial " + std::to_string(trial);
        // Differences of the same two numbers: exact.
        EXPECT_EQ(x.crude.rd, -y.crude.rd) << ctx;
        EXPECT_EQ(x.crude.rate_focal, y.crude.rate_reference) << ctx;
        // Ratios invert; on the log scale the sign flips (to rounding of the division).
        expect_close(std::log(x.adjusted.mh_or.estimate), -std::log(y.adjusted.mh_or.estimate), ctx + " ln MH OR");
        expect_close(std::log(x.adjusted.mh_rr.estimate), -std::log(y.adjusted.mh_rr.estimate), ctx + " ln MH RR");
        expect_close(std::log(x.crude.odds_ratio), -std::log(y.crude.odds_ratio), ctx + " ln crude OR");
        expect_close(x.adjusted.mh_rd.greenland_robins.estimate, -y.adjusted.mh_rd.greenland_robins.estimate, ctx + " MH RD");
        expect_close(x.adjusted.standardized.rd, -y.adjusted.standardized.rd, ctx + " standardized RD");
        expect_close(x.crude.z, -y.crude.z, ctx + " crude z");
        expect_close(x.cmh.z, -y.cmh.z, ctx + " CMH z");
        expect_close(x.decomposition.crude_gap, -y.decomposition.crude_gap, ctx + " crude gap");
        // Unsigned figures stay.
        expect_close(x.cmh.statistic, y.cmh.statistic, ctx + " CMH");
        expect_close(x.breslow_day.statistic, y.breslow_day.statistic, ctx + " Breslow-Day");
        expect_close(x.adjusted.mh_rd.greenland_robins.se, y.adjusted.mh_rd.greenland_robins.se, ctx + " MH RD se");
        expect_close(x.p_reversal, y.p_reversal, ctx + " reversal p");
        EXPECT_EQ(x.cls, y.cls) << ctx;
    }
}

// The same at the level of a whole scan of a table: rows permuted and stratum levels renamed.
namespace {

Table permuted_and_renamed(const Table& t, std::mt19937_64& rng) {
    std::vector<std::size_t> order(t.rows);
    std::iota(order.begin(), order.end(), 0);
    std::shuffle(order.begin(), order.end(), rng);
    Table out;
    out.rows = t.rows;
    out.source = t.source;
    for (const auto& c : t.columns) {
        std::vector<std::string> levels = c.levels;
        if (c.name != "group" && c.name != "approved")
            for (auto& l : levels) l = "renamed " + l;
        std::vector<std::uint32_t> codes(t.rows);
        for (std::size_t i = 0; i < t.rows; ++i) codes[i] = c.code(order[i]);
        out.columns.push_back(Column::categorical(c.name, levels, codes));
    }
    return out;
}

ScanResult scan(const Table& t) {
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg("group=B,A", s);
    auto q = resolve_question(t, s);
    EXPECT_TRUE(q.ok()) << q.error().to_string();
    auto c = select_candidates(t, {"approved", "group"}, CandidateOptions{}, t.column("group"));
    EXPECT_TRUE(c.ok());
    RateScanOptions o;
    o.bootstrap = 0;
    auto r = rate_scan(t, *q, *c, o);
    EXPECT_TRUE(r.ok());
    return std::move(*r);
}

}  // namespace

TEST(Property, PermutingRowsAndRenamingLevelsChangesNoFinding) {
    std::mt19937_64 rng(31);
    const Table t = foldline::testing::planted_reversal(rng, 4000, 0.05, 2);
    const Table u = permuted_and_renamed(t, rng);
    const ScanResult a = scan(t), b = scan(u);
    ASSERT_EQ(a.rate_findings.size(), b.rate_findings.size());
    ASSERT_FALSE(a.rate_findings.empty());
    bool saw_reversal = false;
    for (const auto& x : a.rate_findings) {
        const RateFinding* y = nullptr;
        for (const auto& f : b.rate_findings)
            if (f.strata == x.strata) y = &f;
        ASSERT_NE(y, nullptr) << x.label();
        expect_same_figures(x, *y, x.label());
        expect_close(x.q_value, y->q_value, x.label() + " q");
        saw_reversal |= x.reversal();
    }
    EXPECT_TRUE(saw_reversal);  // the planted product reversal: the property is not vacuous
}
