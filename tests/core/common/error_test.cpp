#include "core/common/error.h"

#include <gtest/gtest.h>

using foldline::Error;
using foldline::Result;

TEST(Error, FormatsFileLineColumnAndMessage) {
    EXPECT_EQ((Error{"a.csv", 3, 2, "expected a number"}).to_string(), "a.csv:3:2: expected a number");
    EXPECT_EQ((Error{"a.csv", 3, 0, "x"}).to_string(), "a.csv:3: x");
    EXPECT_EQ((Error{"", 0, 0, "plain"}).to_string(), "plain");
    EXPECT_EQ((Error{"", 7, 0, "x"}).to_string(), "line 7: x");
}

TEST(Result, HoldsValueOrError) {
    Result<int> ok = 5;
    Result<int> bad = Error{"f", 1, 1, "m"};
    ASSERT_TRUE(ok.ok());
    EXPECT_EQ(*ok, 5);
    ASSERT_FALSE(bad.ok());
    EXPECT_EQ(bad.error().message, "m");
}
