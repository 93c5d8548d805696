// Tests of core/scan/slope_scan.h. Each check names its source: open datasets shipped by Debian
// packages with values from the project's reference notes (shared/reference/methods.md) ([src] located in a publication
// or R's documentation, [calc] recomputed with R / statsmodels), and planted synthetic data.
#include "core/scan/slope_scan.h"

#include "core/io/csv_reader.h"
#include "core/scan/candidates.h"
#include "core/scan/scan_result.h"

#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <map>
#include <random>
#include <sstream>

using namespace foldline;

namespace {

Table load(const std::string& path, const std::map<std::string, ColumnType>& types = {}) {
    CsvOptions o;
    o.type_overrides = types;
    auto t = read_csv(path, o, nullptr);
    EXPECT_TRUE(t.ok()) << (t.ok() ? "" : t.error().to_string());
    return t.ok() ? std::move(t.value()) : Table{};
}

const SlopeGroup& group(const SlopeFinding& f, const std::string& level) {
    for (const auto& g : f.groups)
        if (g.level == level) return g;
    ADD_FAILURE() << "no group " << level;
    return f.groups.front();
}

// Planted data: `strata` groups whose centres move along (cx, cy); within each group y = b x.
Table planted(int per_group, std::vector<double> cx, std::vector<double> cy, std::vector<double> b,
              double noise, std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    std::normal_distribution<double> n01(0, 1);
    std::vector<double> x, y;
    std::vector<std::uint32_t> g, other;
    std::vector<std::string> levels;
    for (std::size_t k = 0; k < cx.size(); ++k) {
        levels.push_back("g" + std::to_string(k));
        for (int i = 0; i < per_group; ++i) {
            const double u = n01(rng);
            x.push_back(cx[k] + u);
            y.push_back(cy[k] + b[k] * u + noise * n01(rng));
            g.push_back(static_cast<std::uint32_t>(k));
            other.push_back(static_cast<std::uint32_t>(rng() % 3));
        }
    }
    Table t;
    t.rows = x.size();
    t.columns.push_back(Column::numeric("x", x));
    t.columns.push_back(Column::numeric("y", y));
    t.columns.push_back(Column::categorical("g", levels, g));
    t.columns.push_back(Column::categorical("noise", {"a", "b", "c"}, other));
    return t;
}

}  // namespace

// Fisher's iris data as shipped in Debian's python3-sklearn. Expected values from methods.md:
// pooled r −0.1175698 (p 0.1519, not significant) [src]; setosa r 0.7425467 [src]; versicolor
// 0.5259107, virginica 0.4572278 [calc]; slopes of width on length pooled −0.0618848, setosa
// 0.7985283, versicolor 0.3197193, virginica 0.2318905, species fixed effects 0.3498801 [calc].
TEST(SlopeScan, IrisSepalWidthOnLengthReversesWithinSpecies) {
    const std::string path = "/usr/lib/python3/dist-packages/sklearn/datasets/data/iris.csv";
    if (!std::ifstream(path).good()) GTEST_SKIP() << path << " not installed (python3-sklearn)";
    // The file's header line is "150,4,setosa,versicolor,virginica" (row count, column count,
    // class names), so the columns carry those names: "150" sepal length, "4" sepal width,
    // "virginica" the species code 0/1/2.
    Table t = load(path, {{"virginica", ColumnType::Categorical}});
    ASSERT_EQ(t.rows, 150u);
    SlopeQuestion q;
    q.x = "150";
    q.y = "4";
    auto r = check_slope(t, q, {t.column("virginica")});
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    const SlopeFinding& f = *r;
    EXPECT_NEAR(f.pooled.slope, -0.0618848, 5e-8);
    EXPECT_NEAR(f.pooled.r, -0.1175698, 5e-8);
    EXPECT_NEAR(f.pooled.p, 0.1519, 5e-5);
    EXPECT_EQ(f.pooled.n, 150);
    EXPECT_NEAR(f.within.slope, 0.3498801, 5e-8);
    // The sklearn file codes species 0, 1, 2 = setosa, versicolor, virginica.
    EXPECT_NEAR(group(f, "0").slope, 0.7985283, 5e-8);
    EXPECT_NEAR(group(f, "0").r, 0.7425467, 5e-8);
    EXPECT_NEAR(group(f, "1").slope, 0.3197193, 5e-8);
    EXPECT_NEAR(group(f, "1").r, 0.5259107, 5e-8);
    EXPECT_NEAR(group(f, "2").slope, 0.2318905, 5e-8);
    EXPECT_NEAR(group(f, "2").r, 0.4572278, 5e-8);
    // The pooled slope is not significant, the within one is: by our rules "masked", and the
    // intersection-union p is the pooled one-sided p (about 0.076), not a reversal at 0.05.
    EXPECT_EQ(f.cls, FindingClass::Masked);
    EXPECT_FALSE(f.reversal);
    EXPECT_NEAR(f.p_reversal, 0.1519 / 2, 1e-4);
    EXPECT_TRUE(f.uninformative.empty());
}

