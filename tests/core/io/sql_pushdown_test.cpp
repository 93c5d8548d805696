// SQL text of the push-down scan (core/io/sql_pushdown.h). No database needed: the quoting rule
// is the one of SQL:1999 delimited identifiers (PostgreSQL manual, 4.1.1 "Identifiers and Key
// Words": a double quote inside a quoted identifier is written twice) [from memory]; the
// queries are run against a real PostgreSQL server by tests/reference/sql_pushdown_test.sh.
#include "core/io/sql_pushdown.h"

#include <gtest/gtest.h>

#include <cmath>

namespace foldline::sql {
namespace {

TEST(SqlQuote, DoublesEmbeddedQuotesAndKeepsSpacesAndReservedWords) {
    EXPECT_EQ(quote_identifier("branch"), "\"branch\"");
    EXPECT_EQ(quote_identifier("loan amount"), "\"loan amount\"");
    EXPECT_EQ(quote_identifier("select"), "\"select\"");
    EXPECT_EQ(quote_identifier("a\"b"), "\"a\"\"b\"");
    EXPECT_EQ(quote_identifier("\"\""), "\"\"\"\"\"\"");
    EXPECT_EQ(quote_identifier("x; DROP TABLE t"), "\"x; DROP TABLE t\"");
}

TEST(SqlQuote, TableNamesSplitOnDots) {
    EXPECT_EQ(*quote_table_name("loans"), "\"loans\"");
    EXPECT_EQ(*quote_table_name("audit.loans"), "\"audit\".\"loans\"");
    EXPECT_EQ(*quote_table_name("my table"), "\"my table\"");
    EXPECT_FALSE(quote_table_name("").ok());
    EXPECT_FALSE(quote_table_name("a..b").ok());
    EXPECT_FALSE(quote_table_name(".t").ok());
    EXPECT_FALSE(quote_table_name("t.").ok());
}

TEST(SqlQuery, AcceptsOneReadOnlyStatement) {
    EXPECT_EQ(*checked_query("  SELECT * FROM loans \n"), "SELECT * FROM loans");
    EXPECT_TRUE(checked_query("select a from t where b = 'x;y'").ok());
    EXPECT_TRUE(checked_query("WITH r AS (SELECT 1 AS \"semi;colon\") SELECT * FROM r").ok());
    EXPECT_TRUE(checked_query("-- a comment; with a semicolon\nSELECT 1").ok());
    EXPECT_TRUE(checked_query("/* update; */ (SELECT 1)").ok());
    EXPECT_TRUE(checked_query("SELECT 'it''s; fine' AS \"update\"").ok());
    EXPECT_TRUE(checked_query("SELECT updated_at, offset_days FROM t").ok());
}

TEST(SqlQuery, RefusesSemicolonsOtherStatementsAndWrites) {
    auto semi = checked_query("SELECT 1; DROP TABLE loans");
    ASSERT_FALSE(semi.ok());
    EXPECT_NE(semi.error().message.find("';'"), std::string::npos);
    EXPECT_NE(semi.error().message.find("character 9"), std::string::npos);
    EXPECT_FALSE(checked_query("SELECT 1;").ok());
    EXPECT_FALSE(checked_query("DELETE FROM loans").ok());
    EXPECT_FALSE(checked_query("INSERT INTO t VALUES (1)").ok());
    EXPECT_FALSE(checked_query("SELECT * INTO copy_of_loans FROM loans").ok());
    EXPECT_FALSE(checked_query("WITH d AS (DELETE FROM t RETURNING *) SELECT * FROM d").ok());
    EXPECT_FALSE(checked_query("VALUES (1)").ok());
    EXPECT_FALSE(checked_query("").ok());
    EXPECT_FALSE(checked_query("   -- only a comment").ok());
    EXPECT_FALSE(checked_query("SELECT 'unterminated").ok());
    EXPECT_FALSE(checked_query("SELECT \"unterminated").ok());
    EXPECT_FALSE(checked_query("SELECT 1 /* open").ok());
    EXPECT_FALSE(checked_query("'x' SELECT").ok());
}

TEST(SqlSourceClause, WrapsTheQueryAsADerivedTable) {
    EXPECT_EQ(*from_clause({"loans", ""}), "\"loans\" AS src");
    EXPECT_EQ(*from_clause({"", "SELECT * FROM loans WHERE year = 2024"}),
              "(SELECT * FROM loans WHERE year = 2024) AS src");
    EXPECT_FALSE(from_clause({"", ""}).ok());
    EXPECT_FALSE(from_clause({"t", "SELECT 1"}).ok());
    EXPECT_FALSE(from_clause({"", "SELECT 1; SELECT 2"}).ok());
}

TEST(SqlText, DescribeAndProfile) {
    EXPECT_EQ(describe_sql("\"t\" AS src"), "SELECT * FROM \"t\" AS src WHERE 1 = 0");
    // One set per column; on column k's row COUNT(c_k) is its distinct values, the SUM its rows.
    EXPECT_EQ(profile_sql("\"t\" AS src", {"a b", "c"}),
              "SELECT g0, g1, COUNT(\"a b\"), SUM(CASE WHEN \"a b\" IS NOT NULL THEN n ELSE 0 END), COUNT(\"c\"), "
              "SUM(CASE WHEN \"c\" IS NOT NULL THEN n ELSE 0 END), SUM(n) FROM (SELECT \"a b\", \"c\", "
              "GROUPING(\"a b\") AS g0, GROUPING(\"c\") AS g1, COUNT(*) AS n FROM \"t\" AS src GROUP BY GROUPING SETS "
              "((\"a b\"), (\"c\"))) AS distinct_values GROUP BY g0, g1");
    EXPECT_EQ(profile_sql("\"t\" AS src", {}), "SELECT COUNT(*) FROM \"t\" AS src");
    // Cells first: the same sets over the joint cells, whose counts are summed.
    EXPECT_EQ(profile_sql("\"t\" AS src", {"a b", "c"}, true),
              "SELECT g0, g1, COUNT(\"a b\"), SUM(CASE WHEN \"a b\" IS NOT NULL THEN n ELSE 0 END), COUNT(\"c\"), "
              "SUM(CASE WHEN \"c\" IS NOT NULL THEN n ELSE 0 END), SUM(n) FROM (SELECT \"a b\", \"c\", "
              "GROUPING(\"a b\") AS g0, GROUPING(\"c\") AS g1, SUM(n) AS n FROM (SELECT \"a b\", \"c\", COUNT(*) AS n "
              "FROM \"t\" AS src GROUP BY \"a b\", \"c\") AS cells GROUP BY GROUPING SETS ((\"a b\"), (\"c\"))) AS "
              "distinct_values GROUP BY g0, g1");
}

TEST(SqlText, CellsGroupEveryColumnAndKeepFirstAppearance) {
    EXPECT_EQ(cells_sql("\"t\" AS src", {"o", "e"}, false),
              "SELECT \"o\", \"e\", COUNT(*) AS \"foldline_rows\" FROM \"t\" AS src GROUP BY \"o\", \"e\"");
    EXPECT_EQ(cells_sql("\"t\" AS src", {"o"}, true),
              "SELECT \"o\", COUNT(*) AS \"foldline_rows\", MIN(\"foldline_first_row\") AS \"foldline_first_row\" "
              "FROM (SELECT \"o\", ROW_NUMBER() OVER () AS \"foldline_first_row\" FROM \"t\" AS src) AS numbered "
              "GROUP BY \"o\" ORDER BY \"foldline_first_row\"");
    EXPECT_EQ(cells_sql("\"t\" AS src", {}, true), "");
    // A pre-counted source sums its count column.
    EXPECT_EQ(cells_sql("\"t\" AS src", {"o"}, false, "n"),
              "SELECT \"o\", SUM(CAST(\"n\" AS DOUBLE PRECISION)) AS \"foldline_rows\" FROM \"t\" AS src GROUP BY \"o\"");
    EXPECT_NE(cells_sql("\"t\" AS src", {"o"}, true, "n").find("SELECT \"o\", \"n\", ROW_NUMBER() OVER ()"),
              std::string::npos);
}

TEST(SqlText, CubesUseOneGroupingSetPerStratifierAndPair) {
    const std::string s = cubes_sql("\"t\" AS src", "approved", "group", {"branch", "term"}, true);
    EXPECT_EQ(s,
              "SELECT \"approved\", \"group\", \"branch\", \"term\", GROUPING(\"branch\") AS g0, "
              "GROUPING(\"term\") AS g1, SUM(\"foldline_rows\") AS \"foldline_rows\" FROM (SELECT \"approved\", "
              "\"group\", \"branch\", \"term\", COUNT(*) AS \"foldline_rows\" FROM \"t\" AS src GROUP BY \"approved\", "
              "\"group\", \"branch\", \"term\") AS cells GROUP BY GROUPING SETS "
              "((\"approved\", \"group\", \"branch\"), (\"approved\", \"group\", \"term\"), "
              "(\"approved\", \"group\", \"branch\", \"term\"))");
    const std::string singles = cubes_sql("\"t\" AS src", "o", "e", {"a", "b", "c"}, false);
    EXPECT_EQ(singles.find("\"a\", \"b\")"), std::string::npos);
    // 3 stratifiers with pairs: 3 + 3 sets.
    const std::string all = cubes_sql("\"t\" AS src", "o", "e", {"a", "b", "c"}, true);
    std::size_t sets = 0;
    for (std::size_t p = all.find("(\"o\", \"e\""); p != std::string::npos; p = all.find("(\"o\", \"e\"", p + 1)) ++sets;
    EXPECT_EQ(sets, 6u);
    EXPECT_EQ(cubes_sql("x", "o", "e", {}, true),
              "SELECT \"o\", \"e\", SUM(\"foldline_rows\") AS \"foldline_rows\" FROM (SELECT \"o\", \"e\", COUNT(*) AS "
              "\"foldline_rows\" FROM x GROUP BY \"o\", \"e\") AS cells GROUP BY GROUPING SETS ((\"o\", \"e\"))");
}

TEST(SqlText, CubesWithThePooledSetFirstAppearanceAndACountColumn) {
    CubesQuery q;
    q.outcome = "o";
    q.exposure = "e";
    q.strata = {"a b", "c"};
    q.pooled = true;
    q.first_appearance = true;
    EXPECT_EQ(cubes_sql("\"t\" AS src", q),
              "SELECT \"o\", \"e\", \"a b\", \"c\", GROUPING(\"a b\") AS g0, GROUPING(\"c\") AS g1, "
              "SUM(\"foldline_rows\") AS \"foldline_rows\", MIN(\"foldline_first_row\") AS \"foldline_first_row\" "
              "FROM (SELECT \"o\", \"e\", \"a b\", \"c\", COUNT(*) AS \"foldline_rows\", MIN(\"foldline_first_row\") AS "
              "\"foldline_first_row\" FROM (SELECT \"o\", \"e\", \"a b\", \"c\", ROW_NUMBER() OVER () AS "
              "\"foldline_first_row\" FROM \"t\" AS src) AS numbered GROUP BY \"o\", \"e\", \"a b\", \"c\") AS cells "
              "GROUP BY GROUPING SETS ((\"o\", \"e\"), (\"o\", \"e\", \"a b\"), "
              "(\"o\", \"e\", \"c\"), (\"o\", \"e\", \"a b\", \"c\")) ORDER BY \"foldline_first_row\"");
    q.count_column = "n";
    q.pairs = false;
    const std::string w = cubes_sql("x", q);
    EXPECT_NE(w.find("SUM(CAST(\"n\" AS DOUBLE PRECISION)) AS \"foldline_rows\""), std::string::npos);
    EXPECT_NE(w.find("\"c\", \"n\", ROW_NUMBER() OVER ()"), std::string::npos);
    EXPECT_EQ(w.find("(\"o\", \"e\", \"a b\", \"c\")"), std::string::npos);
}

TEST(SqlText, PairsOnlyWithANumericColumnBinnedInTheEngine) {
    CubesQuery q;
    q.outcome = "o";
    q.exposure = "e";
    q.strata = {"income", "branch"};
    q.cuts = {{30000.5, 60000}, {}};
    q.singles = false;
    const std::string s = cubes_sql("\"t\" AS src", q);
    EXPECT_NE(s.find("FROM (SELECT \"o\", \"e\", CASE WHEN \"income\" IS NULL THEN NULL WHEN CAST(\"income\" AS "
                     "DOUBLE PRECISION) < 30000.5 THEN 0 WHEN CAST(\"income\" AS DOUBLE PRECISION) < 60000 THEN 1 "
                     "ELSE 2 END AS \"income\", \"branch\" FROM \"t\" AS src) AS binned"),
              std::string::npos);
    EXPECT_NE(s.find("GROUP BY GROUPING SETS ((\"o\", \"e\", \"income\", \"branch\"))"), std::string::npos);
}

TEST(SqlText, SlopeMomentsAreCentredByTheOverallMeans) {
    EXPECT_EQ(slope_means_sql("x", "spend", "sales"),
              "SELECT COUNT(*), AVG(CAST(\"spend\" AS DOUBLE PRECISION)), AVG(CAST(\"sales\" AS DOUBLE PRECISION)), "
              "SUM(CASE WHEN CAST(\"sales\" AS DOUBLE PRECISION) IN (0, 1) THEN 0 ELSE 1 END) "
              "FROM x WHERE \"spend\" IS NOT NULL AND \"sales\" IS NOT NULL");
    const std::string m = slope_moments_sql("x", "spend", "sales", {"region"}, 0.1, 1e300);
    EXPECT_NE(m.find("CAST(\"spend\" AS DOUBLE PRECISION) - 0.10000000000000001 AS dx"), std::string::npos);
    EXPECT_NE(m.find("- 1.0000000000000001e+300 AS dy"), std::string::npos);
    EXPECT_NE(m.find("GROUPING(\"region\") AS g0"), std::string::npos);
    EXPECT_NE(m.find("SUM(dx * dy) AS sxy"), std::string::npos);
    EXPECT_NE(m.find("GROUP BY GROUPING SETS ((), (\"region\"))"), std::string::npos);
    EXPECT_NE(m.find("MIN(x) AS x_min, MAX(x) AS x_max"), std::string::npos);
    // Cells first: the same columns, the sets adding the sums of each joint cell of the strata.
    const std::string c = slope_moments_sql("x", "spend", "sales", {"region", "tier"}, 0.1, 2, true);
    EXPECT_NE(c.find("SELECT \"region\", \"tier\", GROUPING(\"region\") AS g0, GROUPING(\"tier\") AS g1, SUM(n) AS n, "
                     "SUM(sx) AS sx, SUM(sy) AS sy, SUM(sxx) AS sxx, SUM(sxy) AS sxy, SUM(syy) AS syy, "
                     "MIN(x_min) AS x_min, MAX(x_max) AS x_max, MIN(y_min) AS y_min, MAX(y_max) AS y_max FROM (SELECT "
                     "\"region\", \"tier\", COUNT(*) AS n, SUM(dx) AS sx"),
              std::string::npos);
    EXPECT_NE(c.find(") AS centred GROUP BY \"region\", \"tier\") AS cells GROUP BY GROUPING SETS ((), (\"region\"), "
                     "(\"tier\"))"),
              std::string::npos);
    // No strata: nothing to group first.
    EXPECT_EQ(slope_moments_sql("x", "a", "b", {}, 1, 2, true), slope_moments_sql("x", "a", "b", {}, 1, 2));
    const std::string nan = slope_moments_sql("x", "a", "b", {}, std::nan(""), 2);
    EXPECT_NE(nan.find("AS DOUBLE PRECISION) - 0 AS dx"), std::string::npos);
}

TEST(SqlText, RobustSlopeErrorUsesTheLeverageOfEachRow) {
    const std::string h = slope_hc3_sql("x", "spend", "sales", 1.5, 2, 0.25, 0.01, 0.5);
    EXPECT_NE(h.find("SELECT SUM(u * u), MIN(omh) FROM (SELECT CASE WHEN (1 - (0.01 + "), std::string::npos);
    EXPECT_NE(h.find("((CAST(\"sales\" AS DOUBLE PRECISION) - 2) - 0.25 * (CAST(\"spend\" AS DOUBLE PRECISION) - 1.5))"),
              std::string::npos);
    EXPECT_NE(h.find("WHERE \"spend\" IS NOT NULL AND \"sales\" IS NOT NULL) AS leverage"), std::string::npos);
}

TEST(SqlSourceClause, RowsFilterWrapsTheSourceWithItsCondition) {
    SqlSource t{"loans", "", "\"year\" >= 2024"};
    EXPECT_EQ(*from_clause(t), "(SELECT * FROM \"loans\" AS src0 WHERE \"year\" >= 2024) AS src");
    SqlSource q{"", "SELECT * FROM loans", "\"region\" IS NULL"};
    EXPECT_EQ(*from_clause(q), "(SELECT * FROM (SELECT * FROM loans) AS src0 WHERE \"region\" IS NULL) AS src");
}

TEST(SqlSourceClause, RowIdOfATableIsNamedInADerivedTable) {
    SqlSource t{"sales.loans", "", "", "ctid"};
    EXPECT_EQ(*from_clause(t),
              "(SELECT src0.*, src0.\"ctid\" AS \"foldline_row_id\" FROM \"sales\".\"loans\" AS src0) AS src");
    t.where = "\"year\" >= 2024";
    EXPECT_EQ(*from_clause(t), "(SELECT src0.*, src0.\"ctid\" AS \"foldline_row_id\" FROM \"sales\".\"loans\" AS src0 "
                               "WHERE \"year\" >= 2024) AS src");
    // A query has no row id: the option is ignored.
    SqlSource q{"", "SELECT * FROM loans", "", "ctid"};
    EXPECT_EQ(*from_clause(q), "(SELECT * FROM loans) AS src");
}

TEST(SqlText, FirstAppearanceByRowIdNeedsNoNumbering) {
    EXPECT_EQ(cells_sql("r", {"o", "e"}, true, "", true),
              "SELECT \"o\", \"e\", COUNT(*) AS \"foldline_rows\", MIN(\"foldline_row_id\") AS \"foldline_first_row\" "
              "FROM r GROUP BY \"o\", \"e\" ORDER BY \"foldline_first_row\"");
    // Without first appearance the row id is not read.
    EXPECT_EQ(cells_sql("r", {"o"}, false, "", true), cells_sql("r", {"o"}, false));
    CubesQuery q;
    q.outcome = "o";
    q.exposure = "e";
    q.strata = {"c"};
    q.pooled = true;
    q.first_appearance = true;
    q.row_ids = true;
    EXPECT_EQ(cubes_sql("r", q),
              "SELECT \"o\", \"e\", \"c\", GROUPING(\"c\") AS g0, SUM(\"foldline_rows\") AS \"foldline_rows\", "
              "MIN(\"foldline_first_row\") AS \"foldline_first_row\" FROM (SELECT \"o\", \"e\", \"c\", COUNT(*) AS "
              "\"foldline_rows\", MIN(\"foldline_row_id\") AS \"foldline_first_row\" FROM r GROUP BY \"o\", \"e\", "
              "\"c\") AS cells GROUP BY GROUPING SETS ((\"o\", \"e\"), (\"o\", \"e\", \"c\")) ORDER BY "
              "\"foldline_first_row\"");
    EXPECT_EQ(cubes_sql("r", q).find("ROW_NUMBER"), std::string::npos);
    // A binned column's derived table carries the row id through.
    q.cuts = {{10}};
    EXPECT_NE(cubes_sql("r", q).find("ELSE 1 END AS \"c\", \"foldline_row_id\" FROM r) AS binned"), std::string::npos);
}

}  // namespace
}  // namespace foldline::sql
