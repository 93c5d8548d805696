#include "core/scan/families.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <random>

#include "core/scan/rate_scan.h"
#include "tests/core/scan/synthetic_table.h"

using namespace foldline;
using foldline::testing::numbered;
using foldline::testing::TableBuilder;

namespace {

ScanResult scan(const Table& t, const std::string& exposure, std::vector<std::string> skip = {}) {
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg(exposure, s);
    auto q = resolve_question(t, s);
    EXPECT_TRUE(q.ok()) << q.error().to_string();
    skip.insert(skip.end(), {"approved", "group"});
    auto c = select_candidates(t, skip, CandidateOptions{}, t.column("group"));
    EXPECT_TRUE(c.ok());
    RateScanOptions o;
    o.bootstrap = 0;
    auto r = rate_scan(t, *q, *c, o);
    EXPECT_TRUE(r.ok());
    return std::move(*r);
}

const RateFinding* find(const ScanResult& r, const std::vector<std::string>& strata, std::size_t comparison = 0) {
    for (const auto& f : r.rate_findings)
        if (f.strata == strata && f.comparison == comparison) return &f;
    return nullptr;
}

double logistic(double x) { return 1 / (1 + std::exp(-x)); }

// A pair finding built from its strata: levels of S and T, and (pos, n) per group.
struct Cell {
    std::string s, t;
    double pf, nf, pr, nr;
};
RateFinding pair_of(const std::vector<Cell>& cells) {
    stats::Strata st;
    std::vector<std::vector<std::string>> labels;
    for (const auto& c : cells) {
        st.push_back({c.pf, c.nf - c.pf, c.pr, c.nr - c.pr});
        labels.push_back({c.s, c.t});
    }
    return analyse_strata(st, labels, {"S", "T"}, 0.05);
}

}  // namespace

// The test of further stratifying S by T: T adds nothing when every (S, T) stratum has the odds
// ratio of its S level; it adds an effect when T reverses the odds ratio inside S. Expected values
// by construction (odds ratio 2 in every stratum gives a Breslow-Day statistic of 0).
TEST(FurtherStratifying, ZeroWhenTAddsNothingLargeWhenTModifies) {
    // Focal odds 2/8 vs reference 1/9 -> OR 2.25 in every stratum.
    const auto same = pair_of({{"s1", "t1", 20, 100, 10, 100}, {"s1", "t2", 40, 200, 20, 200},
                               {"s2", "t1", 20, 100, 10, 100}, {"s2", "t2", 20, 100, 10, 100}});
    const auto t = further_stratifying(same, 0);
    EXPECT_NEAR(t.statistic, 0, 1e-9);
    EXPECT_EQ(t.df, 2);  // one degree of freedom within each level of S
    EXPECT_NEAR(t.p, 1, 1e-9);
    // Inside s1, T flips the odds ratio (2.25 vs 1/2.25): the test rejects clearly.
    const auto mod = pair_of({{"s1", "t1", 20, 100, 10, 100}, {"s1", "t2", 10, 100, 20, 100},
                              {"s2", "t1", 20, 100, 10, 100}, {"s2", "t2", 20, 100, 10, 100}});
    const auto m = further_stratifying(mod, 0);
    EXPECT_GT(m.statistic, 5);
    EXPECT_LT(m.p, 0.05);
    // Grouped by T instead, the same table is tested within t1 and t2.
    EXPECT_EQ(further_stratifying(mod, 1).df, 2);
}

