#include "core/scan/candidates.h"

#include <gtest/gtest.h>

#include <cmath>

#include "tests/core/scan/synthetic_table.h"

using namespace foldline;
using foldline::testing::numbered;
using foldline::testing::cat_column;

TEST(Candidates, ReasonsForEveryLeftOutColumn) {
    const int n = 120;
    std::vector<std::string> g, y, site, constant, id, mostly_missing, copy, many;
    std::vector<double> score, count;
    for (int i = 0; i < n; ++i) {
        g.push_back(i % 3 ? "A" : "B");
        y.push_back(i % 2 ? "1" : "0");
        site.push_back(numbered("s", i % 4));
        constant.push_back("same");
        id.push_back(numbered("row", i));
        mostly_missing.push_back(i < 100 ? "" : numbered("x", i % 2));
        copy.push_back(i % 3 ? "grp1" : "grp2");  // same partition as g
        many.push_back(numbered("v", i % 60));
        score.push_back(0.5 * i + 0.25);
        count.push_back(i % 5);
    }
    Table t;
    for (auto [name, v] : std::vector<std::pair<std::string, std::vector<std::string>>>{
             {"g", g}, {"y", y}, {"site", site}, {"constant", constant}, {"id", id},
             {"mostly_missing", mostly_missing}, {"copy", copy}, {"many", many}})
        t.columns.push_back(cat_column(name, v));
    t.columns.push_back(Column::numeric("score", score));
    t.columns.push_back(Column::numeric("children", count));
    t.rows = n;

    auto r = select_candidates(t, {"g", "y"}, CandidateOptions{}, t.column("g"));
    ASSERT_TRUE(r.ok());
    std::vector<std::string> names;
    for (const auto& c : r->candidates) names.push_back(c.name);
    EXPECT_EQ(names, (std::vector<std::string>{"site", "score", "children"}));
    EXPECT_EQ(r->candidates[1].origin, "quantile bins (4)");
    EXPECT_EQ(r->candidates[1].column->levels.size(), 4u);
    EXPECT_EQ(r->candidates[2].origin, "integer levels");
    std::map<std::string, std::string> why;
    for (const auto& e : r->excluded) why[e.column] = e.reason;
    EXPECT_EQ(why["constant"], "constant");
    EXPECT_EQ(why["id"], "one value per row");
    EXPECT_EQ(why["mostly_missing"].rfind("mostly missing", 0), 0u);
    EXPECT_EQ(why["copy"], "identical to the exposure");
    EXPECT_EQ(why["many"], "too many levels (60 > 50)");
    EXPECT_EQ(why.size(), 5u);

    CandidateOptions no_bins;
    no_bins.bins = 0;
    r = select_candidates(t, {"g", "y"}, no_bins, t.column("g"));
    ASSERT_TRUE(r.ok());
    bool score_out = false;
    for (const auto& e : r->excluded) score_out |= e.column == "score";
    EXPECT_TRUE(score_out);

    CandidateOptions listed;
    listed.columns = {"site", "nope"};
    EXPECT_FALSE(select_candidates(t, {"g", "y"}, listed).ok());
    listed.columns = {"y"};
    EXPECT_FALSE(select_candidates(t, {"g", "y"}, listed).ok());
}

// Numeric columns are converted on CandidateOptions::threads threads, one column per task:
// the candidates, their levels and every code are the same on one thread and on several.
TEST(Candidates, SelectionDoesNotDependOnTheThreadCount) {
    const int n = 500;
    Table t;
    std::vector<std::string> g;
    for (int i = 0; i < n; ++i) g.push_back(i % 2 ? "A" : "B");
    t.columns.push_back(cat_column("g", g));
    for (int c = 0; c < 7; ++c) {
        std::vector<double> v;
        for (int i = 0; i < n; ++i) v.push_back(c % 2 ? static_cast<double>((i * (c + 3)) % (c + 4)) : 0.37 * ((i * 7919 + c) % 211));
        t.columns.push_back(Column::numeric(numbered("x", c), v));
    }
    t.rows = n;
    CandidateOptions o;
    o.threads = 1;
    auto one = select_candidates(t, {"g"}, o);
    ASSERT_TRUE(one.ok());
    ASSERT_EQ(one->candidates.size(), 7u);
    for (unsigned threads : {2u, 4u, 0u}) {
        o.threads = threads;
        auto many = select_candidates(t, {"g"}, o);
        ASSERT_TRUE(many.ok());
        ASSERT_EQ(many->candidates.size(), one->candidates.size());
        for (std::size_t k = 0; k < one->candidates.size(); ++k) {
            const auto& a = one->candidates[k];
            const auto& b = many->candidates[k];
            EXPECT_EQ(a.name, b.name);
            EXPECT_EQ(a.origin, b.origin);
            EXPECT_EQ(a.column->levels, b.column->levels);
            for (std::size_t i = 0; i < t.rows; ++i) ASSERT_EQ(a.column->code(i), b.column->code(i)) << a.name << " row " << i;
        }
    }
}

TEST(Candidates, SamePartitionIgnoresLabels) {
    auto a = cat_column("a", {"x", "y", "x", ""});
    auto b = cat_column("b", {"1", "2", "1", ""});
    auto c = cat_column("c", {"1", "2", "2", ""});
    EXPECT_TRUE(same_partition(a, b));
    EXPECT_FALSE(same_partition(a, c));
}
