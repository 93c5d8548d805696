// Tests of core/scan/mean_stability.h: the resampled stability of mean-gap findings.
//
// Reference: the nonparametric row bootstrap (Efron & Tibshirani 1993, An Introduction to the
// Bootstrap, ch. 6: each group's rows drawn with replacement, here done row by row in the test)
// on normal data, where the normal-theory resample of the cells has the same distribution. The
// two shares must agree within Monte Carlo error (4 binomial standard errors of the difference).
#include "core/scan/mean_stability.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <vector>

#include "core/scan/mean_analysis.h"

using namespace foldline;
using foldline::stats::MeanCellBuilder;

namespace {

struct Row {
    std::size_t stratum;
    bool focal;
    double y;
};

// Two strata: the focal group sits mostly in the high stratum (crude gap positive) and is `gap`
// below the reference within each stratum. Seeded, so every run sees the same rows.
std::vector<Row> two_strata(double gap, int n_per_group, std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    std::normal_distribution<double> noise(0.0, 10.0);
    std::vector<Row> rows;
    for (int g = 0; g < 2; ++g) {
        const bool focal = g == 1;
        for (int i = 0; i < n_per_group; ++i) {
            const bool high = focal ? i % 5 != 0 : i % 5 == 0;  // 80% vs 20% in the high stratum
            const std::size_t k = high ? 1 : 0;
            const double y = (high ? 130.0 : 100.0) - (focal ? gap : 0.0) + noise(rng);
            rows.push_back({k, focal, y});
        }
    }
    return rows;
}

MeanFinding finding_of(const std::vector<Row>& rows) {
    MeanCellBuilder b(2);
    for (const auto& r : rows) b.add(r.stratum, r.focal, r.y);
    return analyse_mean_strata(b.cells(), {{"low"}, {"high"}}, {"band"}, {"score", "F", "R"});
}

// The row bootstrap: each group's rows redrawn with replacement, the class decided as in a scan.
double row_bootstrap_share(const std::vector<Row>& rows, FindingClass cls, int draws, std::uint64_t seed) {
    std::vector<const Row*> by_group[2];
    for (const auto& r : rows) by_group[r.focal ? 1 : 0].push_back(&r);
    std::mt19937_64 rng(seed);
    int hits = 0;
    for (int b = 0; b < draws; ++b) {
        MeanCellBuilder cb(2);
        for (const auto& g : by_group) {
            std::uniform_int_distribution<std::size_t> pick(0, g.size() - 1);
            for (std::size_t i = 0; i < g.size(); ++i) {
                const Row* r = g[pick(rng)];
                cb.add(r->stratum, r->focal, r->y);
            }
        }
        const ClassInputs in = mean_class_inputs(cb.cells());
        if (classify(in, reversal_p(in), 0.05) == cls) ++hits;
    }
    return static_cast<double>(hits) / draws;
}

}  // namespace

TEST(MeanStability, AgreesWithTheRowBootstrapOnABorderlineReversal) {
    const auto rows = two_strata(2.0, 300, 7);
    const MeanFinding f = finding_of(rows);
    ASSERT_EQ(f.cls, FindingClass::Reversal);
    constexpr int kDraws = 2000;
    const double cells = mean_class_stability(f, 0.05, kDraws, 11);
    const double reference = row_bootstrap_share(rows, f.cls, kDraws, 13);
    // Borderline by construction: neither share is near 0 or 1, so the comparison has power.
    EXPECT_GT(reference, 0.2);
    EXPECT_LT(reference, 0.9);
    const double se = std::sqrt(reference * (1 - reference) / kDraws * 2);
    RecordProperty("share_from_cells", std::to_string(cells));
    RecordProperty("share_from_rows", std::to_string(reference));
    EXPECT_NEAR(cells, reference, 4 * se) << "cells " << cells << ", rows " << reference;
}

TEST(MeanStability, AStrongReversalKeepsItsClassAndAnEmptyOneIsUndefined) {
    const MeanFinding f = finding_of(two_strata(8.0, 400, 3));
    ASSERT_EQ(f.cls, FindingClass::Reversal);
    EXPECT_GT(mean_class_stability(f, 0.05, 500, 1), 0.99);
    EXPECT_TRUE(std::isnan(mean_class_stability(f, 0.05, 0, 1)));
    EXPECT_TRUE(std::isnan(mean_class_stability(MeanFinding{}, 0.05, 100, 1)));
}

TEST(MeanStability, SameSeedSameShareAndStratumOrderDoesNotMatter) {
    const MeanFinding f = finding_of(two_strata(2.0, 300, 7));
    const double a = mean_class_stability(f, 0.05, 400, 99);
    EXPECT_EQ(a, mean_class_stability(f, 0.05, 400, 99));
    MeanFinding swapped = f;
    std::swap(swapped.strata_table[0], swapped.strata_table[1]);
    EXPECT_EQ(a, mean_class_stability(swapped, 0.05, 400, 99));
}

TEST(MeanStability, OnlyFlaggedFindingsAreResampledAndAStopLeavesNone) {
    std::vector<MeanFinding> fs{finding_of(two_strata(8.0, 400, 3)), finding_of(two_strata(-5.0, 400, 3))};
    fs[1].cls = FindingClass::Stable;
    ASSERT_TRUE(resample_mean_findings(fs, 0.05, 200, 42, 2));
    EXPECT_TRUE(fs[0].stability.computed());
    EXPECT_EQ(fs[0].stability.draws, 200);
    EXPECT_FALSE(fs[1].stability.computed());

    std::vector<MeanFinding> stopped{finding_of(two_strata(8.0, 400, 3))};
    Work work;
    work.stop.request_stop();
    EXPECT_FALSE(resample_mean_findings(stopped, 0.05, 200, 42, 2, work));
    EXPECT_FALSE(stopped[0].stability.computed());
}
