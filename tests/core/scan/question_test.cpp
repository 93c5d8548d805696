#include "core/scan/question.h"

#include <gtest/gtest.h>

#include "tests/core/scan/synthetic_table.h"

using namespace foldline;
using foldline::testing::TableBuilder;

namespace {
Table three_groups() {
    TableBuilder b({"group", "hired", "site"});
    for (int i = 0; i < 5; ++i) b.add_row({"A", "yes", "s1"});
    for (int i = 0; i < 3; ++i) b.add_row({"B", "no", "s1"});
    for (int i = 0; i < 2; ++i) b.add_row({"C", "no", "s2"});
    b.add_row({"", "yes", "s2"});
    return b.build();
}
}  // namespace

TEST(Question, DefaultsPositiveYesAndReferenceMostFrequent) {
    const Table t = three_groups();
    QuestionSpec s;
    parse_outcome_arg("hired", s);
    parse_exposure_arg("group", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok()) << q.error().to_string();
    EXPECT_EQ(q->positive, "yes");
    EXPECT_EQ(q->reference, "A");
    ASSERT_EQ(q->focal.size(), 2u);  // one comparison per non-reference level
    EXPECT_EQ(q->focal[0], "B");
    EXPECT_EQ(q->focal[1], "C");
    const auto rows = encode_rows(t, *q);
    EXPECT_EQ(rows.slots, 3u);
    EXPECT_EQ(rows.cell[0], 1);              // A (slot 0), positive
    EXPECT_EQ(rows.cell[5], 2);              // B (slot 1), negative
    EXPECT_EQ(rows.cell[8], 4);              // C (slot 2), negative
    EXPECT_EQ(rows.cell[10], rows.unused()); // missing exposure
}

TEST(Question, ExplicitFocalAndReference) {
    const Table t = three_groups();
    QuestionSpec s;
    parse_outcome_arg("hired=no", s);
    parse_exposure_arg("group=C,B", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok());
    EXPECT_EQ(q->positive, "no");
    EXPECT_EQ(q->reference, "B");
    ASSERT_EQ(q->focal.size(), 1u);
    EXPECT_EQ(q->focal[0], "C");
    const auto rows = encode_rows(t, *q);
    EXPECT_EQ(rows.cell[0], rows.unused());  // A takes part in no comparison
    EXPECT_EQ(rows.cell[5], 1);              // B is the reference, "no" is positive
}

TEST(Question, AmbiguitiesAreErrorsThatSayWhatToPass) {
    TableBuilder b({"g", "y"});
    b.add_row({"A", "low"});
    b.add_row({"B", "high"});
    const Table t = b.build();
    QuestionSpec s;
    parse_outcome_arg("y", s);
    parse_exposure_arg("g=A", s);
    auto q = resolve_question(t, s);
    ASSERT_FALSE(q.ok());
    EXPECT_NE(q.error().message.find("--outcome y=LEVEL"), std::string::npos) << q.error().message;

    s.positive = "high";
    s.focal.clear();
    q = resolve_question(t, s);  // A and B equally frequent
    ASSERT_FALSE(q.ok());
    EXPECT_NE(q.error().message.find("FOCAL,REFERENCE"), std::string::npos);

    s.exposure = "nope";
    EXPECT_FALSE(resolve_question(t, s).ok());
    QuestionSpec same;
    parse_outcome_arg("g", same);
    parse_exposure_arg("g", same);
    EXPECT_FALSE(resolve_question(t, same).ok());
}

TEST(Question, NumericZeroOneOutcome) {
    Table t;
    t.columns.push_back(foldline::testing::cat_column("g", {"A", "A", "B"}));
    t.columns.push_back(Column::numeric("y", {1, 0, 1}));
    t.rows = 3;
    QuestionSpec s;
    parse_outcome_arg("y", s);
    parse_exposure_arg("g", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok()) << q.error().to_string();
    EXPECT_EQ(q->positive, "1");
    EXPECT_EQ(q->reference, "A");
    const auto rows = encode_rows(t, *q);
    EXPECT_EQ(rows.cell[0], 1);
    EXPECT_EQ(rows.cell[1], 0);
    EXPECT_EQ(rows.cell[2], 3);
}
