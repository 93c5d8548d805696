// Tests of core/table/column_profile.h: the candidate selection's rule for leaving a column out
// before counting, and its words (the same in every scan path).
#include "core/table/column_profile.h"

#include <gtest/gtest.h>

namespace foldline {
namespace {

ColumnProfile text(double rows, double missing, double distinct, bool row_level = true) {
    ColumnProfile p;
    p.rows = rows;
    p.missing = missing;
    p.distinct = distinct;
    p.categorical = true;
    p.row_level = row_level;
    return p;
}

TEST(ColumnProfile, EachRuleWithItsWords) {
    EXPECT_EQ(exclusion_reason(text(100, 60, 3), 50, 0.5), "mostly missing (60 of 100 rows)");
    EXPECT_EQ(exclusion_reason(text(100, 50, 3), 50, 0.5), std::nullopt);  // exactly half: kept
    EXPECT_EQ(exclusion_reason(text(100, 0, 1), 50, 0.5), "constant");
    EXPECT_EQ(exclusion_reason(text(100, 0, 0), 50, 0.5), "constant");
    EXPECT_EQ(exclusion_reason(text(120, 10, 110), 50, 0.5), "one value per row");
    EXPECT_EQ(exclusion_reason(text(120, 0, 60), 50, 0.5), "too many levels (60 > 50)");
    EXPECT_EQ(exclusion_reason(text(120, 0, 50), 50, 0.5), std::nullopt);
}

TEST(ColumnProfile, RulesAreTriedInOrder) {
    // Mostly missing wins over everything; constant over one value per row.
    EXPECT_EQ(exclusion_reason(text(100, 99, 1), 50, 0.5), "mostly missing (99 of 100 rows)");
    EXPECT_EQ(exclusion_reason(text(100, 0, 100), 50, 0.5), "one value per row");
    // Few rows: a different value in each is not "one value per row" but may be too many levels.
    EXPECT_EQ(exclusion_reason(text(40, 0, 40), 50, 0.5), std::nullopt);
    EXPECT_EQ(exclusion_reason(text(40, 2, 35), 30, 0.5), "too many levels (35 > 30)");
}

TEST(ColumnProfile, PreCountedSourcesAndNumericColumns) {
    // A pre-counted source: a row stands for many, so a value per row says nothing.
    EXPECT_EQ(exclusion_reason(text(120, 0, 120, false), 500, 0.5), std::nullopt);
    EXPECT_EQ(exclusion_reason(text(120, 0, 120, false), 50, 0.5), "too many levels (120 > 50)");
    // Weighted counts in the words are whole rows.
    EXPECT_EQ(exclusion_reason(text(1000.75, 700.5, 2, false), 50, 0.5), "mostly missing (700 of 1000 rows)");
    // A numeric column is only ever left out here for its missing share.
    ColumnProfile num = text(100, 0, 1);
    num.categorical = false;
    EXPECT_EQ(exclusion_reason(num, 50, 0.5), std::nullopt);
    num.distinct = 1000;
    EXPECT_EQ(exclusion_reason(num, 50, 0.5), std::nullopt);
    num.missing = 51;
    EXPECT_EQ(exclusion_reason(num, 50, 0.5), "mostly missing (51 of 100 rows)");
    // No rows: nothing is mostly missing, and a text column is constant.
    EXPECT_EQ(exclusion_reason(text(0, 0, 0), 50, 0.5), "constant");
}

}  // namespace
}  // namespace foldline
