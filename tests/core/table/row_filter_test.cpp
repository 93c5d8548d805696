#include "core/table/row_filter.h"

#include <gtest/gtest.h>

#include "core/io/csv_reader.h"

using namespace foldline;

namespace {

Table sample() {
    // Blank cells are missing (the reader's default markers).
    auto t = read_csv_text(
        "region,year,income,approved\n"
        "north,2023,10.5,yes\n"
        "south,2024,,no\n"
        ",2024,30,yes\n"
        "east,2022,40,no\n"
        "north,2024,50,yes\n"
        "it's,2024,60,no\n",
        "sample.csv");
    EXPECT_TRUE(t.ok()) << t.error().to_string();
    return std::move(*t);
}

std::vector<std::uint8_t> mask(const std::string& text, const Table& t) {
    auto f = filter::parse(text);
    EXPECT_TRUE(f.ok()) << f.error().to_string();
    auto m = filter::keep_mask(*f, t);
    EXPECT_TRUE(m.ok()) << m.error().to_string();
    return m.ok() ? *m : std::vector<std::uint8_t>{};
}

std::string parse_error(const std::string& text) {
    auto f = filter::parse(text);
    EXPECT_FALSE(f.ok()) << text;
    if (f.ok()) return {};
    EXPECT_EQ(f.error().kind, ErrorKind::Usage);
    return f.error().message;
}

std::string check_error(const std::string& text, const Table& t) {
    auto f = filter::parse(text);
    EXPECT_TRUE(f.ok()) << f.error().to_string();
    auto m = filter::keep_mask(*f, t);
    EXPECT_FALSE(m.ok()) << text;
    if (m.ok()) return {};
    EXPECT_EQ(m.error().kind, ErrorKind::Usage);
    return m.error().message;
}

using Mask = std::vector<std::uint8_t>;

CsvOptions counted() {
    CsvOptions o;
    o.count_column = "n";
    return o;
}

}  // namespace

TEST(RowFilter, ComparesTextAndNumbers) {
    const Table t = sample();
    EXPECT_EQ(mask("region = 'north'", t), (Mask{1, 0, 0, 0, 1, 0}));
    EXPECT_EQ(mask("year >= 2024", t), (Mask{0, 1, 1, 0, 1, 1}));
    EXPECT_EQ(mask("income < 40", t), (Mask{1, 0, 1, 0, 0, 0}));
    EXPECT_EQ(mask("income <= 40 and year > 2022", t), (Mask{1, 0, 1, 0, 0, 0}));
    EXPECT_EQ(mask("region in ('north', 'east')", t), (Mask{1, 0, 0, 1, 1, 0}));
    EXPECT_EQ(mask("year in (2022, 2023)", t), (Mask{1, 0, 0, 1, 0, 0}));
    EXPECT_EQ(mask("region = 'it''s'", t), (Mask{0, 0, 0, 0, 0, 1}));
    EXPECT_EQ(mask("region = 'north' OR year = 2022", t), (Mask{1, 0, 0, 1, 1, 0})) << "keywords in any case";
}

TEST(RowFilter, MissingCellsFollowThreeValuedLogicAsSql) {
    // SQL:1992 three-valued logic (a comparison with NULL is unknown; WHERE keeps only true):
    // the rule every SQL engine applies, and the one the database push-down relies on.
    const Table t = sample();
    EXPECT_EQ(mask("region <> 'north'", t), (Mask{0, 1, 0, 1, 0, 1}));
    EXPECT_EQ(mask("not region = 'north'", t), (Mask{0, 1, 0, 1, 0, 1}));
    EXPECT_EQ(mask("region not in ('north')", t), (Mask{0, 1, 0, 1, 0, 1}));
    EXPECT_EQ(mask("region is missing", t), (Mask{0, 0, 1, 0, 0, 0}));
    EXPECT_EQ(mask("income is not missing", t), (Mask{1, 0, 1, 1, 1, 1}));
    // unknown or true is true; unknown and false is false; not unknown is unknown.
    EXPECT_EQ(mask("region = 'north' or year = 2024", t), (Mask{1, 1, 1, 0, 1, 1}));
    EXPECT_EQ(mask("not (income > 20 and year = 2024)", t), (Mask{1, 0, 0, 1, 0, 0}));
    EXPECT_EQ(mask("not (income > 20 or region = 'east')", t), (Mask{1, 0, 0, 0, 0, 0}));
}