// Palmer penguins as shipped in Debian's r-cran-palmerpenguins (344 rows, 342 with both bill
// measures). methods.md: pooled r −0.2350529, CI −0.3328072 to −0.1323004 (R cor.test) [src];
// within Adelie r 0.3914917 (n 151), Chinstrap 0.6535362 (68), Gentoo 0.6433839 (123) [src];
// slopes of depth on length pooled −0.08502128, Adelie 0.1788343, Chinstrap 0.2222117, Gentoo
// 0.2048443, within 0.1998943 [calc].
TEST(SlopeScan, PenguinsBillDepthOnLengthIsAReversal) {
    const std::string path = "/usr/lib/R/site-library/palmerpenguins/extdata/penguins.csv";
    if (!std::ifstream(path).good()) GTEST_SKIP() << path << " not installed (r-cran-palmerpenguins)";
    Table t = load(path);
    ASSERT_EQ(t.rows, 344u);
    SlopeQuestion q;
    q.x = "bill_length_mm";
    q.y = "bill_depth_mm";
    auto r = check_slope(t, q, {t.column("species")});
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    const SlopeFinding& f = *r;
    EXPECT_EQ(f.n, 342);
    EXPECT_NEAR(f.pooled.r, -0.2350529, 5e-8);
    EXPECT_NEAR(f.pooled.r_ci_low, -0.3328072, 5e-8);
    EXPECT_NEAR(f.pooled.r_ci_high, -0.1323004, 5e-8);
    EXPECT_NEAR(f.pooled.slope, -0.08502128, 5e-9);
    EXPECT_NEAR(f.within.slope, 0.1998943, 5e-8);
    EXPECT_NEAR(group(f, "Adelie").r, 0.3914917, 5e-8);
    EXPECT_EQ(group(f, "Adelie").n, 151);
    EXPECT_NEAR(group(f, "Adelie").slope, 0.1788343, 5e-8);
    EXPECT_NEAR(group(f, "Chinstrap").r, 0.6535362, 5e-8);
    EXPECT_EQ(group(f, "Chinstrap").n, 68);
    EXPECT_NEAR(group(f, "Chinstrap").slope, 0.2222117, 5e-8);
    EXPECT_NEAR(group(f, "Gentoo").r, 0.6433839, 5e-8);
    EXPECT_EQ(group(f, "Gentoo").n, 123);
    EXPECT_NEAR(group(f, "Gentoo").slope, 0.2048443, 5e-8);
    EXPECT_EQ(f.cls, FindingClass::Reversal);
    EXPECT_TRUE(f.reversal);
    EXPECT_LT(f.p_reversal, 1e-4);

    // By island, with sex as a second stratifier: the pair has a "(missing)" sex stratum.
    auto pair = check_slope(t, q, {t.column("island"), t.column("sex")});
    ASSERT_TRUE(pair.ok());
    bool saw_missing = false;
    for (const auto& g : pair->groups) {
        EXPECT_EQ(g.levels.size(), 2u);
        saw_missing = saw_missing || g.levels[1] == "(missing)";
    }
    EXPECT_TRUE(saw_missing);
    EXPECT_EQ(pair->n, 342);  // the same rows as the single check: missing cells form a stratum
    EXPECT_DOUBLE_EQ(pair->pooled.slope, f.pooled.slope);
}

