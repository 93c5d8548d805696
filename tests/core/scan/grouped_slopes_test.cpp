// Trend checks from moment sums grouped elsewhere (core/scan/grouped_slopes.h,
// slope_finding_from_moments in core/scan/slope_scan.h). The oracle is check_slope over the
// rows themselves, whose figures are checked against statsmodels OLS by reference_slope
// (tests/reference/slope_reference.py): summing centred values per stratifier value, as the
// database push-down does, must give the same slopes to 1e-9 relative, the same groups and the
// same uninformative strata.
#include "core/scan/grouped_slopes.h"

#include <gtest/gtest.h>

#include <cmath>
#include <map>
#include <random>

#include "core/table/binning.h"
#include "synthetic_table.h"

namespace foldline {
namespace {

// Invented plant log: supplier (exposure), defect (outcome), line (text, one line never changes
// its temperature, some rows missing) and crew (integer levels); temperature and output near 1e6.
Table plant(std::size_t n) {
    std::mt19937_64 rng(5);
    std::uniform_real_distribution<double> u(0, 1);
    std::normal_distribution<double> noise(0, 25);
    const char* lines[] = {"L1", "L2", "calibration", ""};
    const double base[] = {1000000.0, 1000400.0, 1000123.1, 1000050.0};
    std::vector<std::string> supplier, defect, line;
    std::vector<double> crew, temp, out;
    for (std::size_t i = 0; i < n; ++i) {
        const int l = static_cast<int>(u(rng) * 4);
        const double t = l == 2 ? base[l] : base[l] + noise(rng);
        supplier.push_back(u(rng) < 0.5 ? "north" : "south");
        defect.push_back(u(rng) < 0.1 ? "yes" : "no");
        line.push_back(lines[l]);
        crew.push_back(std::floor(u(rng) * 4) + 1);
        temp.push_back(u(rng) < 0.02 ? NAN : t);
        out.push_back(300000.0 - 0.8 * (t - base[l]) + 3.0 * (base[l] - 1e6) + noise(rng));
    }
    Table tb;
    tb.columns.push_back(testing::cat_column("supplier", supplier));
    tb.columns.push_back(testing::cat_column("defect", defect));
    tb.columns.push_back(testing::cat_column("line", line));
    tb.columns.push_back(Column::numeric("crew", crew));
    tb.columns.push_back(Column::numeric("temp", temp));
    tb.columns.push_back(Column::numeric("output", out));
    tb.rows = n;
    tb.source = "plant";
    return tb;
}

// The rows of one grouping set (outcome, exposure, column c), NULL kept, cells in first-row order.
Table group3(const Table& t, std::size_t c) {
    std::map<std::vector<double>, std::size_t> at;
    std::vector<std::vector<double>> keys;
    std::vector<double> w;
    for (std::size_t i = 0; i < t.rows; ++i) {
        std::vector<double> key;
        for (std::size_t k : {std::size_t{1}, std::size_t{0}, c}) {
            const Column& col = t.columns[k];
            const double v = col.is_numeric() ? col.values[i] : static_cast<double>(col.code(i));
            key.push_back(std::isnan(v) ? -1e308 : v);
        }
        auto [it, fresh] = at.emplace(key, keys.size());
        if (fresh) {
            keys.push_back(key);
            w.push_back(0);
        }
        w[it->second] += 1;
    }
    Table out;
    out.rows = keys.size();
    out.weights = w;
    std::size_t j = 0;
    for (std::size_t k : {std::size_t{1}, std::size_t{0}, c}) {
        const Column& col = t.columns[k];
        if (col.is_numeric()) {
            std::vector<double> v;
            for (const auto& key : keys) v.push_back(key[j] == -1e308 ? NAN : key[j]);
            out.columns.push_back(Column::numeric(col.name, v));
        } else {
            std::vector<std::string> labels;
            for (const auto& key : keys) {
                const auto code = static_cast<std::uint32_t>(key[j]);
                labels.push_back(code == col.missing_code() ? "" : col.levels[code]);
            }
            out.columns.push_back(testing::cat_column(col.name, labels));
        }
        ++j;
    }
    return out;
}

// Centred sums per distinct value of column c over the rows with temp and output present.
void sums_of(const Table& t, std::size_t c, GroupedMoments& m) {
    const auto& x = t.columns[4].values;
    const auto& y = t.columns[5].values;
    const Column& col = t.columns[c];
    std::map<double, std::size_t> at;
    std::vector<double> vals;
    std::vector<CentredSums> sums;
    for (std::size_t i = 0; i < t.rows; ++i) {
        if (std::isnan(x[i]) || std::isnan(y[i])) continue;
        const double v = col.is_numeric() ? col.values[i] : static_cast<double>(col.code(i));
        auto [it, fresh] = at.emplace(v, sums.size());
        if (fresh) {
            vals.push_back(v);
            sums.push_back({});
        }
        CentredSums& s = sums[it->second];
        const double dx = x[i] - m.shift_x, dy = y[i] - m.shift_y;
        s.n += 1;
        s.sx += dx;
        s.sy += dy;
        s.sxx += dx * dx;
        s.sxy += dx * dy;
        s.syy += dy * dy;
    }
    if (col.is_numeric()) {
        m.values.push_back(Column::numeric(col.name, vals));
    } else {
        std::vector<std::string> labels;
        for (double v : vals) {
            const auto code = static_cast<std::uint32_t>(v);
            labels.push_back(code == col.missing_code() ? "" : col.levels[code]);
        }
        m.values.push_back(testing::cat_column(col.name, labels));
    }
    m.sums.push_back(sums);
}

TEST(GroupedSlopes, MomentSumsPerValueGiveTheSlopesOfTheRows) {
    const Table rows = plant(6000);
    GroupedCounts g;
    g.singles = {group3(rows, 2), group3(rows, 3)};
    Table pooled;
    pooled.columns = {g.singles[0].columns[0], g.singles[0].columns[1]};
    pooled.rows = g.singles[0].rows;
    pooled.weights = g.singles[0].weights;
    g.pooled = pooled;  // the question only needs the outcome and exposure levels and weights
    QuestionSpec spec;
    spec.outcome = "defect";
    spec.positive = "yes";
    spec.exposure = "supplier";
    CandidateOptions copt;
    copt.columns = {"line", "crew"};
    auto in = cubes_from_groups(g, spec, copt, false);
    ASSERT_TRUE(in.ok()) << in.error().to_string();

    GroupedMoments m;
    m.shift_x = 1000050.0;  // a table-wide shift, not the strata's own means
    m.shift_y = 300500.0;
    sums_of(rows, 2, m);
    sums_of(rows, 3, m);
    for (const auto& s : m.sums[0]) {
        m.pooled.n += s.n;
        m.pooled.sx += s.sx;
        m.pooled.sy += s.sy;
        m.pooled.sxx += s.sxx;
        m.pooled.sxy += s.sxy;
        m.pooled.syy += s.syy;
    }
    // The calibration line has one temperature: the database knows it from MIN = MAX.
    for (std::size_t r = 0; r < m.values[0].size(); ++r)
        if (!m.values[0].is_missing(r) && m.values[0].levels[m.values[0].code(r)] == "calibration")
            m.sums[0][r].x_constant = true;
    m.hc3 = NAN;

    SlopeQuestion q;
    q.x = "temp";
    q.y = "output";
    auto got = slope_checks_from_groups(m, g, *in, q);
    ASSERT_TRUE(got.ok()) << got.error().to_string();
    ASSERT_EQ(got->size(), 2u);
    const Column* line = rows.column("line");
    auto crew_levels = integer_levels(*rows.column("crew"), 50);
    ASSERT_TRUE(crew_levels.has_value());
    const std::vector<const Column*> strata[] = {{line}, {&*crew_levels}};
    for (std::size_t k = 0; k < 2; ++k) {
        auto want = check_slope(rows, q, strata[k]);
        ASSERT_TRUE(want.ok());
        const auto& a = *want;
        const auto& b = (*got)[k];
        EXPECT_EQ(a.strata, b.strata);
        EXPECT_NEAR(b.pooled.slope, a.pooled.slope, 1e-9 * std::abs(a.pooled.slope));
        EXPECT_NEAR(b.within.slope, a.within.slope, 1e-9 * std::abs(a.within.slope));
        EXPECT_NEAR(b.within.se, a.within.se, 1e-9 * a.within.se);
        EXPECT_EQ(a.cls, b.cls);
        EXPECT_EQ(a.uninformative, b.uninformative);
        ASSERT_EQ(a.groups.size(), b.groups.size());
        for (std::size_t j = 0; j < a.groups.size(); ++j) {
            EXPECT_EQ(a.groups[j].level, b.groups[j].level);
            EXPECT_EQ(a.groups[j].n, b.groups[j].n);
            EXPECT_EQ(a.groups[j].informative, b.groups[j].informative);
            if (a.groups[j].informative) {
                EXPECT_NEAR(b.groups[j].slope, a.groups[j].slope, 1e-9 * std::abs(a.groups[j].slope));
            }
        }
    }
    EXPECT_NE(std::find(got->front().uninformative.begin(), got->front().uninformative.end(), "calibration"),
              got->front().uninformative.end());
}

}  // namespace
}  // namespace foldline