// Cramér's V of a 2 x 2 table with cells 40, 10 / 10, 40: phi = (40*40 - 10*10) / 50^2 = 0.6
// (the phi coefficient, handbook formula; V = |phi| for 2 x 2).
TEST(StrataAssociation, CramersVAndNesting) {
    const auto f = pair_of({{"a", "x", 10, 20, 10, 20}, {"a", "y", 5, 5, 2, 5}, {"b", "x", 5, 5, 2, 5},
                            {"b", "y", 10, 20, 10, 20}});
    const auto a = association(f);
    EXPECT_NEAR(a.cramers_v, 0.6, 1e-12);
    EXPECT_FALSE(a.nested);
    // S is a function of T (t1, t2 in s1; t3 in s2): nested, S the coarser.
    const auto n = pair_of({{"s1", "t1", 5, 10, 5, 10}, {"s1", "t2", 5, 10, 5, 10}, {"s2", "t3", 5, 10, 5, 10}});
    const auto b = association(n);
    EXPECT_TRUE(b.nested);
    EXPECT_EQ(b.coarser, "S");
}

// The planted reversal (one driver, four noise columns): one flagged family led by product with
// its four pairs as members; ranked lead first, members beneath.
TEST(Families, OneDriverOneFamily) {
    std::mt19937_64 rng(11);
    const auto r = scan(foldline::testing::planted_reversal(rng, 40000, 0.05, 4), "group=B,A");
    ASSERT_EQ(r.families.size(), 1u);
    EXPECT_EQ(r.families[0].lead, "product");
    EXPECT_EQ(r.families[0].cls, FindingClass::Reversal);
    EXPECT_EQ(r.families[0].members.size(), 4u);
    EXPECT_EQ(r.rate_findings[0].label(), "product");
    for (std::size_t i = 1; i <= 4; ++i) {
        EXPECT_EQ(r.rate_findings[i].family.role, FamilyRole::Member) << r.rate_findings[i].label();
        EXPECT_EQ(r.rate_findings[i].family.lead, "product");
        EXPECT_NE(r.rate_findings[i].family.reason.find("adds nothing beyond product"), std::string::npos);
    }
}

// Two independent drivers: product drives B's gap, region drives C's (logistic model, constant
// odds ratio, so neither pair adds anything). Expected by construction: two families.
TEST(Families, TwoDriversTwoFamilies) {
    std::mt19937_64 rng(5);
    std::uniform_real_distribution<double> u(0, 1);
    TableBuilder b({"group", "approved", "product", "region", "noise"});
    const double skewed[3] = {0.1, 0.3, 0.6}, even[3] = {0.6, 0.3, 0.1}, effect[3] = {1.4, 0, -1.4};
    auto draw = [&](const double* mix) {
        const double x = u(rng);
        return x < mix[0] ? 0 : x < mix[0] + mix[1] ? 1 : 2;
    };
    for (int i = 0; i < 60000; ++i) {
        const int g = static_cast<int>(u(rng) * 3);  // 0 = A, 1 = B, 2 = C
        const int p = draw(g == 1 ? skewed : even);
        const int reg = draw(g == 2 ? skewed : even);
        const double rate = logistic(-0.5 + effect[p] + effect[reg] + (g ? 0.3 : 0));
        b.add_row({g == 0 ? "A" : g == 1 ? "B" : "C", u(rng) < rate ? "1" : "0", numbered("P", p),
                   numbered("R", reg), numbered("N", static_cast<int>(u(rng) * 3))});
    }
    const auto r = scan(b.build(), "group=,A");
    ASSERT_EQ(r.question.focal.size(), 2u);
    const std::size_t b_at = r.question.focal[0] == "B" ? 0 : 1;
    ASSERT_EQ(r.families.size(), 2u);
    EXPECT_EQ(r.families[0].lead == "product" ? r.families[1].lead : r.families[0].lead, "region");
    for (const auto& fam : r.families) {
        EXPECT_EQ(fam.cls, FindingClass::Reversal);
        EXPECT_EQ(fam.members.size(), 2u) << fam.lead;  // with the other driver and with noise
    }
    EXPECT_EQ(find(r, {"product", "region"}, b_at)->family.lead, "product");
    EXPECT_EQ(find(r, {"product", "region"}, 1 - b_at)->family.lead, "region");
}

