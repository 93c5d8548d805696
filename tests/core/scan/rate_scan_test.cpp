#include "core/scan/rate_scan.h"

#include <gtest/gtest.h>

#include <atomic>
#include <cmath>
#include <cstdio>
#include <random>

#include "tests/core/scan/synthetic_table.h"

using namespace foldline;
using foldline::testing::numbered;

namespace {

struct Prepared {
    Table table;
    Question question;
    CandidateSet candidates;
};

Prepared prepare(Table t, const std::string& exposure = "group=B,A") {
    Prepared p{std::move(t), {}, {}};
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg(exposure, s);
    auto q = resolve_question(p.table, s);
    EXPECT_TRUE(q.ok()) << q.error().to_string();
    p.question = *q;
    auto c = select_candidates(p.table, {"approved", "group"}, CandidateOptions{},
                               p.table.column("group"));
    EXPECT_TRUE(c.ok());
    p.candidates = std::move(*c);
    return p;
}

const RateFinding* find(const ScanResult& r, const std::vector<std::string>& strata) {
    for (const auto& f : r.rate_findings)
        if (f.strata == strata) return &f;
    return nullptr;
}

}  // namespace

// Planted Simpson's reversal (invented lender): B behind overall, 5 points ahead within each
// product. Expected by construction: product and every pair containing it reverse; noise does not.
TEST(RateScan, FindsPlantedReversalAndOnlyIt) {
    std::mt19937_64 rng(11);
    auto p = prepare(foldline::testing::planted_reversal(rng, 40000, 0.05, 4));
    RateScanOptions o;
    o.bootstrap = 200;
    auto r = rate_scan(p.table, p.question, p.candidates, o);
    ASSERT_TRUE(r.ok());
    ASSERT_EQ(r->rate_findings.size(), 5u + 10u);  // 5 singles + 10 pairs
    const auto* prod = find(*r, {"product"});
    ASSERT_NE(prod, nullptr);
    EXPECT_EQ(prod->cls, FindingClass::Reversal);
    EXPECT_LT(prod->crude.rd, 0);
    EXPECT_GT(prod->adjusted.mh_rd.greenland_robins.estimate, 0);
    EXPECT_GT(prod->adjusted.standardized.rd, 0);
    EXPECT_GT(prod->stability.share, 0.9);
    EXPECT_NEAR(prod->decomposition.within + prod->decomposition.composition, prod->crude.rd, 1e-12);
    EXPECT_EQ(r->rate_findings.front().cls, FindingClass::Reversal);  // ranked first
    int reversals = 0;
    for (const auto& f : r->rate_findings) {
        const bool has_product = std::find(f.strata.begin(), f.strata.end(), "product") != f.strata.end();
        EXPECT_EQ(f.reversal(), has_product) << f.label();
        reversals += f.reversal();
        if (!has_product) {
            EXPECT_TRUE(std::isnan(f.stability.share) || f.cls != FindingClass::Stable);
        }
    }
    EXPECT_EQ(reversals, 5);

    // Crude figures recomputed straight from the rows.
    double nb = 0, pb = 0, na = 0, pa = 0;
    const Column& g = *p.table.column("group");
    const Column& y = *p.table.column("approved");
    for (std::size_t i = 0; i < p.table.rows; ++i) {
        const bool b = g.levels[g.code(i)] == "B", pos = y.levels[y.code(i)] == "1";
        (b ? nb : na) += 1;
        (b ? pb : pa) += pos;
    }
    EXPECT_DOUBLE_EQ(prod->crude.rate_focal, pb / nb);
    EXPECT_DOUBLE_EQ(prod->crude.rate_reference, pa / na);
    ASSERT_EQ(prod->strata_table.size(), 3u);
    double sum_share = 0;
    for (const auto& row : prod->strata_table) {
        EXPECT_TRUE(row.informative);
        EXPECT_GT(row.rd, 0);
        EXPECT_LT(row.rd_ci.lo, row.rd);
        sum_share += row.share;
    }
    EXPECT_NEAR(sum_share, 1.0, 1e-12);
}

