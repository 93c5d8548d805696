// Count cubes from grouped counts (core/scan/grouped_cubes.h) and the rate scan over them
// (rate_scan(CubeSet, ...) in core/scan/rate_scan.h). The oracle is the scan of the rows
// themselves, whose figures are checked against statsmodels by reference_scan_statsmodels
// (tests/reference/scan_statsmodels.py): grouping the same rows by every grouping set, as a
// database's GROUP BY GROUPING SETS does, must give every finding, level order, exclusion and
// bootstrap stability of that scan exactly.
#include "core/scan/grouped_cubes.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <random>

#include "core/scan/rate_scan.h"
#include "synthetic_table.h"

namespace foldline {
namespace {

// GROUP BY the columns `cols` of a row-level table, NULL kept as a value, cells in order of
// their first row: the rows one grouping set of the push-down query returns.
Table group_rows(const Table& t, const std::vector<std::size_t>& cols) {
    std::map<std::vector<double>, std::size_t> cell_of;
    std::vector<std::vector<double>> keys;
    std::vector<double> weights;
    for (std::size_t i = 0; i < t.rows; ++i) {
        std::vector<double> key;
        for (auto c : cols) {
            const Column& col = t.columns[c];
            key.push_back(col.is_numeric() ? col.values[i] : static_cast<double>(col.code(i)));
        }
        // NaN never equals itself: key it by a sentinel.
        for (auto& k : key)
            if (std::isnan(k)) k = -1e308;
        auto [it, fresh] = cell_of.emplace(key, keys.size());
        if (fresh) {
            keys.push_back(key);
            weights.push_back(0);
        }
        weights[it->second] += t.weight(i);
    }
    Table out;
    out.rows = keys.size();
    out.weights = weights;
    out.source = t.source;
    for (std::size_t j = 0; j < cols.size(); ++j) {
        const Column& col = t.columns[cols[j]];
        if (col.is_numeric()) {
            std::vector<double> v;
            for (const auto& k : keys) v.push_back(k[j] == -1e308 ? NAN : k[j]);
            out.columns.push_back(Column::numeric(col.name, v));
        } else {
            std::vector<std::string> labels;
            for (const auto& k : keys) {
                const auto code = static_cast<std::uint32_t>(k[j]);
                labels.push_back(code == col.missing_code() ? "" : col.levels[code]);
            }
            out.columns.push_back(testing::cat_column(col.name, labels));
        }
    }
    return out;
}

GroupedCounts group_all(const Table& t, std::size_t outcome, std::size_t exposure, bool pairs) {
    GroupedCounts g;
    g.pooled = group_rows(t, {outcome, exposure});
    std::vector<std::size_t> strata;
    for (std::size_t c = 0; c < t.columns.size(); ++c)
        if (c != outcome && c != exposure) strata.push_back(c);
    for (auto s : strata) g.singles.push_back(group_rows(t, {outcome, exposure, s}));
    if (pairs)
        for (std::size_t i = 0; i < strata.size(); ++i)
            for (std::size_t j = i + 1; j < strata.size(); ++j)
                g.pairs.push_back(group_rows(t, {outcome, exposure, strata[i], strata[j]}));
    return g;
}

// Invented hiring data: a job family confounds the team comparison; tenure is an integer
// column, score a continuous one (quantile bins), badge a different value on every row.
Table staffing(std::size_t n, std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    std::uniform_real_distribution<double> u(0, 1);
    const char* fams[] = {"ops", "eng", "sales", "care"};
    std::vector<std::string> team, hired, fam, badge;
    std::vector<double> tenure, score;
    for (std::size_t i = 0; i < n; ++i) {
        const int f = static_cast<int>(u(rng) * 4);
        const bool north = u(rng) < (f == 0 || f == 3 ? 0.7 : 0.3);
        const double p = (f == 1 ? 0.5 : f == 2 ? 0.35 : f == 0 ? 0.2 : 0.1) + (north ? 0.04 : 0);
        team.push_back(north ? "north" : "south");
        hired.push_back(u(rng) < p ? "yes" : "no");
        fam.push_back(u(rng) < 0.05 ? "" : fams[f]);
        badge.push_back(testing::numbered("b", static_cast<long>(i)));
        tenure.push_back(u(rng) < 0.03 ? NAN : std::floor(u(rng) * 7));
        score.push_back(std::round(u(rng) * 1000) / 10);
    }
    Table t;
    t.columns.push_back(testing::cat_column("team", team));
    t.columns.push_back(testing::cat_column("hired", hired));
    t.columns.push_back(testing::cat_column("family", fam));
    t.columns.push_back(testing::cat_column("badge", badge));
    t.columns.push_back(Column::numeric("tenure", tenure));
    t.columns.push_back(Column::numeric("score", score));
    t.rows = n;
    t.source = "staffing";
    return t;
}

// Equal, or both undefined.
bool same(double a, double b) { return a == b || (std::isnan(a) && std::isnan(b)); }

void expect_same(const ScanResult& a, const ScanResult& b) {
    ASSERT_EQ(a.candidates, b.candidates);
    EXPECT_EQ(a.candidate_origin, b.candidate_origin);
    ASSERT_EQ(a.excluded.size(), b.excluded.size());
    for (std::size_t i = 0; i < a.excluded.size(); ++i) {
        EXPECT_EQ(a.excluded[i].column, b.excluded[i].column);
        EXPECT_EQ(a.excluded[i].reason, b.excluded[i].reason);
    }
    EXPECT_EQ(a.rows, b.rows);
    ASSERT_EQ(a.rate_findings.size(), b.rate_findings.size());
    for (std::size_t i = 0; i < a.rate_findings.size(); ++i) {
        const auto& x = a.rate_findings[i];
        const auto& y = b.rate_findings[i];
        EXPECT_EQ(x.label(), y.label());
        EXPECT_EQ(x.cls, y.cls);
        EXPECT_PRED2(same, x.crude.rd, y.crude.rd);
        EXPECT_PRED2(same, x.adjusted.mh_or.estimate, y.adjusted.mh_or.estimate);
        EXPECT_PRED2(same, x.q_value, y.q_value);
        EXPECT_PRED2(same, x.stability.share, y.stability.share);  // the bootstrap draws from the cube: equal cubes, equal draws
        ASSERT_EQ(x.strata_table.size(), y.strata_table.size());
        for (std::size_t k = 0; k < x.strata_table.size(); ++k) {
            EXPECT_EQ(x.strata_table[k].level, y.strata_table[k].level);
            EXPECT_EQ(x.strata_table[k].pos_focal, y.strata_table[k].pos_focal);
            EXPECT_EQ(x.strata_table[k].n_reference, y.strata_table[k].n_reference);
        }
    }
}

TEST(GroupedCubes, ScanOfGroupedCountsEqualsScanOfRows) {
    const Table rows = staffing(4000, 20261202);
    QuestionSpec spec;
    spec.outcome = "hired";
    spec.positive = "yes";
    spec.exposure = "team";
    spec.focal = {"north"};
    spec.reference = "south";
    CandidateOptions copt;
    RateScanOptions opt;
    opt.bootstrap = 200;

    auto q = resolve_question(rows, spec);
    ASSERT_TRUE(q.ok()) << q.error().to_string();
    auto cands = select_candidates(rows, {"hired", "team"}, copt, rows.column("team"));
    ASSERT_TRUE(cands.ok());
    auto want = rate_scan(rows, *q, *cands, opt);
    ASSERT_TRUE(want.ok());
    ASSERT_EQ(want->candidates.size(), 3u);  // family, tenure, score; badge left out
    ASSERT_FALSE(want->rate_findings.empty());

    auto in = cubes_from_groups(group_all(rows, 1, 0, true), spec, copt, true);
    ASSERT_TRUE(in.ok()) << in.error().to_string();
    EXPECT_EQ(in->cubes.pairs.size(), 3u);
    auto got = rate_scan(in->cubes, in->question, opt);
    ASSERT_TRUE(got.ok()) << got.error().to_string();
    expect_same(*want, *got);
}

// Columns left out before counting get the same words from the scan of the rows, the scan of
// their grouping sets and the database profile, since all three describe the column as a
// ColumnProfile for exclusion_reason (core/table/column_profile.h). The profile's figures are
// those the database's profile query returns for these rows: COUNT(*), non-missing rows and
// distinct non-missing values.
TEST(GroupedCubes, LeftOutColumnsGetTheSameWordsOnEveryPath) {
    Table rows = staffing(600, 11);
    std::vector<std::string> constant, sparse, many;
    for (std::size_t i = 0; i < rows.rows; ++i) {
        constant.push_back("same");
        sparse.push_back(i % 5 == 0 ? testing::numbered("s", static_cast<long>(i % 3)) : "");
        many.push_back(testing::numbered("m", static_cast<long>(i % 80)));
    }
    rows.columns.push_back(testing::cat_column("constant", constant));
    rows.columns.push_back(testing::cat_column("sparse", sparse));
    rows.columns.push_back(testing::cat_column("many", many));
    QuestionSpec spec;
    spec.outcome = "hired";
    spec.positive = "yes";
    spec.exposure = "team";
    CandidateOptions copt;

    auto file = select_candidates(rows, {"hired", "team"}, copt, rows.column("team"));
    ASSERT_TRUE(file.ok());
    std::map<std::string, std::string> from_file;
    for (const auto& e : file->excluded) from_file[e.column] = e.reason;
    EXPECT_EQ(from_file["badge"], "one value per row");
    EXPECT_EQ(from_file["constant"], "constant");
    EXPECT_EQ(from_file["sparse"], "mostly missing (480 of 600 rows)");
    EXPECT_EQ(from_file["many"], "too many levels (80 > 50)");

    auto in = cubes_from_groups(group_all(rows, 1, 0, false), spec, copt, false);
    ASSERT_TRUE(in.ok()) << in.error().to_string();
    std::map<std::string, std::string> from_groups;
    for (const auto& e : in->cubes.excluded) from_groups[e.column] = e.reason;
    EXPECT_EQ(from_groups, from_file);

    // The database profile's figures for each categorical column left out.
    for (const char* name : {"badge", "constant", "sparse", "many"}) {
        const Column& c = *rows.column(name);
        std::vector<char> seen(c.levels.size(), 0);
        double present = 0;
        for (std::size_t i = 0; i < rows.rows; ++i)
            if (!c.is_missing(i)) {
                seen[c.code(i)] = 1;
                ++present;
            }
        ColumnProfile profile;
        profile.rows = static_cast<double>(rows.rows);
        profile.missing = profile.rows - present;
        profile.distinct = static_cast<double>(std::count(seen.begin(), seen.end(), 1));
        EXPECT_EQ(exclusion_reason(profile, copt).value_or("kept"), from_file[name]) << name;
    }

    // Pre-counted: the same rows as weighted cells give the same shares (in Σ weights), and
    // "one value per row" no longer applies.
    Table counted = group_rows(rows, {0, 1, 2, 6, 7});
    auto cells = select_candidates(counted, {"hired", "team"}, copt, counted.column("team"));
    ASSERT_TRUE(cells.ok());
    std::map<std::string, std::string> from_cells;
    for (const auto& e : cells->excluded) from_cells[e.column] = e.reason;
    EXPECT_EQ(from_cells["constant"], "constant");
    EXPECT_EQ(from_cells["sparse"], "mostly missing (480 of 600 rows)");
}

TEST(GroupedCubes, NamedStratifiersKeepTheirOrderAndPairsFollowIt) {
    const Table rows = staffing(1500, 7);
    QuestionSpec spec;
    spec.outcome = "hired";
    spec.positive = "yes";
    spec.exposure = "team";
    CandidateOptions copt;
    copt.columns = {"score", "family"};  // against the column order: pairs are (score, family)
    RateScanOptions opt;
    opt.bootstrap = 50;
    auto q = resolve_question(rows, spec);
    ASSERT_TRUE(q.ok());
    auto cands = select_candidates(rows, {"hired", "team"}, copt, rows.column("team"));
    ASSERT_TRUE(cands.ok());
    auto want = rate_scan(rows, *q, *cands, opt);
    ASSERT_TRUE(want.ok());
    auto in = cubes_from_groups(group_all(rows, 1, 0, true), spec, copt, true);
    ASSERT_TRUE(in.ok()) << in.error().to_string();
    auto got = rate_scan(in->cubes, in->question, opt);
    ASSERT_TRUE(got.ok());
    expect_same(*want, *got);

    copt.columns = {"nowhere"};
    EXPECT_FALSE(cubes_from_groups(group_all(rows, 1, 0, false), spec, copt, false).ok());
}

// A continuous stratifier's pairs binned in the engine: bin_cuts gives cut points that put every
// value in the level the file scan gives it, and pair sets holding those bin numbers (marked
// coded_in_pairs) give the row-level scan's findings.
TEST(GroupedCubes, PairsBinnedByTheEngineWithTheCutsOfTheSingleSets) {
    const Table rows = staffing(3000, 99);
    QuestionSpec spec;
    spec.outcome = "hired";
    spec.positive = "yes";
    spec.exposure = "team";
    CandidateOptions copt;
    RateScanOptions opt;
    opt.bootstrap = 100;
    auto q = resolve_question(rows, spec);
    ASSERT_TRUE(q.ok());
    auto cands = select_candidates(rows, {"hired", "team"}, copt, rows.column("team"));
    ASSERT_TRUE(cands.ok());
    auto want = rate_scan(rows, *q, *cands, opt);
    ASSERT_TRUE(want.ok());

    GroupedCounts singles = group_all(rows, 1, 0, false);
    auto in = cubes_from_groups(singles, spec, copt, false);
    ASSERT_TRUE(in.ok());
    // The engine's CASE: level k for values in [cut_k, cut_k+1).
    Table binned = rows;
    GroupedCounts g = singles;
    for (std::size_t i = 0; i < in->cubes.stratifiers.size(); ++i) {
        const auto cuts = bin_cuts(singles, *in, i);
        const std::string& name = in->cubes.stratifiers[i].name;
        if (name == "family") {
            EXPECT_TRUE(cuts.empty());  // text: the pair sets keep the labels
            continue;
        }
        ASSERT_FALSE(cuts.empty()) << name;
        EXPECT_EQ(cuts.size() + 1, in->cubes.stratifiers[i].levels.size()) << name;
        Column& c = binned.columns[*binned.find(name)];
        for (double& v : c.values)
            if (!std::isnan(v)) v = static_cast<double>(std::upper_bound(cuts.begin(), cuts.end(), v) - cuts.begin());
        g.coded_in_pairs.push_back(name);
    }
    g.pairs = group_all(binned, 1, 0, true).pairs;
    auto with_pairs = cubes_from_groups(g, spec, copt, true);
    ASSERT_TRUE(with_pairs.ok()) << with_pairs.error().to_string();
    auto got = rate_scan(with_pairs->cubes, with_pairs->question, opt);
    ASSERT_TRUE(got.ok());
    expect_same(*want, *got);
    // Bin numbers outside the levels are refused.
    for (Table& t : g.pairs)
        if (t.columns[2].name == "tenure" && t.columns[3].name == "score") t.columns[3].values[0] = 99;
    EXPECT_FALSE(cubes_from_groups(g, spec, copt, true).ok());
}

TEST(GroupedCubes, CubesThatDoNotFitTheQuestionAreRefused) {
    const Table rows = staffing(600, 3);
    QuestionSpec spec;
    spec.outcome = "hired";
    spec.positive = "yes";
    spec.exposure = "team";
    auto in = cubes_from_groups(group_all(rows, 1, 0, false), spec, {}, false);
    ASSERT_TRUE(in.ok());
    RateScanOptions opt;
    opt.bootstrap = 0;
    // Pairs asked for but not counted.
    EXPECT_FALSE(rate_scan(in->cubes, in->question, opt).ok());
    opt.pairs = false;
    EXPECT_TRUE(rate_scan(in->cubes, in->question, opt).ok());
    // A cube whose strata do not match its stratifier's levels.
    CubeSet bad = in->cubes;
    bad.stratifiers[0].levels.push_back("extra");
    EXPECT_FALSE(rate_scan(bad, in->question, opt).ok());
    // A set whose exposure levels came in another order than the pooled set's.
    GroupedCounts g = group_all(rows, 1, 0, false);
    std::swap(g.singles[0].columns[1].levels[0], g.singles[0].columns[1].levels[1]);
    EXPECT_FALSE(cubes_from_groups(g, spec, {}, false).ok());
}

}  // namespace
}  // namespace foldline