// The committed sample file: sample_data/generate_retail.py plants a positive pooled slope of
// weekly_sales on promo_spend and a negative one within every store_format (its own check
// prints +21.5657 pooled, −3.7186 to −4.3224 within).
TEST(SlopeScan, RetailSampleHasItsPlantedReversal) {
    const std::string path = std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/retail_weeks.csv";
    Table t = load(path);
    ASSERT_EQ(t.rows, 5000u);
    SlopeQuestion q;
    q.x = "promo_spend";
    q.y = "weekly_sales";
    auto r = scan_slopes(t, q, {t.column("store_format"), t.column("region"), t.column("quarter")}, true);
    ASSERT_TRUE(r.ok());
    ASSERT_EQ(r->size(), 6u);
    const SlopeFinding& f = r->front();
    EXPECT_NEAR(f.pooled.slope, 21.5657, 1e-4);
    EXPECT_EQ(f.cls, FindingClass::Reversal);
    for (const auto& g : f.groups) EXPECT_LT(g.ci_high, 0) << g.level;
    EXPECT_NEAR(group(f, "mall").slope, -3.7186, 1e-4);
    EXPECT_EQ((*r)[1].cls, FindingClass::Stable);  // region: noise

    // Through the scan's own candidate selection (footfall is cut into quantile bins), FDR and
    // ranking: store_format and every pair holding it are reversals and rank first.
    auto cands = select_candidates(t, {q.x, q.y}, CandidateOptions{});
    ASSERT_TRUE(cands.ok());
    ASSERT_EQ(cands->candidates.size(), 4u);
    auto found = scan_slopes(t, q, *cands, true);
    ASSERT_TRUE(found.ok());
    ASSERT_EQ(found->size(), 10u);
    ScanResult scanned;
    scanned.alpha = q.alpha;
    scanned.slope_findings = std::move(*found);
    apply_fdr(scanned);
    rank_findings(scanned);
    const auto* all = &scanned.slope_findings;
    EXPECT_EQ(all->front().strata.front(), "store_format");
    int reversals = 0;
    for (const auto& g : *all) {
        EXPECT_FALSE(std::isnan(g.q_value));
        EXPECT_GE(g.q_value, g.p_reversal);
        const bool has_format = std::find(g.strata.begin(), g.strata.end(), "store_format") != g.strata.end();
        reversals += g.cls == FindingClass::Reversal;
        if (has_format) {
            EXPECT_EQ(g.cls, FindingClass::Reversal) << g.strata.back();
        }
    }
    // footfall follows sales, so within its bins the promo slope can turn too: at least the 4
    // checks holding store_format, and family leads stay ordered by class (a family keeps its
    // proxies and members beneath its lead, whatever their class).
    EXPECT_GE(reversals, 4);
    int last = 0;
    for (const auto& g : *all)
        if (g.family.role == FamilyRole::Lead) {
            EXPECT_LE(last, rank(g.cls)) << g.label();
            last = rank(g.cls);
        }
}

// Planted structures (synthetic, seeded): each class arises where it is planted.
TEST(SlopeScan, PlantedClasses) {
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto cls = [&](const Table& t) {
        auto r = check_slope(t, q, {t.column("g")});
        EXPECT_TRUE(r.ok());
        return r->cls;
    };
    // Group centres rise along x and y, the trend inside every group falls: reversal.
    EXPECT_EQ(cls(planted(200, {0, 3, 6}, {0, 6, 12}, {-0.5, -0.5, -0.5}, 0.5, 1)),
              FindingClass::Reversal);
    // Centres rise, no trend inside: explained.
    EXPECT_EQ(cls(planted(200, {0, 3, 6}, {0, 6, 12}, {0, 0, 0}, 0.5, 2)), FindingClass::Explained);
    // Centres fall just enough (between-group slope −0.7/6 with var 6 between, 1 within) for
    // the pooled trend to cancel while the within trend rises: masked.
    EXPECT_EQ(cls(planted(200, {0, 3, 6}, {0, -0.35, -0.7}, {0.7, 0.7, 0.7}, 3.0, 3)),
              FindingClass::Masked);
    // Same centres, opposite trends in the groups: heterogeneous.
    EXPECT_EQ(cls(planted(200, {0, 0, 0}, {0, 0, 0}, {1.0, -1.0, 0.0}, 0.5, 4)),
              FindingClass::Heterogeneous);
    // One common trend, no confounding: stable.
    EXPECT_EQ(cls(planted(200, {0, 0, 0}, {0, 0, 0}, {1.0, 1.0, 1.0}, 0.5, 5)), FindingClass::Stable);
}

