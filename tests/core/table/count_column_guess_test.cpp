// Tests of core/table/count_column_guess.h.
//
// Worked example: the kidney-stone table of Charig et al., BMJ 1986, as discussed by Julious &
// Mullee, BMJ 1994 [from memory], written as a pre-counted file (one row per treatment × stone
// size × success cell, 700 patients in all). A pre-counted file is the same cells with a count
// column; a row-level file repeats combinations or has a measurement column.
#include "core/io/csv_reader.h"
#include "core/table/count_column_guess.h"

#include <gtest/gtest.h>

using namespace foldline;

namespace {

constexpr const char* kKidneyCells =
    "treatment,stone_size,success,n\n"
    "A,small,yes,81\nA,small,no,6\nA,large,yes,192\nA,large,no,71\n"
    "B,small,yes,234\nB,small,no,36\nB,large,yes,55\nB,large,no,25\n";

Table read(const std::string& text, const CsvOptions& o = {}) {
    auto t = read_csv_text(text, "cells.csv", o);
    EXPECT_TRUE(t.ok()) << t.error().to_string();
    return t.ok() ? std::move(t).value() : Table{};
}

TEST(CountColumnGuess, NamesThatReadLikeCounts) {
    for (const char* yes : {"n", "N", "count", "Counts", "freq", "frequency", "weight", "patients", "n_patients",
                            "patient count", "num-cases", "Total.Count", "cnt"})
        EXPECT_TRUE(looks_like_count_name(yes)) << yes;
    for (const char* no : {"", "age", "income", "amount", "nation", "country", "weighted_score", "number1", "footfall"})
        EXPECT_FALSE(looks_like_count_name(no)) << no;
}

TEST(CountColumnGuess, ProposesTheCountOfAPublishedCellTable) {
    const Table t = read(kKidneyCells);
    const auto g = guess_count_column(t);
    ASSERT_TRUE(g.has_value());
    EXPECT_EQ(g->column, "n");
    EXPECT_DOUBLE_EQ(g->total, 700.0);  // 350 patients per treatment (Charig et al. 1986)
}

TEST(CountColumnGuess, ProposesTheClinicSampleCountColumn) {
    auto t = read_csv(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/clinic_outcomes_counts.csv");
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    const auto g = guess_count_column(*t);
    ASSERT_TRUE(g.has_value());
    EXPECT_EQ(g->column, "patients");
    // The same file read row by row has no count column to propose.
    auto rows = read_csv(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/clinic_outcomes.csv");
    ASSERT_TRUE(rows.ok()) << rows.error().to_string();
    EXPECT_FALSE(guess_count_column(*rows).has_value());
}

TEST(CountColumnGuess, ProposesNothingWhenAnyTestFails) {
    // A combination repeated: rows are observations, not cells.
    EXPECT_FALSE(guess_count_column(read(std::string(kKidneyCells) + "A,small,yes,3\n")).has_value());
    // A fractional or negative value is no count.
    EXPECT_FALSE(guess_count_column(read("g,y,n\nA,yes,1.5\nA,no,2\nB,yes,3\nB,no,4\n")).has_value());
    EXPECT_FALSE(guess_count_column(read("g,y,n\nA,yes,-1\nA,no,2\nB,yes,3\nB,no,4\n")).has_value());
    // A missing count.
    EXPECT_FALSE(guess_count_column(read("g,y,n\nA,yes,\nA,no,2\nB,yes,3\nB,no,4\n")).has_value());
    // A name that does not read like a count.
    EXPECT_FALSE(guess_count_column(read("g,y,age\nA,yes,31\nA,no,42\nB,yes,35\nB,no,47\n")).has_value());
    // Another column nearly unique per row (an identifier): row-level data.
    EXPECT_FALSE(guess_count_column(read("id,g,visits\n1,A,2\n2,A,0\n3,B,1\n4,B,5\n")).has_value());
    // Already read with a count column.
    CsvOptions o;
    o.count_column = "n";
    EXPECT_FALSE(guess_count_column(read(kKidneyCells, o)).has_value());
}

TEST(CountColumnGuess, MissingCellsCountAsAValueOfTheirOwn) {
    // "B, (missing)" and "B,no" are different cells.
    const auto g = guess_count_column(read("g,y,n\nA,yes,1\nA,no,2\nB,,3\nB,no,4\nB,yes,0\nA,,1\n"));
    ASSERT_TRUE(g.has_value());
    EXPECT_DOUBLE_EQ(g->total, 11.0);
}

}  // namespace
