// Tests of core/io/number_parse.h. The reference is the C library's strtod (glibc rounds
// correctly, as IEEE 754 and C17 7.22.1.3 recommend): every accepted text must give the very
// same double.
#include "core/io/number_parse.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <random>
#include <string>

using namespace foldline;

namespace {

TEST(ParseNumber, MatchesStrtodBitForBitOnRandomDecimals) {
    std::mt19937_64 rng(11);
    for (int i = 0; i < 200000; ++i) {
        std::string s;
        if (rng() % 4 == 0) s += '-';
        const int int_digits = static_cast<int>(rng() % 10);
        const int frac_digits = static_cast<int>(rng() % 12);
        for (int k = 0; k < int_digits; ++k) s += static_cast<char>('0' + rng() % 10);
        if (frac_digits || int_digits == 0) {
            s += '.';
            for (int k = 0; k < std::max(1, frac_digits); ++k) s += static_cast<char>('0' + rng() % 10);
        }
        if (rng() % 5 == 0) {
            s += 'e';
            s += std::to_string(static_cast<int>(rng() % 40) - 20);
        }
        double got = 0;
        ASSERT_EQ(parse_number(s, got), NumberParse::Ok) << s;
        const double want = std::strtod(s.c_str(), nullptr);
        ASSERT_EQ(std::memcmp(&got, &want, sizeof got), 0) << s << " " << got << " vs " << want;
    }
}

TEST(ParseNumber, AcceptsAndRefuses) {
    double x = 0;
    EXPECT_EQ(parse_number("+4", x), NumberParse::Ok);
    EXPECT_EQ(x, 4.0);
    EXPECT_EQ(parse_number(" 12.5 ", x), NumberParse::Ok);
    EXPECT_EQ(x, 12.5);
    EXPECT_EQ(parse_number("1234567890123456789", x), NumberParse::Ok);  // beyond the fast path
    EXPECT_EQ(x, 1234567890123456789.0);
    EXPECT_EQ(parse_number("1e400", x), NumberParse::OutOfRange);
    EXPECT_EQ(parse_number("-1e400", x), NumberParse::OutOfRange);
    EXPECT_EQ(parse_number("1e-400", x), NumberParse::Ok);
    EXPECT_EQ(x, 0.0);
    for (const char* bad : {"", " ", "-", "+", ".", "e5", "1e", "1,5", "0x10", "inf", "nan", "-inf", "1 2", "--1", "1-"})
        EXPECT_EQ(parse_number(bad, x), NumberParse::NotANumber) << "'" << bad << "'";
}

}  // namespace
