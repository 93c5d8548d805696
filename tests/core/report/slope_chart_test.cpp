// Tests of core/report/slope_chart.h: the memo's trend chart. Lines are checked against
// statsmodels' per-group OLS fits of Fisher's iris data as Debian's python3-sklearn ships it,
// and against a constructed table whose points lie exactly on known lines; thinning and the
// undefined cases are checked by counting.
#include "core/report/slope_chart.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <fstream>

#include "core/io/csv_reader.h"

using namespace foldline;
using namespace foldline::report;

namespace {

Table from_columns(const std::vector<double>& x, const std::vector<double>& y, const std::vector<std::string>& g) {
    Table t;
    t.rows = x.size();
    std::vector<std::string> levels;
    std::vector<std::uint32_t> codes;
    for (const auto& level : g) {
        auto it = std::find(levels.begin(), levels.end(), level);
        if (it == levels.end()) it = levels.insert(levels.end(), level);
        codes.push_back(static_cast<std::uint32_t>(it - levels.begin()));
    }
    t.columns = {Column::numeric("x", x), Column::numeric("y", y), Column::categorical("g", levels, codes)};
    return t;
}

}  // namespace

// Handbook rule [any regression text]: a least-squares line passes through the mean (x̄, ȳ) of
// the points it is fitted to. Points on y = 10 − x (group a, x = 1..4) and y = 30 − x (group b,
// x = 11..14): each stratum line is exactly that line over its own x range; the pooled line
// is worked out by hand below.
TEST(SlopeChart, LinesPassThroughEachGroupsMean) {
    const Table t = from_columns({1, 2, 3, 4, 11, 12, 13, 14}, {9, 8, 7, 6, 19, 18, 17, 16},
                                 {"a", "a", "a", "a", "b", "b", "b", "b"});
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto f = check_slope(t, q, {t.column("g")});
    ASSERT_TRUE(f.ok()) << f.error().to_string();
    // By hand: x̄ = 7.5, ȳ = 12.5; Σ(x−x̄)(y−ȳ) = 190, Σ(x−x̄)² = 210 → pooled slope 19/21.
    EXPECT_NEAR(f->pooled.slope, 190.0 / 210.0, 1e-12);
    const MemoScatter c = slope_chart(t, *f);
    ASSERT_EQ(c.lines.size(), 2u);
    EXPECT_EQ(c.lines[0].label, "a");
    EXPECT_NEAR(c.lines[0].slope, -1, 1e-12);
    EXPECT_NEAR(c.lines[0].intercept, 10, 1e-9);
    EXPECT_EQ(c.lines[0].x_min, 1);
    EXPECT_EQ(c.lines[0].x_max, 4);
    EXPECT_NEAR(c.lines[1].intercept, 30, 1e-9);
    EXPECT_EQ(c.lines[1].x_min, 11);
    ASSERT_TRUE(c.pooled);
    EXPECT_NEAR(c.pooled->intercept, 12.5 - 7.5 * 190.0 / 210.0, 1e-9);
    EXPECT_EQ(c.x.size(), 8u);
    EXPECT_EQ(c.group, (std::vector<int>{0, 0, 0, 0, 1, 1, 1, 1}));
    EXPECT_EQ(c.title, "y on x by g");
    EXPECT_EQ(c.note, "All 8 rows drawn");

    // Thinned to at most 3 points: every 3rd row, the lines still fitted to every row.
    const MemoScatter thin = slope_chart(t, *f, 4, 50, 3);
    EXPECT_EQ(thin.x, (std::vector<double>{1, 4, 13}));
    EXPECT_NEAR(thin.lines[1].intercept, 30, 1e-9);
    EXPECT_EQ(thin.note, "3 of 8 rows drawn (1 in 3); the lines use every row");
    EXPECT_TRUE(slope_chart(t, *f, 4, 50, 0).x.empty());  // lines only
}

TEST(SlopeChart, UndefinedCasesGiveNoLines) {
    const Table t = from_columns({1, 2, 3}, {1, 2, 3}, {"a", "a", "a"});
    SlopeFinding f;
    f.x = "x";
    f.y = "missing_column";
    f.strata = {"g"};
    MemoScatter c = slope_chart(t, f);
    EXPECT_TRUE(c.lines.empty());
    EXPECT_TRUE(c.x.empty());
    EXPECT_FALSE(c.pooled);
    // A stratum with an undefined slope gets no line, while its points are still drawn.
    f.y = "y";
    f.pooled.slope = 1;
    SlopeGroup g;
    g.level = "a";
    g.levels = {"a"};
    g.slope = std::nan("");
    f.groups = {g};
    c = slope_chart(t, f);
    EXPECT_TRUE(c.lines.empty());
    EXPECT_EQ(c.x.size(), 3u);
    EXPECT_EQ(c.group, (std::vector<int>{-1, -1, -1}));
    ASSERT_TRUE(c.pooled);
    EXPECT_NEAR(c.pooled->intercept, 0, 1e-12);
}

// Fisher's iris data as shipped in Debian's python3-sklearn (header "150,4,setosa,...": "150"
// is sepal length, "4" sepal width, "virginica" the species code). statsmodels 0.13.5 OLS
// width ~ length [calc]: pooled intercept 3.41894684, slope −0.0618848; species 0 intercept
// −0.56943267, slope 0.7985283 (length 4.3..5.8); 1: 0.87214596, 0.31971935 (4.9..7.0);
// 2: 1.44630542, 0.2318905 (4.9..7.9).
TEST(SlopeChart, IrisLinesMatchStatsmodels) {
    const std::string path = "/usr/lib/python3/dist-packages/sklearn/datasets/data/iris.csv";
    if (!std::ifstream(path).good()) GTEST_SKIP() << path << " not installed (python3-sklearn)";
    CsvOptions o;
    o.type_overrides = {{"virginica", ColumnType::Categorical}};
    auto t = read_csv(path, o, nullptr);
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    SlopeQuestion q;
    q.x = "150";
    q.y = "4";
    auto f = check_slope(*t, q, {t->column("virginica")});
    ASSERT_TRUE(f.ok()) << f.error().to_string();
    const MemoScatter c = slope_chart(*t, *f);
    ASSERT_EQ(c.lines.size(), 3u);
    const double intercepts[3] = {-0.56943267, 0.87214596, 1.44630542};
    const double slopes[3] = {0.7985283, 0.31971935, 0.2318905};
    const double lo[3] = {4.3, 4.9, 4.9}, hi[3] = {5.8, 7.0, 7.9};
    for (std::size_t i = 0; i < 3; ++i) {
        EXPECT_EQ(c.lines[i].label, std::to_string(i));
        EXPECT_NEAR(c.lines[i].slope, slopes[i], 5e-8);
        EXPECT_NEAR(c.lines[i].intercept, intercepts[i], 5e-8);
        EXPECT_DOUBLE_EQ(c.lines[i].x_min, lo[i]);
        EXPECT_DOUBLE_EQ(c.lines[i].x_max, hi[i]);
    }
    ASSERT_TRUE(c.pooled);
    EXPECT_NEAR(c.pooled->intercept, 3.41894684, 5e-8);
    EXPECT_EQ(c.x.size(), 150u);
}
