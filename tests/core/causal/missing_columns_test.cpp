// Tests of core/causal/missing_columns.h: which of a finding's columns a diagram lacks, and the
// sentence the JSON, the memo and the workbench print for them.
#include "core/causal/missing_columns.h"

#include <gtest/gtest.h>

using namespace foldline;
using namespace foldline::causal;

namespace {

Diagram xyz() {
    Diagram d;
    d.nodes = {{"x", true, {}, {}}, {"y", true, {}, {}}, {"z", true, {}, {}}};
    d.edges = {{"x", "y"}};
    return d;
}

}  // namespace

TEST(MissingColumns, NamesEachAbsentColumnOnceInOrder) {
    const Diagram d = xyz();
    EXPECT_TRUE(missing_columns(d, {"x", "y", "z"}).empty());
    EXPECT_EQ(missing_columns(d, {"x", "y", "b", "a", "b"}), (std::vector<std::string>{"b", "a"}));
    EXPECT_EQ(missing_columns(Diagram{}, {"x", "", "y"}), (std::vector<std::string>{"x", "y"}));
}

TEST(MissingColumns, OneSentenceForOneOrSeveral) {
    EXPECT_EQ(missing_columns_sentence({}), "");
    EXPECT_EQ(missing_columns_sentence({"branch"}),
              "the diagram lacks the finding's column \"branch\"; add it to the diagram to learn which view "
              "answers the question");
    EXPECT_EQ(missing_columns_sentence({"a", "b \"q\"", "c"}),
              "the diagram lacks the finding's columns \"a\", \"b \\\"q\\\"\" and \"c\"; add them to the diagram "
              "to learn which view answers the question");
}
