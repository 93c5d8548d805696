// Tests of core/common/json_text.h: every complaint of the JSON parser comes back as an Error with
// its line and column, never as an exception. Numbers beyond the range of an IEEE 754 double
// (largest finite value about 1.8e308, IEEE 754-2008 binary64) were found by fuzzing to escape as
// nlohmann's out_of_range (code 406), which aborted the diagram and project readers.
#include "core/common/json_text.h"

#include <string>

#include <gtest/gtest.h>

using foldline::parse_json_text;

TEST(JsonText, ParsesAValidDocument) {
    auto j = parse_json_text(R"({"a": [1, 2.5, "x"]})", "f.json", "bad: ");
    ASSERT_TRUE(j.ok()) << j.error().to_string();
    EXPECT_EQ((*j)["a"][1].get<double>(), 2.5);
}

TEST(JsonText, SyntaxErrorHasItsPosition) {
    auto j = parse_json_text("{\n  \"a\": 1,,\n}", "f.json", "bad: ");
    ASSERT_FALSE(j.ok());
    EXPECT_EQ(j.error().file, "f.json");
    EXPECT_EQ(j.error().line, 2u);
    EXPECT_EQ(j.error().column, 10u);  // the second comma
    EXPECT_EQ(j.error().message.rfind("bad: syntax error", 0), 0u) << j.error().message;
}

TEST(JsonText, NumberBeyondDoubleRangeIsAnErrorAtTheNumber) {
    // Regression (fuzz_diagram_file, fuzz_project_file): "2e410" used to throw out_of_range.
    for (const std::string& number : {std::string("2e410"), std::string("-1e400"), std::string(400, '5')}) {
        const std::string text = "{\n  \"format\": " + number + "\n}";
        auto j = parse_json_text(text, "f.json", "bad: ");
        ASSERT_FALSE(j.ok()) << number;
        EXPECT_EQ(j.error().line, 2u) << number;
        EXPECT_EQ(j.error().column, 13u) << number;  // the number's first character
        EXPECT_NE(j.error().message.find("number overflow"), std::string::npos) << j.error().message;
        EXPECT_NE(j.error().message.find("beyond the range of a double"), std::string::npos);
    }
}

TEST(JsonText, LargeButFiniteNumbersAndTinyOnesStillParse) {
    // 1e308 is below DBL_MAX (about 1.797e308); 1e-400 underflows to 0 and is not an error in
    // nlohmann (it reports overflow only), so it parses.
    auto j = parse_json_text(R"([1e308, 1e-400, 18446744073709551616])", "f.json", "bad: ");
    ASSERT_TRUE(j.ok()) << j.error().to_string();
    EXPECT_EQ((*j)[0].get<double>(), 1e308);
}

TEST(JsonText, EmptyTextIsAnErrorAtLineOne) {
    auto j = parse_json_text("", "f.json", "bad: ");
    ASSERT_FALSE(j.ok());
    EXPECT_EQ(j.error().line, 1u);
}
