// Exact conditional inference on 2 x 2 x K tables and Zelen's exact homogeneity test against
// golden values from R's stats package (mantelhaen.test(exact = TRUE), fisher.test) and a
// brute-force R enumeration of Zelen's test: tests/core/stats/data/exact_stratified_golden.txt,
// written by tests/reference/exact_stratified_golden.R (cases: R's rabbits example, R's
// UCBAdmissions, statsmodels' five-stratum test table, R's tea-tasting and convictions examples,
// and random small tables).
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <limits>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "core/stats/exact_homogeneity.h"
#include "core/stats/exact_stratified.h"

using namespace foldline::stats;

namespace {

struct Fisher {
    std::size_t k;
    double p, est, lo, hi;
};

struct Case {
    std::string name;
    Strata strata;
    double p2 = 0, pg = 0, pl = 0, est = 0, lo = 0, hi = 0;
    std::vector<Fisher> fisher;
    double zelen_p = 0, zelen_tables = 0;
};

double num(const std::string& s) {
    if (s == "Inf") return std::numeric_limits<double>::infinity();
    if (s == "NaN") return std::numeric_limits<double>::quiet_NaN();
    return std::stod(s);
}

std::vector<Case> load() {
    std::ifstream in(std::string(FOLDLINE_TEST_DATA_DIR) + "/data/exact_stratified_golden.txt");
    std::vector<Case> cases;
    std::string line;
    while (std::getline(in, line)) {
        std::istringstream ss(line);
        std::string tag;
        ss >> tag;
        std::vector<std::string> f;
        for (std::string w; ss >> w;) f.push_back(w);
        if (tag == "case") {
            Case c;
            c.name = f[0];
            const std::size_t K = std::stoul(f[1]);
            for (std::size_t k = 0; k < K; ++k)
                c.strata.push_back({num(f[2 + 4 * k]), num(f[3 + 4 * k]), num(f[4 + 4 * k]), num(f[5 + 4 * k])});
            cases.push_back(c);
        } else if (tag == "exact") {
            auto& c = cases.back();
            c.p2 = num(f[0]), c.pg = num(f[1]), c.pl = num(f[2]), c.est = num(f[3]), c.lo = num(f[4]), c.hi = num(f[5]);
        } else if (tag == "fisher") {
            cases.back().fisher.push_back({std::stoul(f[0]), num(f[1]), num(f[2]), num(f[3]), num(f[4])});
        } else if (tag == "zelen") {
            cases.back().zelen_p = num(f[0]), cases.back().zelen_tables = num(f[1]);
        }
    }
    return cases;
}

void expect_p(double ours, double r, const std::string& what) {
    EXPECT_NEAR(ours, r, 1e-9 * std::max(r, 1e-12) + 1e-15) << what;
}

// R finds the MLE and the limits with uniroot (tol = .Machine$double.eps^0.25, about 1.2e-4) on
// psi when psi < 1 and on 1 / psi otherwise; compare on that scale, within that tolerance.
void expect_root(double ours, double r, const std::string& what) {
    if (std::isinf(r) || r == 0) {
        EXPECT_EQ(ours, r) << what;
        return;
    }
    const double a = r <= 1 ? ours : 1 / ours, b = r <= 1 ? r : 1 / r;
    EXPECT_NEAR(a, b, 1.5e-4) << what << " ours " << ours << " R " << r;
}

}  // namespace

TEST(ExactStratified, GoldenCasesMatchR) {
    const auto cases = load();
    ASSERT_GE(cases.size(), 60u);
    for (const auto& c : cases) {
        SCOPED_TRACE(c.name);
        const auto e = exact_common_odds_ratio(c.strata);
        ASSERT_EQ(e.status, ExactStatus::Computed);
        expect_p(e.p_two_sided, c.p2, "two-sided p");
        expect_p(e.p_greater, c.pg, "p greater");
        expect_p(e.p_less, c.pl, "p less");
        expect_root(e.estimate, c.est, "conditional MLE");
        expect_root(e.ci.lo, c.lo, "CI low");
        expect_root(e.ci.hi, c.hi, "CI high");
        for (const auto& f : c.fisher) {
            const auto fe = fisher_exact(c.strata[f.k]);
            ASSERT_EQ(fe.status, ExactStatus::Computed);
            expect_p(fe.p_two_sided, f.p, "Fisher p, stratum " + std::to_string(f.k));
            expect_root(fe.estimate, f.est, "Fisher MLE");
            expect_root(fe.ci.lo, f.lo, "Fisher CI low");
            expect_root(fe.ci.hi, f.hi, "Fisher CI high");
        }
        const auto z = zelen_exact(c.strata);
        if (std::isnan(c.zelen_p) && c.zelen_tables == 0) {
            EXPECT_EQ(z.status, HomogeneityStatus::TooFewStrata);
        } else if (c.zelen_tables > 0) {
            ASSERT_EQ(z.status, HomogeneityStatus::Computed);
            EXPECT_EQ(z.tables, c.zelen_tables);
            expect_p(z.p, c.zelen_p, "Zelen p");
        }
    }
}