// Scan bookkeeping: singles then pairs, same pooled figures everywhere, q-values left to the
// caller, classify() honours a q-value once filled.
TEST(SlopeScan, ScanRunsSinglesAndPairsAndHonoursQValues) {
    Table t = planted(300, {0, 3, 6}, {0, 6, 12}, {-0.5, -0.5, -0.5}, 0.5, 6);
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto r = scan_slopes(t, q, {t.column("g"), t.column("noise")}, true);
    ASSERT_TRUE(r.ok());
    ASSERT_EQ(r->size(), 3u);
    EXPECT_EQ((*r)[2].strata, (std::vector<std::string>{"g", "noise"}));
    EXPECT_EQ((*r)[2].groups.size(), 9u);
    for (const auto& f : *r) {
        EXPECT_DOUBLE_EQ(f.pooled.slope, (*r)[0].pooled.slope);
        EXPECT_TRUE(std::isnan(f.q_value));
    }
    EXPECT_EQ((*r)[0].cls, FindingClass::Reversal);
    EXPECT_EQ((*r)[1].cls, FindingClass::Stable);  // noise: within ≈ pooled
    SlopeFinding f = (*r)[0];
    f.q_value = 0.2;
    EXPECT_NE(classify(f, 0.05), FindingClass::Reversal);
    EXPECT_FALSE(f.reversal);

    auto none = scan_slopes(t, q, std::vector<const Column*>{}, true);
    ASSERT_TRUE(none.ok());
    EXPECT_TRUE(none->empty());
}

// The checks of a scan are shared out over SlopeQuestion::threads; each check keeps its own
// sums, so every figure is bit-for-bit the same on one thread and on several.
TEST(SlopeScan, FiguresDoNotDependOnTheThreadCount) {
    Table t = planted(400, {0, 3, 6, 9}, {0, 6, 12, 18}, {-0.5, -0.4, -0.6, -0.5}, 0.5, 16);
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    q.threads = 1;
    auto one = scan_slopes(t, q, {t.column("g"), t.column("noise")}, true);
    ASSERT_TRUE(one.ok());
    ASSERT_EQ(one->size(), 3u);
    for (unsigned threads : {2u, 3u, 0u}) {
        q.threads = threads;
        auto many = scan_slopes(t, q, {t.column("g"), t.column("noise")}, true);
        ASSERT_TRUE(many.ok());
        ASSERT_EQ(many->size(), one->size());
        for (std::size_t i = 0; i < one->size(); ++i) {
            const auto& a = (*one)[i];
            const auto& b = (*many)[i];
            EXPECT_EQ(a.strata, b.strata);
            EXPECT_EQ(a.cls, b.cls);
            EXPECT_EQ(a.within.slope, b.within.slope) << threads << " threads, check " << i;
            EXPECT_EQ(a.within.se, b.within.se);
            EXPECT_EQ(a.pooled.slope, b.pooled.slope);
            ASSERT_EQ(a.groups.size(), b.groups.size());
            for (std::size_t g = 0; g < a.groups.size(); ++g) EXPECT_EQ(a.groups[g].slope, b.groups[g].slope);
        }
    }
}