// A pre-counted table and the rows it was counted from give identical findings.
TEST(RateScan, PrecountedEqualsRowLevel) {
    std::mt19937_64 rng(5);
    Table rows = foldline::testing::planted_reversal(rng, 6000, 0.05, 3);
    Table counted = foldline::testing::precount(rows);
    ASSERT_LT(counted.rows, rows.rows);
    auto a = prepare(std::move(rows));
    auto b = prepare(std::move(counted));
    RateScanOptions o;
    o.bootstrap = 100;
    auto ra = rate_scan(a.table, a.question, a.candidates, o);
    auto rb = rate_scan(b.table, b.question, b.candidates, o);
    ASSERT_TRUE(ra.ok() && rb.ok());
    ASSERT_EQ(ra->rate_findings.size(), rb->rate_findings.size());
    for (std::size_t i = 0; i < ra->rate_findings.size(); ++i) {
        const auto& x = ra->rate_findings[i];
        const auto* y = find(*rb, x.strata);
        ASSERT_NE(y, nullptr) << x.label();
        EXPECT_EQ(x.cls, y->cls);
        EXPECT_DOUBLE_EQ(x.crude.rd, y->crude.rd);
        EXPECT_NEAR(x.adjusted.mh_or.estimate, y->adjusted.mh_or.estimate, 1e-12);
        EXPECT_NEAR(x.cmh.statistic, y->cmh.statistic, 1e-9);
        EXPECT_NEAR(x.q_value, y->q_value, 1e-12);
        // Same cube, same seed: the same stability (NaN for unflagged findings on both sides).
        EXPECT_TRUE(x.stability.share == y->stability.share || (std::isnan(x.stability.share) && std::isnan(y->stability.share)))
            << x.label() << " " << x.stability.share << " vs " << y->stability.share;
        ASSERT_EQ(x.strata_table.size(), y->strata_table.size());
    }
}

TEST(RateScan, CallbackProgressAndCancel) {
    std::mt19937_64 rng(9);
    auto p = prepare(foldline::testing::planted_reversal(rng, 5000, 0.05, 5));
    std::atomic<int> emitted{0};
    double last_done = 0, last_total = 0;
    Work w;
    w.progress = [&](double d, double t, const char*) {
        last_done = d;
        last_total = t;
    };
    RateScanOptions o;
    o.bootstrap = 0;
    auto r = rate_scan(p.table, p.question, p.candidates, o, w, [&](const RateFinding&) { ++emitted; });
    ASSERT_TRUE(r.ok());
    EXPECT_EQ(emitted.load(), 6 + 15);
    EXPECT_EQ(r->rate_findings.size(), 21u);
    EXPECT_FALSE(r->cancelled);
    EXPECT_EQ(last_done, last_total);

    Work stop;
    stop.stop.request_stop();
    auto c = rate_scan(p.table, p.question, p.candidates, o, stop);
    ASSERT_TRUE(c.ok());
    EXPECT_TRUE(c->cancelled);
    EXPECT_TRUE(c->rate_findings.empty());
}

TEST(RateScan, StabilityDeterministicForASeed) {
    std::mt19937_64 rng(21);
    auto p = prepare(foldline::testing::planted_reversal(rng, 2500, 0.06, 1));
    RateScanOptions o;
    o.bootstrap = 300;
    o.seed = 77;
    auto r1 = rate_scan(p.table, p.question, p.candidates, o);
    o.threads = 1;
    auto r2 = rate_scan(p.table, p.question, p.candidates, o);
    ASSERT_TRUE(r1.ok() && r2.ok());
    for (std::size_t i = 0; i < r1->rate_findings.size(); ++i) {
        const auto& a = r1->rate_findings[i];
        EXPECT_EQ(a.strata, r2->rate_findings[i].strata);
        if (!std::isnan(a.stability.share)) {
            EXPECT_EQ(a.stability.share, r2->rate_findings[i].stability.share);
        }
    }
}

TEST(RateScan, MoreThanTwoGroupsGiveOneComparisonEach) {
    foldline::testing::TableBuilder b({"group", "approved", "site"});
    for (int i = 0; i < 300; ++i) {
        const char* g = i % 3 == 0 ? "A" : i % 3 == 1 ? "B" : "C";
        b.add_row({g, (i * 7) % 5 < 2 ? "1" : "0", i % 4 < 2 ? "x" : "y"});
    }
    b.add_row({"A", "1", "x"});  // A most frequent: the reference
    auto p = prepare(b.build(), "group");
    EXPECT_EQ(p.question.focal.size(), 2u);
    auto r = rate_scan(p.table, p.question, p.candidates, RateScanOptions{});
    ASSERT_TRUE(r.ok());
    ASSERT_EQ(r->rate_findings.size(), 2u);
    EXPECT_NE(r->rate_findings[0].focal, r->rate_findings[1].focal);
    EXPECT_EQ(r->rate_findings[0].reference, "A");
}

