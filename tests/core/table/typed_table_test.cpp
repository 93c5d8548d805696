// Tests of core/table/typed_table.h.
//
// Worked example: kidney-stone treatment success by stone size, Charig et al., BMJ 1986, as
// discussed by Julious & Mullee, BMJ 1994 ("Confounding and Simpson's paradox") [from memory]:
//   treatment A (focal):     small stones 81/87,  large stones 192/263  → pooled 273/350 (78%)
//   treatment B (reference): small stones 234/270, large stones 55/80   → pooled 289/350 (83%)
// A is better within each size yet worse pooled: the table must carry these counts exactly.
#include "core/table/typed_table.h"

#include <gtest/gtest.h>

#include <limits>
#include <map>

using namespace foldline;

namespace {

std::vector<TypedStratum> kidney_stones() {
    return {{"small", 81, 87, 234, 270}, {"large", 192, 263, 55, 80}};
}

// Weighted positives and totals per (stratum level or "*", group label) read back from a table.
std::map<std::pair<std::string, std::string>, std::pair<double, double>> tally(const Table& t) {
    std::map<std::pair<std::string, std::string>, std::pair<double, double>> out;
    const Column& s = t.columns[0];
    const Column& g = t.columns[1];
    const Column& y = t.columns[2];
    for (std::size_t i = 0; i < t.rows; ++i) {
        const std::string level = s.levels[s.code(i)], group = g.levels[g.code(i)];
        const bool positive = y.levels[y.code(i)] == "1";
        for (const auto& key : {std::make_pair(level, group), std::make_pair(std::string("*"), group)}) {
            out[key].first += positive ? t.weight(i) : 0.0;
            out[key].second += t.weight(i);
        }
    }
    return out;
}

std::pair<std::string, std::string> key(const char* level, const char* group) { return {level, group}; }
using Counts = std::pair<double, double>;

TEST(TableFromCounts, CarriesAPublishedStratifiedTableExactly) {
    auto t = table_from_counts(kidney_stones(), "stone_size", "treatment", "success", "A", "B");
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->rows, 8u);
    ASSERT_EQ(t->columns.size(), 3u);
    EXPECT_EQ(t->columns[0].name, "stone_size");
    EXPECT_EQ(t->columns[0].levels, (std::vector<std::string>{"small", "large"}));
    EXPECT_EQ(t->columns[1].levels, (std::vector<std::string>{"A", "B"}));
    EXPECT_EQ(t->columns[2].levels, (std::vector<std::string>{"1", "0"}));
    EXPECT_TRUE(t->weighted());
    EXPECT_DOUBLE_EQ(t->total_weight(), 700.0);

    auto m = tally(*t);
    EXPECT_EQ(m[key("small", "A")], Counts(81.0, 87.0));
    EXPECT_EQ(m[key("large", "A")], Counts(192.0, 263.0));
    EXPECT_EQ(m[key("small", "B")], Counts(234.0, 270.0));
    EXPECT_EQ(m[key("large", "B")], Counts(55.0, 80.0));
    EXPECT_EQ(m[key("*", "A")], Counts(273.0, 350.0));
    EXPECT_EQ(m[key("*", "B")], Counts(289.0, 350.0));
    // The reversal the source describes.
    EXPECT_GT(81.0 / 87, 234.0 / 270);
    EXPECT_GT(192.0 / 263, 55.0 / 80);
    EXPECT_LT(m[key("*", "A")].first / 350, m[key("*", "B")].first / 350);
}

TEST(TableFromCounts, DefaultsAndZeroCells) {
    auto t = table_from_counts({{"only", 0, 0, 5, 5}});
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->columns[0].name, "stratum");
    EXPECT_EQ(t->columns[1].name, "group");
    EXPECT_EQ(t->columns[2].name, "outcome");
    EXPECT_EQ(t->columns[1].levels, (std::vector<std::string>{"focal", "reference"}));
    EXPECT_EQ(t->weights, (std::vector<double>{0, 0, 5, 0}));  // zero cells kept so every level exists
}

TEST(TableFromCounts, KeepsTheTypedOutcomeLabels) {
    auto t = table_from_counts(kidney_stones(), "stone_size", "treatment", "success", "A", "B", "success",
                               "no success");
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->columns[2].levels, (std::vector<std::string>{"success", "no success"}));
    EXPECT_EQ(t->columns[1].levels, (std::vector<std::string>{"A", "B"}));
    // Same counts as with the default labels: the first level holds the positives.
    EXPECT_EQ(t->weights, table_from_counts(kidney_stones())->weights);
    EXPECT_FALSE(table_from_counts(kidney_stones(), "s", "g", "y", "A", "B", "same", "same").ok());
    EXPECT_FALSE(table_from_counts(kidney_stones(), "s", "g", "y", "A", "B", "", "no").ok());
}

TEST(TableFromCounts, RejectsImpossibleCounts) {
    struct Bad {
        std::vector<TypedStratum> strata;
        std::string fragment;
    };
    const std::vector<Bad> cases = {
        {{}, "no strata"},
        {{{"s", 5, 4, 1, 2}}, "focal positives exceed"},
        {{{"s", 1, 4, 3, 2}}, "reference positives exceed"},
        {{{"s", -1, 4, 1, 2}}, "whole number"},
        {{{"s", 1.5, 4, 1, 2}}, "whole number"},
        {{{"s", 1, 4, 1, std::numeric_limits<double>::infinity()}}, "whole number"},
        {{{"s", 1, std::numeric_limits<double>::quiet_NaN(), 1, 2}}, "whole number"},
        {{{"s", 1, 4, 1, 2}, {"s", 1, 4, 1, 2}}, "appears twice"},
        {{{"", 1, 4, 1, 2}}, "no label"},
    };
    for (const auto& c : cases) {
        auto t = table_from_counts(c.strata);
        ASSERT_FALSE(t.ok()) << c.fragment;
        EXPECT_NE(t.error().message.find(c.fragment), std::string::npos) << t.error().to_string();
    }
    EXPECT_FALSE(table_from_counts(kidney_stones(), "x", "x").ok());
    EXPECT_FALSE(table_from_counts(kidney_stones(), "s", "g", "y", "same", "same").ok());
    auto bad_row = table_from_counts({{"a", 1, 2, 1, 2}, {"b", 3, 2, 1, 2}});
    ASSERT_FALSE(bad_row.ok());
    EXPECT_EQ(bad_row.error().line, 2u);
}

}  // namespace