TEST(RowFilter, PrecedenceAndParentheses) {
    const Table t = sample();
    // and binds tighter than or.
    EXPECT_EQ(mask("region = 'east' or region = 'north' and year = 2024", t), (Mask{0, 0, 0, 1, 1, 0}));
    EXPECT_EQ(mask("(region = 'east' or region = 'north') and year = 2024", t), (Mask{0, 0, 0, 0, 1, 0}));
    EXPECT_EQ(mask("   ", t), (Mask{1, 1, 1, 1, 1, 1}));
}

TEST(RowFilter, QuotedNamesAndCanonicalText) {
    auto t = read_csv_text("job grade,and,x\nA,1,2\nB,2,3\n", "q.csv");
    ASSERT_TRUE(t.ok());
    EXPECT_EQ(mask("\"job grade\" = 'A' and \"and\" > 1", *t), (Mask{0, 0}));
    EXPECT_EQ(mask("\"job grade\" = 'B' AND \"and\" > 1", *t), (Mask{0, 1}));
    auto f = filter::parse("  ( \"job grade\"='B'  AND \"and\">1 ) Or NOT x IN (2 ,3)");
    ASSERT_TRUE(f.ok());
    EXPECT_EQ(filter::canonical_text(*f), "\"job grade\" = 'B' and \"and\" > 1 or not x in (2, 3)");
    EXPECT_EQ(filter::to_sql(*f), "\"job grade\" = 'B' AND \"and\" > 1 OR NOT (\"x\" IN (2, 3))");
    // The canonical text reads back to itself.
    auto again = filter::parse(filter::canonical_text(*f));
    ASSERT_TRUE(again.ok());
    EXPECT_EQ(filter::canonical_text(*again), filter::canonical_text(*f));
    EXPECT_EQ(filter::columns(*f), (std::vector<std::string>{"job grade", "and", "x"}));
}

TEST(RowFilter, SqlNeverPastesTheUsersText) {
    auto f = filter::parse("name = 'x''; DROP TABLE t; --' and \"we\"\"ird\" is missing and n > 1e3");
    ASSERT_TRUE(f.ok());
    EXPECT_EQ(filter::to_sql(*f), "\"name\" = 'x''; DROP TABLE t; --' AND \"we\"\"ird\" IS NULL AND \"n\" > 1000");
}

TEST(RowFilter, ErrorsPointAtTheCharacter) {
    EXPECT_EQ(parse_error("region = north"),
              "rows filter, character 10: expected a value ('text in single quotes' or a number), found the name "
              "'north' (text values go in single quotes)");
    EXPECT_EQ(parse_error("region = 'north"),
              "rows filter, character 10: expected a closing single quote for the text that starts here");
    EXPECT_EQ(parse_error("(year > 1"), "rows filter, character 10: expected ')' to close the '(' at character 1, found the end of the filter");
    EXPECT_EQ(parse_error("year > 1)"), "rows filter, character 9: found ')' with no '(' before it");
    EXPECT_EQ(parse_error("year != 1"), "rows filter, character 6: expected = or <> (not-equal is written <>), found '!='");
    EXPECT_EQ(parse_error("year 2024"),
              "rows filter, character 6: expected a comparison (=, <>, <, <=, >, >=), 'in', 'not in' or 'is missing' "
              "after the column 'year', found the number 2024");
    EXPECT_EQ(parse_error("year is null"), "rows filter, character 9: expected 'missing' after 'is', found the name 'null'");
    EXPECT_EQ(parse_error("year in ()"),
              "rows filter, character 10: expected a value ('text in single quotes' or a number), found ')'");
    EXPECT_EQ(parse_error("year = 1 and"), "rows filter, character 13: expected a column name, 'not' or '(', found the end of the filter");
    EXPECT_EQ(parse_error("a = 1 b = 2"), "rows filter, character 7: expected 'and', 'or' or the end of the filter, found the name 'b'");
    EXPECT_EQ(parse_error("a = 12abc"),
              "rows filter, character 7: expected a space or an operator after the number 12 (a column name starting "
              "with a digit goes in double quotes)");
    EXPECT_EQ(parse_error("a = 1; b"), "rows filter, character 6: expected a column name, a value, an operator or a parenthesis, found ';'");
}

TEST(RowFilter, TypeAndColumnErrorsNameTheColumn) {
    const Table t = sample();
    EXPECT_EQ(check_error("branch = 'x'", t),
              "rows filter, character 1: no column named 'branch' in the data (columns: region, year, income, approved)");
    EXPECT_EQ(check_error("Region = 'north'", t).substr(0, 50), "rows filter, character 1: no column named 'Region'")
        << "column names are matched exactly";
    EXPECT_EQ(check_error("year = '2024'", t),
              "rows filter, character 1: column 'year' is numeric: compare it with a number, not the text '2024'");
    EXPECT_EQ(check_error("income > 1 and region = 1", t),
              "rows filter, character 16: column 'region' holds text: write the value in single quotes ('1')");
    EXPECT_EQ(check_error("region < 'n'", t),
              "rows filter, character 1: '<' orders numbers, and column 'region' holds text: use =, <> or in (...)");
}