// A pre-counted table (each row with a count) gives the same figures as the rows it stands for.
TEST(SlopeScan, PreCountedEqualsRowLevel) {
    Table rows = planted(50, {0, 2}, {0, 3}, {-1, -1}, 0.3, 7);
    Table counted = rows;
    // Double every row by weight instead of by copy.
    Table doubled = rows;
    for (auto& c : doubled.columns) {
        if (c.is_numeric()) {
            auto v = c.values;
            c.values.insert(c.values.end(), v.begin(), v.end());
        } else {
            std::vector<std::uint32_t> codes;
            for (std::size_t i = 0; i < rows.rows; ++i) codes.push_back(c.code(i));
            codes.insert(codes.end(), codes.begin(), codes.end());
            c = Column::categorical(c.name, c.levels, codes);
        }
    }
    doubled.rows *= 2;
    counted.weights.assign(rows.rows, 2.0);
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto a = check_slope(counted, q, {counted.column("g")});
    auto b = check_slope(doubled, q, {doubled.column("g")});
    ASSERT_TRUE(a.ok() && b.ok());
    EXPECT_EQ(a->n, b->n);
    EXPECT_NEAR(a->pooled.se, b->pooled.se, 1e-12);
    EXPECT_NEAR(a->pooled.se_robust, b->pooled.se_robust, 1e-12);
    EXPECT_NEAR(a->within.se, b->within.se, 1e-12);
    EXPECT_NEAR(a->equal_slopes.f, b->equal_slopes.f, 1e-9);
    EXPECT_EQ(a->rows_used, 100);
    EXPECT_EQ(b->rows_used, 200);
}

// Bootstrap stability: deterministic for a seed, a share in [0, 1], high for a strong planted
// reversal and lower for a marginal one.
TEST(SlopeScan, BootstrapStabilityIsSeededAndSensible) {
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    q.bootstrap = 200;
    q.seed = 42;
    Table strong = planted(100, {0, 3, 6}, {0, 6, 12}, {-0.5, -0.5, -0.5}, 0.5, 8);
    auto a = check_slope(strong, q, {strong.column("g")});
    auto b = check_slope(strong, q, {strong.column("g")});
    ASSERT_TRUE(a.ok() && b.ok());
    EXPECT_EQ(a->stability.draws, 200);
    EXPECT_EQ(a->stability.share, b->stability.share);
    EXPECT_GT(a->stability.share, 0.95);
    q.bootstrap = 0;
    auto c = check_slope(strong, q, {strong.column("g")});
    EXPECT_TRUE(std::isnan(c->stability.share));  // not resampled: undefined, not 0
    EXPECT_EQ(c->stability.draws, 0);
    // Weighted rows resample by multinomial counts and stay deterministic.
    Table w = strong;
    w.weights.assign(w.rows, 3.0);
    q.bootstrap = 50;
    auto d1 = check_slope(w, q, {w.column("g")});
    auto d2 = check_slope(w, q, {w.column("g")});
    EXPECT_EQ(d1->stability.share, d2->stability.share);
    EXPECT_GT(d1->stability.share, 0.9);
}

// Covariates: with a covariate that is the real driver the adjusted figures take over
// (statsmodels agreement of the adjusted slopes is checked in tests/core/stats).
TEST(SlopeScan, CovariatesAdjustAndLinearProbabilityIsFlagged) {
    Table t = planted(200, {0, 3, 6}, {0, 6, 12}, {-0.5, -0.5, -0.5}, 0.5, 9);
    std::mt19937_64 rng(1);
    std::normal_distribution<double> n01(0, 1);
    std::vector<double> c, y01;
    for (std::size_t i = 0; i < t.rows; ++i) {
        c.push_back(n01(rng));
        y01.push_back(t.columns[1].values[i] > 6 ? 1.0 : 0.0);
    }
    t.columns.push_back(Column::numeric("c", c));
    t.columns.push_back(Column::numeric("y01", y01));
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    q.covariates = {"c"};
    auto r = check_slope(t, q, {t.column("g")});
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    EXPECT_TRUE(r->adjusted);
    EXPECT_NEAR(r->adjusted_within.slope, -0.5, 0.1);
    EXPECT_EQ(r->cls, FindingClass::Reversal);
    EXPECT_FALSE(r->linear_probability);
    q.covariates.clear();
    q.y = "y01";
    auto lp = check_slope(t, q, {t.column("g")});
    ASSERT_TRUE(lp.ok());
    EXPECT_TRUE(lp->linear_probability);
}

