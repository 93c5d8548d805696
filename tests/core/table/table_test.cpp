#include "core/table/table.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

using namespace foldline;

TEST(Column, CategoricalPicksNarrowestWidthAndMissingSentinel) {
    auto c = Column::categorical("g", {"A", "B"}, {0, 1, 2, 1});
    EXPECT_TRUE(std::holds_alternative<std::vector<std::uint8_t>>(c.codes));
    EXPECT_EQ(c.missing_count, 1u);
    EXPECT_TRUE(c.is_missing(2));
    EXPECT_FALSE(c.is_missing(1));
    EXPECT_TRUE(c.is_binary());

    std::vector<std::string> many(300, "x");
    for (int i = 0; i < 300; ++i) many[i] = std::to_string(i);
    auto wide = Column::categorical("w", many, {299, 300});
    EXPECT_TRUE(std::holds_alternative<std::vector<std::uint16_t>>(wide.codes));
    EXPECT_EQ(wide.missing_count, 1u);
}

TEST(Column, NumericMissingIsNaNAndSignedZeroIsOneValue) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    auto c = Column::numeric("x", {0.0, -0.0, 1.0, nan});
    EXPECT_EQ(c.missing_count, 1u);
    EXPECT_EQ(c.distinct_count(), 2u);
    EXPECT_TRUE(c.is_binary());
}

TEST(Table, WeightsDefaultToOne) {
    Table t;
    t.rows = 3;
    EXPECT_DOUBLE_EQ(t.total_weight(), 3.0);
    t.weights = {2, 0, 5};
    EXPECT_DOUBLE_EQ(t.total_weight(), 7.0);
    EXPECT_DOUBLE_EQ(t.weight(2), 5.0);
}