// R's help page for mantelhaen.test prints, for the rabbits: S = 16, p-value = 0.03994, common
// odds ratio 10.36102, 95 percent CI 1.077401 529.837399 (the page's printed figures).
TEST(ExactStratified, RabbitsAsPrintedOnRsHelpPage) {
    const Strata rabbits{{0, 6, 0, 5}, {3, 3, 0, 6}, {6, 0, 2, 4}, {5, 1, 6, 0}, {2, 0, 5, 0}};
    const auto e = exact_common_odds_ratio(rabbits);
    EXPECT_EQ(e.s, 16);
    EXPECT_NEAR(e.p_two_sided, 0.03994, 5e-6);
    EXPECT_NEAR(e.estimate, 10.36102, 2e-3);
    EXPECT_NEAR(e.ci.lo, 1.077401, 1e-4);
    EXPECT_NEAR(e.ci.hi, 529.837399, 529.837399 * 0.08);  // R's 1/psi root is within 1.2e-4
    EXPECT_EQ(e.lo, 9);
    EXPECT_EQ(e.hi, 17);
    // Zelen: 3 tables share S; the observed one is the least probable: 300 / 4050 (by hand, from
    // the three varying strata's hypergeometric densities).
    const auto z = zelen_exact(rabbits);
    EXPECT_EQ(z.tables, 3);
    EXPECT_NEAR(z.p, 300.0 / 4050.0, 1e-12);
}

TEST(ExactStratified, LimitsAndWeightsFallBackWithAStatus) {
    const Strata big{{400, 600, 500, 500}, {300, 700, 350, 650}};
    ExactLimits tight;
    tight.max_support = 100;
    const auto e = exact_common_odds_ratio(big, 0.05, tight);
    EXPECT_EQ(e.status, ExactStatus::TooLarge);
    EXPECT_TRUE(std::isnan(e.p_two_sided));
    EXPECT_EQ(e.support, 1551);
    EXPECT_EQ(exact_common_odds_ratio(big).status, ExactStatus::Computed);

    const auto w = exact_common_odds_ratio(Strata{{2.5, 3, 1, 4}, {1, 2, 3, 4}});
    EXPECT_EQ(w.status, ExactStatus::NotWholeCounts);
    EXPECT_EQ(zelen_exact(Strata{{2.5, 3, 1, 4}, {1, 2, 3, 4}}).status, HomogeneityStatus::NotWholeCounts);

    // No stratum lets a vary (zero margins): nothing to test.
    EXPECT_EQ(exact_common_odds_ratio(Strata{{0, 6, 0, 5}, {2, 0, 5, 0}}).status, ExactStatus::NoInformation);
    EXPECT_EQ(zelen_exact(Strata{{0, 6, 0, 5}, {3, 3, 0, 6}}).status, HomogeneityStatus::TooFewStrata);

    // Many tables share S: Zelen's test stops at the limit and says so.
    Strata many;
    for (int k = 0; k < 8; ++k) many.push_back({5, 5, 5, 5});
    const auto z = zelen_exact(many, 1000);
    EXPECT_EQ(z.status, HomogeneityStatus::TooManyTables);
    EXPECT_GT(z.tables, 1000);
    EXPECT_TRUE(std::isnan(z.p));
    // Large strata: even counting the tables is bounded (400 strata of 2,000 rows each).
    Strata wide(400, StratumCounts{600, 400, 500, 500});
    const auto zw = zelen_exact(wide);
    EXPECT_EQ(zw.status, HomogeneityStatus::TooLarge);
    EXPECT_EQ(zw.tables, 0);
    EXPECT_EQ(exact_common_odds_ratio(wide).status, ExactStatus::TooLarge);
    // Two strata of ~2^52 rows (a libFuzzer find): the bound is checked before any density of
    // that width is built, so this returns at once instead of filling memory.
    const double g = 35184372088832.0;  // 2^45
    const auto zg = zelen_exact(Strata{{80 * g, 1 * g, 0, 200 * g}, {35 * g, 0, 200 * g, 35 * g}});
    EXPECT_EQ(zg.status, HomogeneityStatus::TooLarge);
    EXPECT_EQ(exact_common_odds_ratio(Strata{{80 * g, 1 * g, 0, 200 * g}, {35 * g, 0, 200 * g, 35 * g}}).status,
              ExactStatus::TooLarge);
}