TEST(SlopeScan, BadQuestionsAreClearErrors) {
    Table t = planted(10, {0, 1}, {0, 1}, {1, 1}, 0.1, 10);
    SlopeQuestion q;
    q.x = "nope";
    q.y = "y";
    auto r = check_slope(t, q, {t.column("g")});
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("'nope' not found"), std::string::npos);
    q.x = "g";
    r = check_slope(t, q, {t.column("noise")});
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("categorical"), std::string::npos);
    q.x = "x";
    r = check_slope(t, q, {t.column("y")});
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("bin it"), std::string::npos);
    r = check_slope(t, q, {});
    EXPECT_FALSE(r.ok());
}

// Hidden groups: two planted clouds with opposite inner trends, no stratifier given.
TEST(SlopeScan, FindGroupsHintsAtHiddenGroups) {
    Table t = planted(400, {0, 6}, {0, 12}, {-0.8, -0.8}, 0.3, 11);
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto r = find_groups(t, q, 7);
    ASSERT_TRUE(r.ok()) << r.error().to_string();
    EXPECT_EQ(r->k, 2);
    ASSERT_EQ(r->components.size(), 2u);
    EXPECT_GT(r->pooled_slope, 0);
    EXPECT_TRUE(r->opposite);
    EXPECT_NEAR(r->components[0].slope, -0.8, 0.15);
    EXPECT_NEAR(r->components[1].mean_x, 6, 0.2);
    EXPECT_EQ(r->bic.size(), 6u);
    EXPECT_NE(r->note.find("hint"), std::string::npos);
    auto again = find_groups(t, q, 7);
    EXPECT_EQ(again->bic, r->bic);
}

// The scan reads the rows once for all checks in chunks; each of its findings must equal the
// same check run on its own (which takes the direct path), across chunk and block boundaries,
// with weights and missing stratifier cells, and with covariates.
TEST(SlopeScan, ScanEqualsSeparateChecks) {
    Table t = planted(7000, {0, 2, 4}, {0, 3, 6}, {-0.4, -0.6, -0.5}, 0.7, 12);
    std::vector<std::uint32_t> codes;
    std::mt19937_64 rng(3);
    for (std::size_t i = 0; i < t.rows; ++i) codes.push_back(rng() % 50 == 0 ? 4u : static_cast<std::uint32_t>(rng() % 4));
    t.columns.push_back(Column::categorical("sparse", {"p", "q", "r", "s"}, codes));
    std::vector<double> c;
    for (std::size_t i = 0; i < t.rows; ++i) c.push_back(static_cast<double>(rng() % 1000) / 100.0);
    t.columns.push_back(Column::numeric("c", c));
    t.weights.assign(t.rows, 1.0);
    for (std::size_t i = 0; i < t.rows; i += 3) t.weights[i] = 2.5;
    std::vector<const Column*> cands = {t.column("g"), t.column("noise"), t.column("sparse")};
    for (bool with_cov : {false, true}) {
        SlopeQuestion q;
        q.x = "x";
        q.y = "y";
        if (with_cov) q.covariates = {"c"};
        auto all = scan_slopes(t, q, cands, true);
        ASSERT_TRUE(all.ok());
        ASSERT_EQ(all->size(), 6u);
        std::size_t idx = 0;
        std::vector<std::vector<const Column*>> combos = {{cands[0]}, {cands[1]}, {cands[2]},
                                                          {cands[0], cands[1]}, {cands[0], cands[2]},
                                                          {cands[1], cands[2]}};
        for (const auto& combo : combos) {
            auto one = check_slope(t, q, combo);
            ASSERT_TRUE(one.ok());
            const SlopeFinding& a = (*all)[idx++];
            EXPECT_EQ(a.strata, one->strata);
            EXPECT_EQ(a.cls, one->cls);
            EXPECT_NEAR(a.within.slope, one->within.slope, 1e-12);
            EXPECT_NEAR(a.within.se, one->within.se, 1e-12);
            EXPECT_NEAR(a.equal_slopes.f, one->equal_slopes.f, 1e-9);
            EXPECT_NEAR(a.adjusted_within.slope, one->adjusted_within.slope, 1e-12);
            ASSERT_EQ(a.groups.size(), one->groups.size());
            for (std::size_t k = 0; k < a.groups.size(); ++k) {
                EXPECT_EQ(a.groups[k].level, one->groups[k].level);
                EXPECT_EQ(a.groups[k].n, one->groups[k].n);
                EXPECT_NEAR(a.groups[k].slope, one->groups[k].slope, 1e-10);
            }
        }
        EXPECT_EQ((*all)[2].groups.back().level, "(missing)");
        EXPECT_EQ((*all)[0].adjusted, with_cov);
    }
}