TEST(RateScan, UninformativeStrataListedNotDropped) {
    foldline::testing::TableBuilder b({"group", "approved", "site"});
    for (int i = 0; i < 200; ++i) b.add_row({i % 2 ? "B" : "A", i % 3 ? "1" : "0", (i / 2) % 2 ? "x" : "y"});
    for (int i = 0; i < 7; ++i) b.add_row({"B", "1", "only_b"});
    auto p = prepare(b.build());
    auto r = rate_scan(p.table, p.question, p.candidates, RateScanOptions{});
    ASSERT_TRUE(r.ok());
    const auto& f = r->rate_findings.at(0);
    ASSERT_EQ(f.uninformative.size(), 1u);
    EXPECT_EQ(f.uninformative[0], "only_b");
    EXPECT_EQ(f.informative_strata, 2u);
    bool seen = false;
    for (const auto& row : f.strata_table)
        if (row.level == "only_b") {
            seen = true;
            EXPECT_FALSE(row.informative);
            EXPECT_EQ(row.reason, "no reference rows");
        }
    EXPECT_TRUE(seen);
    EXPECT_NEAR(f.crude.n_focal, 107, 0);
}

// Simulation of the error rates (the reversal rule's contract). Null: a confounder fully
// explains the crude gap (adjusted effect exactly 0), plus noise stratifiers, so every reversal
// flag is false; the share of replicates with any flag (= their false discovery proportion)
// must stay at or below the nominal FDR 0.05 (plus Monte-Carlo slack: 3 binomial SDs at 200
// replicates = 0.046). Power: planted reversals of moderate size (3 products, 6-point lift,
// 2000 rows) are found in most replicates.
TEST(RateScan, SimulatedFalseReversalRateAndPower) {
    std::mt19937_64 rng(2026);
    std::uniform_real_distribution<double> u(0, 1);
    const int reps = 200;
    int null_flagged = 0;
    for (int rep = 0; rep < reps; ++rep) {
        foldline::testing::TableBuilder b({"group", "approved", "conf", "n1", "n2", "n3", "n4"});
        for (int i = 0; i < 1500; ++i) {
            const bool is_b = u(rng) < 0.5;
            const bool z = u(rng) < (is_b ? 0.7 : 0.3);
            const double rate = z ? 0.6 : 0.2;  // no group effect within strata
            b.add_row({is_b ? "B" : "A", u(rng) < rate ? "1" : "0", z ? "z1" : "z0",
                       numbered("a", static_cast<int>(u(rng) * 2)),
                       numbered("b", static_cast<int>(u(rng) * 3)),
                       numbered("c", static_cast<int>(u(rng) * 4)),
                       numbered("d", static_cast<int>(u(rng) * 5))});
        }
        auto p = prepare(b.build());
        RateScanOptions o;
        o.bootstrap = 0;
        auto r = rate_scan(p.table, p.question, p.candidates, o);
        ASSERT_TRUE(r.ok());
        int flags = 0;
        for (const auto& f : r->rate_findings) flags += f.reversal();
        null_flagged += flags > 0;
    }
    const double false_share = static_cast<double>(null_flagged) / reps;
    std::printf("simulated false reversal share (null, FDR 0.05): %.3f over %d replicates\n", false_share, reps);
    EXPECT_LE(false_share, 0.05 + 0.046);

    int found = 0;
    double fdp_sum = 0;
    for (int rep = 0; rep < reps; ++rep) {
        auto p = prepare(foldline::testing::planted_reversal(rng, 2000, 0.06, 3));
        RateScanOptions o;
        o.bootstrap = 0;
        auto r = rate_scan(p.table, p.question, p.candidates, o);
        ASSERT_TRUE(r.ok());
        int flags = 0, wrong = 0;
        for (const auto& f : r->rate_findings) {
            if (!f.reversal()) continue;
            ++flags;
            wrong += std::find(f.strata.begin(), f.strata.end(), "product") == f.strata.end();
            if (f.strata == std::vector<std::string>{"product"}) ++found;
        }
        fdp_sum += flags ? static_cast<double>(wrong) / flags : 0.0;
    }
    const double power = static_cast<double>(found) / reps;
    std::printf("simulated power on planted reversals (3 strata, +6 points, 2000 rows): %.3f; mean FDP %.3f\n",
                power, fdp_sum / reps);
    EXPECT_GE(power, 0.5);
    EXPECT_LE(fdp_sum / reps, 0.05 + 0.046);
}