TEST(RowFilter, ApplyEqualsReadingOnlyTheKeptRows) {
    // The filtered table must be the table a reader gives for a file holding only the kept rows:
    // levels renumbered in order of first appearance, unused levels dropped, weights kept.
    auto full = read_csv_text("g,y,n\nA,1,5\nB,0,2\nC,1,7\nB,1,1\nA,0,4\n", "w.csv",
                              counted());
    ASSERT_TRUE(full.ok()) << full.error().to_string();
    auto f = filter::parse("g <> 'A'");
    ASSERT_TRUE(f.ok());
    auto kept = filter::apply(*f, *full);
    ASSERT_TRUE(kept.ok());
    auto direct = read_csv_text("g,y,n\nB,0,2\nC,1,7\nB,1,1\n", "w.csv", counted());
    ASSERT_TRUE(direct.ok());
    ASSERT_EQ(kept->rows, 3u);
    ASSERT_EQ(kept->columns.size(), direct->columns.size());
    for (std::size_t c = 0; c < kept->columns.size(); ++c) {
        const Column& a = kept->columns[c];
        const Column& b = direct->columns[c];
        EXPECT_EQ(a.name, b.name);
        EXPECT_EQ(a.type, b.type);
        EXPECT_EQ(a.levels, b.levels);
        EXPECT_EQ(a.missing_count, b.missing_count);
        for (std::size_t r = 0; r < 3; ++r) {
            if (a.is_numeric()) EXPECT_EQ(a.values[r], b.values[r]);
            else EXPECT_EQ(a.code(r), b.code(r));
        }
    }
    EXPECT_EQ(kept->weights, direct->weights);
    EXPECT_EQ(kept->weight_column, "n");
}

TEST(RowFilter, KeepsTheColumnsLabelsAndDescriptions) {
    // A statistical file's variable label and the codes behind its value labels describe the
    // column; keeping fewer rows must not drop them.
    Table t = sample();
    t.columns[0].label = "Region of the branch";
    t.columns[3].description = "1 = yes; 2 = no";
    auto f = filter::parse("year = 2024");
    ASSERT_TRUE(f.ok());
    auto kept = filter::apply(*f, t);
    ASSERT_TRUE(kept.ok()) << kept.error().to_string();
    EXPECT_EQ(kept->rows, 4u);
    EXPECT_EQ(kept->columns[0].label, "Region of the branch");
    EXPECT_EQ(kept->columns[3].description, "1 = yes; 2 = no");
}

TEST(RowFilter, DeepOrLongFiltersAreRefusedWithAMessage) {
    // Bounds on nesting and on the number of tests keep every walk of the tree shallow.
    std::string nested;
    for (int i = 0; i < 100; ++i) nested += "(";
    nested += "year = 2024";
    for (int i = 0; i < 100; ++i) nested += ")";
    auto ok = filter::parse(nested);
    ASSERT_TRUE(ok.ok()) << ok.error().to_string();
    EXPECT_EQ(filter::canonical_text(*ok), "year = 2024");
    EXPECT_EQ(parse_error("(" + nested + ")"),
              "rows filter, character 101: expected a test, found '(' nested more than 100 deep ('not' and '(' "
              "together)");
    std::string nots;
    for (int i = 0; i < 101; ++i) nots += "not ";
    EXPECT_EQ(parse_error(nots + "year = 1").substr(0, 48), "rows filter, character 401: expected a test, fou");

    std::string chain = "year = 0";
    for (int i = 1; i < 1000; ++i) chain += " or year = " + std::to_string(i);
    auto long_ok = filter::parse(chain);
    ASSERT_TRUE(long_ok.ok()) << long_ok.error().to_string();
    const Table t = sample();
    auto m = filter::keep_mask(*long_ok, t);
    ASSERT_TRUE(m.ok());
    EXPECT_EQ(*m, (Mask{0, 0, 0, 0, 0, 0})) << "years 0..999 hold none of 2022..2024";
    const std::string more = chain + " or year = 2024";
    EXPECT_EQ(parse_error(more), "rows filter, character " + std::to_string(chain.size() + 5) +
                                     ": a filter holds at most 1000 tests");
}