// Benjamini-Hochberg (1995): with 20 checks, a reversal at p 0.02 among 19 at p 0.9 has q 0.4 and
// loses its class; the stability is then read for the new class from the resample counts.
TEST(SlopeScan, FdrDemotesAWeakReversalAmongManyChecks) {
    SlopeFinding f;
    f.q_value = std::nan("");
    // Pooled +1 (SE 0.4, df 100) and within −1 (SE 0.4): both one-sided p ≈ 0.007.
    f.pooled.slope = 1;
    f.pooled.se = 0.4;
    f.pooled.df = 100;
    f.pooled.p = 0.014;
    f.within.slope = -1;
    f.within.se = 0.4;
    f.within.df = 100;
    f.within.p = 0.014;
    ASSERT_EQ(classify(f, 0.05), FindingClass::Reversal);
    f.stability.draws = 10;
    f.draws_by_class[static_cast<std::size_t>(rank(FindingClass::Reversal))] = 7;
    f.draws_by_class[static_cast<std::size_t>(rank(FindingClass::Stable))] = 3;
    f.stability.share = 0.7;
    ScanResult r;
    r.alpha = 0.05;
    r.slope_findings.assign(20, f);
    auto& all = r.slope_findings;
    for (std::size_t i = 1; i < all.size(); ++i) {
        all[i].pooled.slope = 0.01;
        all[i].pooled.p = 0.98;
        all[i].stability.draws = 0;
        classify(all[i], 0.05);
    }
    const double p = all[0].p_reversal;
    EXPECT_NEAR(p, 0.00701, 1e-4);
    apply_fdr(r);  // the one FDR step of every scan
    EXPECT_NEAR(all[0].q_value, std::min(1.0, 20 * p), 1e-12);  // the smallest p: q = m p / 1
    EXPECT_FALSE(all[0].reversal);
    // Both slopes stay significant, so neither "explained" nor "masked" holds: stable.
    EXPECT_EQ(all[0].cls, FindingClass::Stable);
    EXPECT_DOUBLE_EQ(all[0].stability.share, 0.3);
}

// Pairs of 400-level stratifiers (160,801 joint strata each) overflow one batch's memory budget,
// so the scan splits its checks into several passes; findings must still match single checks.
TEST(SlopeScan, LargeJointStrataAreBatchedAndStillMatch) {
    Table t = planted(4000, {0, 2, 4}, {0, 3, 6}, {-0.5, -0.5, -0.5}, 0.5, 13);
    std::mt19937_64 rng(4);
    std::vector<std::string> levels;
    for (int l = 0; l < 400; ++l) {
        std::string level = "v";
        level += std::to_string(l);
        levels.push_back(level);
    }
    for (const char* name : {"wide1", "wide2", "wide3"}) {
        std::vector<std::uint32_t> codes;
        for (std::size_t i = 0; i < t.rows; ++i) codes.push_back(static_cast<std::uint32_t>(rng() % 400));
        t.columns.push_back(Column::categorical(name, levels, codes));
    }
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    std::vector<const Column*> cands = {t.column("wide1"), t.column("wide2"), t.column("wide3")};
    auto all = scan_slopes(t, q, cands, true);
    ASSERT_TRUE(all.ok());
    ASSERT_EQ(all->size(), 6u);
    auto one = check_slope(t, q, {cands[1], cands[2]});
    ASSERT_TRUE(one.ok());
    const SlopeFinding& a = all->back();
    EXPECT_EQ(a.groups.size(), one->groups.size());
    EXPECT_NEAR(a.within.slope, one->within.slope, 1e-12);
    EXPECT_EQ(a.uninformative.size(), one->uninformative.size());
    EXPECT_GT(a.uninformative.size(), 1000u);  // most joint strata hold a row or two
}
