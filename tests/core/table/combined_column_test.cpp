#include "core/table/combined_column.h"

#include <gtest/gtest.h>

#include "core/io/csv_reader.h"

using namespace foldline;

TEST(CombinedColumn, PartsResolveOnlyToColumns) {
    auto t = read_csv_text("sex,ethnicity,a+b,a,b\nf,x,1,1,2\n", "t.csv");
    ASSERT_TRUE(t.ok());
    EXPECT_EQ(combined_parts(*t, "sex+ethnicity"), (std::vector<std::string>{"sex", "ethnicity"}));
    EXPECT_TRUE(combined_parts(*t, "a+b").empty()) << "a column of that name is that column";
    EXPECT_TRUE(combined_parts(*t, "sex").empty());
    EXPECT_TRUE(combined_parts(*t, "sex+age").empty());
    EXPECT_TRUE(combined_parts(*t, "sex+sex").empty());
    EXPECT_TRUE(combined_parts(*t, "sex+").empty());
}

TEST(CombinedColumn, LevelsAreTheCombinationsInOrderOfFirstAppearance) {
    auto t = read_csv_text("sex,band,y\nf,2,1\nm,1,0\nf,2,0\n,1,1\nm,2,1\nf,1,0\n", "t.csv");
    ASSERT_TRUE(t.ok());
    auto c = combine_columns(*t, {"sex", "band"}, "sex+band");
    ASSERT_TRUE(c.ok()) << c.error().to_string();
    EXPECT_EQ(c->name, "sex+band");
    EXPECT_EQ(c->levels, (std::vector<std::string>{"f+2", "m+1", "m+2", "f+1"}));
    EXPECT_EQ(c->missing_count, 1u);
    EXPECT_TRUE(c->is_missing(3));
    EXPECT_EQ(c->code(0), c->code(2));
    EXPECT_EQ(c->levels[c->code(5)], "f+1");
    EXPECT_FALSE(combine_columns(*t, {"sex"}, "sex").ok());
    EXPECT_FALSE(combine_columns(*t, {"sex", "nope"}, "sex+nope").ok());
}
