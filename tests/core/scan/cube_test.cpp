#include "core/scan/cube.h"

#include <gtest/gtest.h>

#include <random>

#include "tests/core/scan/synthetic_table.h"

using namespace foldline;

// The cube must equal a brute-force count over rows (the definition of the cube).
TEST(Cube, SingleAndPairMatchBruteForce) {
    std::mt19937_64 rng(3);
    Table t = foldline::testing::planted_reversal(rng, 9001, 0.05, 2);  // more rows than one fused block (4096)
    // punch some missing stratifier cells
    auto& col = t.columns[3];
    std::vector<std::uint32_t> codes;
    for (std::size_t i = 0; i < t.rows; ++i) codes.push_back(i % 97 == 0 ? col.missing_code() : col.code(i));
    col = Column::categorical(col.name, col.levels, codes);
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg("group=B,A", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok());
    const auto rows = encode_rows(t, *q);
    const Column& p = *t.column("product");
    const Column& z = t.columns[3];

    const auto cube = build_cube(p, rows, {});
    const auto pair = build_pair_cube(p, z, rows, {});
    ASSERT_EQ(cube.strata, p.levels.size());
    ASSERT_EQ(pair.strata, p.levels.size() * z.levels.size());
    std::vector<double> want(cube.counts.size(), 0), want_pair(pair.counts.size(), 0);
    const Column& g = *t.column("group");
    const Column& y = *t.column("approved");
    for (std::size_t i = 0; i < t.rows; ++i) {
        const int slot = g.levels[g.code(i)] == "B" ? 1 : 0;
        const int pos = y.levels[y.code(i)] == "1";
        want[(p.code(i) * 2 + slot) * 2 + pos] += 1;
        if (z.code(i) != z.missing_code())
            want_pair[((p.code(i) * z.levels.size() + z.code(i)) * 2 + slot) * 2 + pos] += 1;
    }
    EXPECT_EQ(cube.counts, want);
    EXPECT_EQ(pair.counts, want_pair);

    // The fused builder counts the same cubes as the row-by-row definition, for each second
    // column (in order, repeated columns included), over a row count that is not a multiple of
    // its block; weighted tables take the one-pair path.
    const std::vector<const Column*> seconds{&z, &t.columns[4], &z};
    const auto fused = build_pair_cubes(p, seconds, rows, {});
    ASSERT_EQ(fused.size(), 3u);
    EXPECT_EQ(fused[0].counts, want_pair);
    EXPECT_EQ(fused[0].strata, pair.strata);
    EXPECT_EQ(fused[2].counts, want_pair);
    EXPECT_EQ(fused[1].counts, build_pair_cube(p, t.columns[4], rows, {}).counts);
    EXPECT_TRUE(build_pair_cubes(p, {}, rows, {}).empty());
    const auto fused_w = build_pair_cubes(p, seconds, rows, std::vector<double>(t.rows, 2.0));
    for (std::size_t k = 0; k < want_pair.size(); ++k) EXPECT_EQ(fused_w[0].counts[k], 2 * want_pair[k]);

    // Weighted: every row weight 2 doubles every count.
    std::vector<double> w(t.rows, 2.0);
    const auto cube2 = build_cube(p, rows, w);
    for (std::size_t k = 0; k < want.size(); ++k) EXPECT_EQ(cube2.counts[k], 2 * want[k]);

    std::vector<std::size_t> kept;
    const auto strata = comparison_strata(pair, 1, &kept);
    EXPECT_EQ(strata.size(), kept.size());
    double total = 0;
    for (const auto& st : strata) total += st.total();
    EXPECT_EQ(total, t.rows - (t.rows + 96) / 97);
}