// A pair that adds a real second effect: inside product, channel reverses the gap for one level
// (odds-ratio modification). The pair must not be folded into product's family.
TEST(Families, PairWithASecondEffectIsNotAMember) {
    std::mt19937_64 rng(7);
    std::uniform_real_distribution<double> u(0, 1);
    TableBuilder b({"group", "approved", "product", "channel"});
    const double mix_a[3] = {0.6, 0.3, 0.1}, mix_b[3] = {0.1, 0.3, 0.6}, effect[3] = {1.4, 0, -1.4};
    for (int i = 0; i < 60000; ++i) {
        const bool is_b = u(rng) < 0.5;
        const double x = u(rng);
        const double* mix = is_b ? mix_b : mix_a;
        const int p = x < mix[0] ? 0 : x < mix[0] + mix[1] ? 1 : 2;
        const int ch = u(rng) < 0.5;
        const double lift = is_b ? (ch ? 0.9 : 0.1) : 0.0;
        const double rate = logistic(-0.3 + effect[p] + lift);
        b.add_row({is_b ? "B" : "A", u(rng) < rate ? "1" : "0", numbered("P", p), ch ? "web" : "branch"});
    }
    const auto r = scan(b.build(), "group=B,A");
    const auto* prod = find(r, {"product"});
    const auto* pair = find(r, {"product", "channel"});
    ASSERT_NE(prod, nullptr);
    ASSERT_NE(pair, nullptr);
    ASSERT_NE(prod->cls, FindingClass::Stable);
    ASSERT_NE(pair->cls, FindingClass::Stable);
    EXPECT_EQ(pair->family.role, FamilyRole::Lead);
    EXPECT_NE(pair->family.reason.find("adds to product"), std::string::npos) << pair->family.reason;
    EXPECT_GE(r.families.size(), 2u);
}

// A banded copy of a numeric column: score (numeric, cut into quartiles by the scan) and
// score_band, the same values in three bands, on which the rate depends. Both are flagged; one is named the
// proxy of the other, and the pair score × score_band is a member of their family.
TEST(Families, BandedCopyIsAProxy) {
    std::mt19937_64 rng(3);
    std::uniform_real_distribution<double> u(0, 1);
    TableBuilder b({"group", "approved", "score_band"});
    std::vector<double> score;
    const double effect[3] = {-1.4, 0, 1.4};
    for (int i = 0; i < 40000; ++i) {
        const bool is_b = u(rng) < 0.5;
        const double x = is_b ? u(rng) * u(rng) : 1 - u(rng) * u(rng);  // B skewed low
        const double s = 300 + 550 * x;
        const int band = s < 500 ? 0 : s < 700 ? 1 : 2;
        const double rate = logistic(effect[band] + (is_b ? 0.3 : 0));
        score.push_back(s);
        b.add_row({is_b ? "B" : "A", u(rng) < rate ? "1" : "0", band == 0 ? "low" : band == 1 ? "middle" : "high"});
    }
    Table t = b.build();
    t.columns.push_back(Column::numeric("score", score));
    const auto r = scan(t, "group=B,A");
    const auto* band = find(r, {"score_band"});
    const auto* num = find(r, {"score"});
    ASSERT_NE(band, nullptr);
    ASSERT_NE(num, nullptr);
    ASSERT_NE(band->cls, FindingClass::Stable);
    ASSERT_NE(num->cls, FindingClass::Stable);
    const bool band_is_proxy = band->family.role == FamilyRole::Proxy;
    const RateFinding* proxy = band_is_proxy ? band : num;
    const RateFinding* lead = band_is_proxy ? num : band;
    EXPECT_EQ(proxy->family.role, FamilyRole::Proxy);
    EXPECT_EQ(proxy->family.lead, lead->label());
    EXPECT_EQ(lead->family.role, FamilyRole::Lead);
    EXPECT_NE(proxy->family.reason.find("proxy of"), std::string::npos) << proxy->family.reason;
    ASSERT_FALSE(r.families.empty());
    EXPECT_EQ(r.families[0].proxies, std::vector<std::string>{proxy->label()});
}
