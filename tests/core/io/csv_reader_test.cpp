// Tests of core/io/csv_reader.h.
//
// The parser cases are table-driven: each input with either the expected header, column types
// and cells, or the expected error (line, column, message fragment). Where a case comes from
// RFC 4180 ("Common Format and MIME Type for Comma-Separated Values (CSV) Files", Y. Shafranovich,
// October 2005), section 2, the rule number is named beside it. The reader always takes the
// first record as the header (rule 3 makes the header optional; Foldline requires one).
#include "core/io/csv_reader.h"

#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>

#include <nlohmann/json.hpp>

using namespace foldline;

namespace {

constexpr const char* kMissing = "<NA>";

std::string cell(const Column& c, std::size_t i) {
    if (c.is_missing(i)) return kMissing;
    if (c.is_categorical()) return c.levels[c.code(i)];
    char buf[64];
    auto r = std::to_chars(buf, buf + sizeof buf, c.values[i]);
    return std::string(buf, r.ptr);
}

std::string types_of(const Table& t) {
    std::string s;
    for (const auto& c : t.columns) s += c.is_numeric() ? 'N' : 'C';
    return s;
}

struct Case {
    std::string name;
    std::string input;
    CsvOptions opts{};
    // Success: header names, one letter per column (N numeric, C categorical), rows of cells.
    std::vector<std::string> header{};
    std::string types{};
    std::vector<std::vector<std::string>> rows{};
    // Failure: 1-based line and column (0 = not checked) and a fragment of the message.
    bool fails = false;
    std::size_t line = 0, column = 0;
    std::string fragment{};

    Case with(CsvOptions o) const {
        Case c = *this;
        c.opts = std::move(o);
        return c;
    }
};

// Keeps test names and failure messages readable (no byte dump of the case).
void PrintTo(const Case& c, std::ostream* os) { *os << c.name; }

Case ok(std::string name, std::string input, std::vector<std::string> header, std::string types,
        std::vector<std::vector<std::string>> rows) {
    Case c;
    c.name = std::move(name);
    c.input = std::move(input);
    c.header = std::move(header);
    c.types = std::move(types);
    c.rows = std::move(rows);
    return c;
}

Case bad(std::string name, std::string input, std::size_t line, std::size_t column, std::string fragment) {
    Case c;
    c.name = std::move(name);
    c.input = std::move(input);
    c.fails = true;
    c.line = line;
    c.column = column;
    c.fragment = std::move(fragment);
    return c;
}

CsvOptions with_count(std::string col) {
    CsvOptions o;
    o.count_column = std::move(col);
    return o;
}

std::vector<Case> parser_cases() {
    const std::string NA = kMissing;
    std::vector<Case> v;
    // --- RFC 4180 section 2 ---
    v.push_back(ok("rfc4180_rule1_crlf_records", "aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n", {"aaa", "bbb", "ccc"}, "CCC",
                   {{"zzz", "yyy", "xxx"}}));
    v.push_back(ok("rfc4180_rule2_no_final_line_break", "aaa,bbb,ccc\r\nzzz,yyy,xxx", {"aaa", "bbb", "ccc"}, "CCC",
                   {{"zzz", "yyy", "xxx"}}));
    v.push_back(ok("rfc4180_rule3_header_line",
                   "field_name,field_name,field_name\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n",
                   {"field_name", "field_name_2", "field_name_3"}, "CCC", {{"aaa", "bbb", "ccc"}, {"zzz", "yyy", "xxx"}}));
    v.push_back(ok("rfc4180_rule4_spaces_are_part_of_a_field", "h1,h2,h3\naaa, bbb ,ccc\n", {"h1", "h2", "h3"}, "CCC",
                   {{"aaa", " bbb ", "ccc"}}));
    v.push_back(ok("rfc4180_rule5_quoted_fields", "\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx", {"aaa", "bbb", "ccc"}, "CCC",
                   {{"zzz", "yyy", "xxx"}}));
    v.push_back(ok("rfc4180_rule6_line_break_and_comma_in_quotes",
                   "h1,h2,h3\r\n\"aaa\",\"b\r\nbb\",\"c,cc\"\r\nzzz,yyy,xxx\r\n", {"h1", "h2", "h3"}, "CCC",
                   {{"aaa", "b\r\nbb", "c,cc"}, {"zzz", "yyy", "xxx"}}));
    v.push_back(ok("rfc4180_rule7_doubled_quote", "h1,h2,h3\r\n\"aaa\",\"b\"\"bb\",\"ccc\"\r\n", {"h1", "h2", "h3"},
                   "CCC", {{"aaa", "b\"bb", "ccc"}}));

    // --- delimiters, line ends, blank lines ---
    v.push_back(ok("semicolon_detected", "a;b\n1,5;x\n2,5;y\n", {"a", "b"}, "CC", {{"1,5", "x"}, {"2,5", "y"}}));
    v.push_back(ok("tab_detected", "a\tb\n1\tx\n", {"a", "b"}, "NC", {{"1", "x"}}));
    v.push_back(ok("pipe_detected", "a|b|c\n1|2|3\n", {"a", "b", "c"}, "NNN", {{"1", "2", "3"}}));
    v.push_back(ok("comma_inside_quotes_does_not_count_for_detection", "\"a,x\";b\n\"1,2\";3\n", {"a,x", "b"}, "CN",
                   {{"1,2", "3"}}));
    CsvOptions pipe;
    pipe.delimiter = '|';
    v.push_back(ok("delimiter_given", "a,b|c\n1,2|3\n", {"a,b", "c"}, "CN", {{"1,2", "3"}}).with(pipe));
    v.push_back(ok("mixed_lf_and_crlf", "a,b\r\n1,x\n2,y\r\n", {"a", "b"}, "NC", {{"1", "x"}, {"2", "y"}}));
    v.push_back(ok("blank_lines_skipped", "a,b\n\n1,x\r\n\r\n2,y\n\n", {"a", "b"}, "NC", {{"1", "x"}, {"2", "y"}}));
    v.push_back(ok("cr_at_end_of_file", "a,b\r\n1,x\r", {"a", "b"}, "NC", {{"1", "x"}}));
    v.push_back(ok("single_column", "x\n3\n4\n", {"x"}, "N", {{"3"}, {"4"}}));
    v.push_back(ok("trailing_delimiter_gives_unnamed_column", "a,b,\n1,2,\n", {"a", "b", "column_3"}, "NNN",
                   {{"1", "2", NA}}));

    // --- BOM and encodings ---
    v.push_back(ok("utf8_bom_skipped", "\xEF\xBB\xBF" "a,b\n1,2\n", {"a", "b"}, "NN", {{"1", "2"}}));
    v.push_back(ok("utf8_multibyte_levels", "city,n\ncaf\xC3\xA9,1\n\xE6\x9D\xB1\xE4\xBA\xAC,2\n", {"city", "n"}, "CN",
                   {{"caf\xC3\xA9", "1"}, {"\xE6\x9D\xB1\xE4\xBA\xAC", "2"}}));
    v.push_back(bad("utf16_le_bom_refused", std::string("\xFF\xFE" "a\0,\0b\0", 8), 1, 1, "UTF-16"));
    v.push_back(bad("utf16_be_bom_refused", std::string("\xFE\xFF\0a\0,\0b", 8), 1, 1, "UTF-16"));
    v.push_back(bad("invalid_utf8_in_cell", "a,b\nx,ok\ny,caf\xE9\n", 3, 2, "invalid UTF-8 byte 0xE9"));
    v.push_back(bad("invalid_utf8_in_header", "a,b\xFF\nx,y\n", 1, 2, "invalid UTF-8 byte 0xFF"));
    v.push_back(bad("overlong_utf8_refused", "a\n\xC0\xAF\n", 2, 1, "invalid UTF-8"));
    v.push_back(bad("utf16_surrogate_in_utf8_refused", "a\n\xED\xA0\x80\n", 2, 1, "invalid UTF-8"));
    v.push_back(bad("truncated_utf8_at_end_refused", "a\nx\xE6\x9D", 2, 1, "invalid UTF-8"));

    // --- missing markers ---
    v.push_back(ok("default_missing_markers", "x,g\n1,a\nNA,NA\nN/A,N/A\nNULL,NULL\n.,.\n,\n2,b\n", {"x", "g"}, "NC",
                   {{"1", "a"}, {NA, NA}, {NA, NA}, {NA, NA}, {NA, NA}, {NA, NA}, {"2", "b"}}));
    v.push_back(ok("quoted_marker_is_missing_too", "x,g\n\"NA\",\"\"\n3,b\n", {"x", "g"}, "NC", {{NA, NA}, {"3", "b"}}));
    CsvOptions dash;
    dash.missing_markers = {"-"};
    v.push_back(ok("custom_missing_markers", "x,g\n-,NA\n4,\n", {"x", "g"}, "NC", {{NA, "NA"}, {"4", ""}}).with(dash));
    v.push_back(ok("all_missing_column_is_numeric", "x,y\n1,\n2,NA\n", {"x", "y"}, "NN", {{"1", NA}, {"2", NA}}));

    // --- type inference ---
    v.push_back(ok("numbers_sign_decimals_exponent", "x\n1\n-2.5\n+3\n1e3\n.5\n-1.25E-2\n 7 \n\"8\"\n", {"x"}, "N",
                   {{"1"}, {"-2.5"}, {"3"}, {"1000"}, {"0.5"}, {"-0.0125"}, {"7"}, {"8"}}));
    v.push_back(ok("one_non_number_makes_categorical", "x\n1\n2\nthree\n1\n", {"x"}, "C",
                   {{"1"}, {"2"}, {"three"}, {"1"}}));
    v.push_back(ok("inf_and_nan_are_not_numbers", "x,y\ninf,1\n2,nan\n", {"x", "y"}, "CC", {{"inf", "1"}, {"2", "nan"}}));
    v.push_back(ok("hex_and_thousands_are_not_numbers", "x;y\n0x1F;1,000\n", {"x", "y"}, "CC", {{"0x1F", "1,000"}}));
    v.push_back(ok("levels_keep_first_appearance_order", "g\nb\na\nb\nc\n", {"g"}, "C", {{"b"}, {"a"}, {"b"}, {"c"}}));
    v.push_back(ok("underflow_reads_as_zero", "x\n1e-400\n2\n", {"x"}, "N", {{"0"}, {"2"}}));
    v.push_back(bad("overflow_in_numeric_column", "x,y\n1,a\n1e400,b\n", 3, 1, "beyond the range of a double"));
    v.push_back(ok("overflow_text_in_categorical_column_is_a_level", "x\n1e400\nabc\n", {"x"}, "C",
                   {{"1e400"}, {"abc"}}));
    CsvOptions force_cat;
    force_cat.type_overrides["x"] = ColumnType::Categorical;
    v.push_back(ok("override_to_categorical", "x,y\n1,2\n01,3\n", {"x", "y"}, "CN", {{"1", "2"}, {"01", "3"}}).with(force_cat));
    CsvOptions force_num;
    force_num.type_overrides["x"] = ColumnType::Numeric;
    v.push_back(bad("override_to_numeric_rejects_text", "x\n1\nzz\n", 3, 1, "expected a number").with(force_num));
    CsvOptions force_unknown;
    force_unknown.type_overrides["nope"] = ColumnType::Numeric;
    v.push_back(bad("override_of_unknown_column", "x\n1\n", 1, 0, "'nope'").with(force_unknown));

    // --- header problems ---
    v.push_back(ok("duplicate_names_made_unique", "a,a,b,a\n1,2,3,4\n", {"a", "a_2", "b", "a_3"}, "NNNN",
                   {{"1", "2", "3", "4"}}));
    v.push_back(ok("duplicate_rename_avoids_existing_name", "a,a,a_2\n1,2,3\n", {"a", "a_3", "a_2"}, "NNN",
                   {{"1", "2", "3"}}));
    v.push_back(ok("empty_name_gets_position", "a,,c\n1,2,3\n", {"a", "column_2", "c"}, "NNN", {{"1", "2", "3"}}));
    v.push_back(bad("empty_file", "", 0, 0, "empty file"));
    v.push_back(bad("bom_only", "\xEF\xBB\xBF", 0, 0, "empty file"));
    v.push_back(bad("blank_lines_only", "\n\r\n\n", 0, 0, "empty file"));
    v.push_back(bad("header_only", "a,b\n", 2, 0, "no data rows"));
    v.push_back(bad("header_only_no_newline", "a,b", 2, 0, "no data rows"));

    // --- structural errors ---
    v.push_back(bad("ragged_row_too_many", "a,b\n1,2\n3,4,5\n", 3, 3, "expected 2 fields as in the header, found 3"));
    v.push_back(bad("ragged_row_too_few", "a,b,c\n1,2,3\n4,5\n", 3, 3, "found 2"));
    v.push_back(bad("unclosed_quote_reports_opening_line", "a,b\n1,2\n3,\"open\n4,5\n6,7\n", 3, 2, "never closed"));
    v.push_back(bad("quote_inside_unquoted_field", "a,b\n1,ab\"c\n", 2, 2, "inside an unquoted field"));
    v.push_back(bad("text_after_closing_quote", "a,b\n1,\"ab\"c\n", 2, 2, "after a closing quote"));
    v.push_back(bad("line_numbers_count_quoted_newlines", "a,b\n\"x\ny\nz\",1\n2,3,4\n", 5, 3, "expected 2 fields"));
    CsvOptions small_field;
    small_field.max_field_bytes = 4;
    v.push_back(bad("field_size_cap", "a\nabcd\nabcde\n", 3, 1, "max_field_bytes").with(small_field));
    v.push_back(bad("quoted_field_size_cap", "a\n\"abcdefgh\"\n", 2, 1, "max_field_bytes").with(small_field));
    CsvOptions few_fields;
    few_fields.max_fields_per_row = 2;
    v.push_back(bad("fields_per_row_cap", "a,b,c\n1,2,3\n", 1, 3, "max_fields_per_row").with(few_fields));

    // --- count columns ---
    v.push_back(ok("count_column_becomes_weights", "g,y,n\nA,1,10\nB,0,0\n", {"g", "y"}, "CN", {{"A", "1"}, {"B", "0"}})
                    .with(with_count("n")));
    v.push_back(bad("count_negative", "g,n\nA,3\nB,-1\n", 3, 2, "negative").with(with_count("n")));
    v.push_back(bad("count_fractional", "g,n\nA,2.5\n", 2, 2, "fractional").with(with_count("n")));
    v.push_back(bad("count_missing", "g,n\nA,3\nB,NA\n", 3, 2, "count is missing").with(with_count("n")));
    v.push_back(bad("count_not_a_number", "g,n\nA,many\n", 2, 2, "not a number").with(with_count("n")));
    v.push_back(bad("count_column_absent", "g,n\nA,1\n", 1, 0, "count column 'k' is not in the header").with(with_count("k")));
    return v;
}

class ParserCase : public ::testing::TestWithParam<Case> {};

TEST_P(ParserCase, GivesExpectedCellsOrError) {
    const Case& k = GetParam();
    CsvReport report;
    auto t = read_csv_text(k.input, "case.csv", k.opts, &report);
    if (k.fails) {
        ASSERT_FALSE(t.ok()) << "expected an error containing: " << k.fragment;
        const Error& e = t.error();
        EXPECT_EQ(e.file, "case.csv");
        EXPECT_NE(e.message.find(k.fragment), std::string::npos) << e.to_string();
        EXPECT_EQ(e.line, k.line) << e.to_string();
        if (k.column) {
            EXPECT_EQ(e.column, k.column) << e.to_string();
        }
        return;
    }
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    std::vector<std::string> names;
    for (const auto& c : t->columns) names.push_back(c.name);
    EXPECT_EQ(names, k.header);
    EXPECT_EQ(types_of(*t), k.types);
    ASSERT_EQ(t->rows, k.rows.size());
    for (std::size_t r = 0; r < t->rows; ++r) {
        std::vector<std::string> got;
        for (const auto& c : t->columns) got.push_back(cell(c, r));
        EXPECT_EQ(got, k.rows[r]) << "row " << r + 1;
    }
    for (const auto& c : t->columns) EXPECT_EQ(c.size(), t->rows) << c.name;
}

INSTANTIATE_TEST_SUITE_P(Csv, ParserCase, ::testing::ValuesIn(parser_cases()),
                         [](const ::testing::TestParamInfo<Case>& i) { return i.param.name; });

TEST(CsvReader, ReportsDelimiterBomLinesAndWarnings) {
    CsvReport rep;
    auto t = read_csv_text("\xEF\xBB\xBF" "a;a\r\n1;2\r\n\r\n3;4", "r.csv", {}, &rep);
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(rep.delimiter, ';');
    EXPECT_TRUE(rep.had_bom);
    EXPECT_EQ(rep.physical_lines, 4u);
    ASSERT_EQ(rep.warnings.size(), 1u);
    EXPECT_NE(rep.warnings[0].find("duplicate column name 'a'"), std::string::npos);
}

TEST(CsvReader, SkipsRaggedRowsAndListsTheirLines) {
    CsvOptions o;
    o.skip_ragged = true;
    CsvReport rep;
    auto t = read_csv_text("a,b\n1,2\n3\n\"x\ny\",5\n6,7,8\n9,10\n", "s.csv", o, &rep);
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->rows, 3u);
    EXPECT_EQ(rep.skipped_lines, (std::vector<std::size_t>{3, 6}));
    EXPECT_EQ(cell(t->columns[0], 1), "x\ny");
}

TEST(CsvReader, AllRowsRaggedIsAnError) {
    CsvOptions o;
    o.skip_ragged = true;
    auto t = read_csv_text("a,b\n1\n2\n", "s.csv", o);
    ASSERT_FALSE(t.ok());
    EXPECT_NE(t.error().message.find("skipping 2 ragged rows"), std::string::npos);
}

TEST(CsvReader, CountColumnWeights) {
    auto t = read_csv_text("g,y,n\nA,1,10\nB,0,0\nA,0,7\n", "w.csv", with_count("n"));
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->weight_column, "n");
    EXPECT_EQ(t->weights, (std::vector<double>{10, 0, 7}));
    EXPECT_DOUBLE_EQ(t->total_weight(), 17.0);
    EXPECT_FALSE(t->find("n").has_value());
}

TEST(CsvReader, CodesUseNarrowestWidth) {
    std::string wide = "g\n";
    for (int i = 0; i < 300; ++i) {
        wide += 'L';
        wide += std::to_string(i);
        wide += '\n';
    }
    wide += "NA\n";
    auto t = read_csv_text(wide, "w.csv");
    ASSERT_TRUE(t.ok());
    const Column& c = t->columns[0];
    EXPECT_EQ(c.levels.size(), 300u);
    EXPECT_TRUE(std::holds_alternative<std::vector<std::uint16_t>>(c.codes));
    EXPECT_EQ(c.code(300), 300u);  // the missing sentinel is levels.size()
    EXPECT_EQ(c.missing_count, 1u);
    auto narrow = read_csv_text("g\nx\ny\n", "n.csv");
    ASSERT_TRUE(narrow.ok());
    EXPECT_TRUE(std::holds_alternative<std::vector<std::uint8_t>>(narrow->columns[0].codes));
    EXPECT_TRUE(narrow->columns[0].is_binary());
}

TEST(CsvReader, StopRequestGivesCancelled) {
    Work w;
    w.stop.request_stop();
    auto t = read_csv_text("a\n1\n", "c.csv", {}, nullptr, w);
    ASSERT_FALSE(t.ok());
    EXPECT_EQ(t.error().message, "cancelled");
}

TEST(CsvReader, ProgressReachesTheTotalInBytes) {
    double last_done = -1, last_total = -1;
    Work w;
    w.progress = [&](double done, double total, const char*) {
        last_done = done;
        last_total = total;
    };
    const std::string text = "a,b\n1,2\n3,4\n";
    ASSERT_TRUE(read_csv_text(text, "p.csv", {}, nullptr, w).ok());
    EXPECT_DOUBLE_EQ(last_total, static_cast<double>(text.size() - 4));  // the body, after the header
    EXPECT_DOUBLE_EQ(last_done, last_total);
}

TEST(CsvReader, ReadsAFileWithoutChangingIt) {
    const auto path = std::filesystem::temp_directory_path() / "foldline_reader_test.csv";
    const std::string text = "g,x\nA,1\nB,2.5\n";
    {
        std::ofstream f(path, std::ios::binary);
        f << text;
    }
    std::filesystem::permissions(path, std::filesystem::perms::owner_read, std::filesystem::perm_options::replace);
    const auto before = std::filesystem::last_write_time(path);
    auto t = read_csv(path.string());
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_EQ(t->rows, 2u);
    EXPECT_EQ(t->source, path.string());
    EXPECT_EQ(std::filesystem::last_write_time(path), before);
    std::ifstream f(path, std::ios::binary);
    std::stringstream ss;
    ss << f.rdbuf();
    EXPECT_EQ(ss.str(), text);
    std::filesystem::permissions(path, std::filesystem::perms::owner_all, std::filesystem::perm_options::replace);
    std::filesystem::remove(path);
}

TEST(CsvReader, MissingFileAndDirectoryAreErrors) {
    auto t = read_csv("/nonexistent/foldline/none.csv");
    ASSERT_FALSE(t.ok());
    EXPECT_EQ(t.error().file, "/nonexistent/foldline/none.csv");
    EXPECT_NE(t.error().message.find("cannot open"), std::string::npos);
    auto d = read_csv(std::filesystem::temp_directory_path().string());
    ASSERT_FALSE(d.ok());
    EXPECT_NE(d.error().message.find("directory"), std::string::npos);
}

TEST(DetectDelimiter, PrefersConsistentSplits) {
    EXPECT_EQ(detect_delimiter(""), ',');
    EXPECT_EQ(detect_delimiter("a;b;c\n1;2;3\n"), ';');
    EXPECT_EQ(detect_delimiter("a,b;c\n1,2;3\n4,5,6;7\n"), ';');  // ',' varies per row, ';' does not
    EXPECT_EQ(detect_delimiter("x\n1\n"), ',');
    EXPECT_EQ(detect_delimiter("a\tb|c\n1\t2|3\n"), '\t');  // tie: the earlier candidate
}

// ---------------------------------------------------------------------------------------------
// Parallel chunks: a generated file with quoted fields that hold newlines, delimiters and
// doubled quotes, read in one piece on one thread and in thousands of small chunks on four,
// must give identical tables. The generator also gives the expected cells.

struct Generated {
    std::string text;
    std::vector<std::string> ids, notes;
    std::vector<double> amounts;
    std::size_t rows = 0;
};

Generated generate(std::size_t rows) {
    Generated g;
    g.rows = rows;
    std::mt19937_64 rng(20240601);
    const char* regions[] = {"north", "south", "east", "west", "centre"};
    g.text = "id,region,amount,note,late_text,score\r\n";
    for (std::size_t i = 0; i < rows; ++i) {
        const std::uint64_t r = rng();
        std::string note;
        switch (r % 5) {
            case 0: note = "plain"; break;
            case 1: note = "two\nlines, with comma"; break;
            case 2: note = "say \"hi\""; break;
            case 3: note = "a;b|c\r\nd"; break;
            default:
                note = "n";
                note += std::to_string(r % 97);
                break;
        }
        const double amount = static_cast<double>(r % 100000) / 100.0;
        std::string id = "R";
        id += std::to_string(i);
        // late_text is numeric until row 180000, then one text cell turns it categorical.
        const std::string late = i == 180000 ? "unknown" : std::to_string(r % 7);
        std::string quoted_note = "\"";
        for (char c : note) {
            quoted_note += c;
            if (c == '"') quoted_note += '"';
        }
        quoted_note += "\"";
        char amount_text[32];
        std::snprintf(amount_text, sizeof amount_text, "%.2f", amount);
        g.text += id + "," + regions[(r >> 8) % 5] + "," + ((r >> 16) % 50 == 0 ? std::string() : amount_text) + "," +
                  quoted_note + "," + late + "," + std::to_string(static_cast<int>((r >> 24) % 1000) - 500) +
                  ((r >> 40) % 3 == 0 ? "\r\n" : "\n");
        g.ids.push_back(id);
        g.notes.push_back(note);
        g.amounts.push_back((r >> 16) % 50 == 0 ? NAN : std::strtod(amount_text, nullptr));
    }
    return g;
}

void expect_same_tables(const Table& a, const Table& b) {
    ASSERT_EQ(a.rows, b.rows);
    ASSERT_EQ(a.columns.size(), b.columns.size());
    for (std::size_t c = 0; c < a.columns.size(); ++c) {
        const Column& x = a.columns[c];
        const Column& y = b.columns[c];
        EXPECT_EQ(x.name, y.name);
        ASSERT_EQ(x.type, y.type) << x.name;
        EXPECT_EQ(x.missing_count, y.missing_count) << x.name;
        if (x.is_categorical()) {
            EXPECT_EQ(x.levels, y.levels) << x.name;
            EXPECT_TRUE(x.codes == y.codes) << x.name;
        } else {
            ASSERT_EQ(x.values.size(), y.values.size());
            for (std::size_t i = 0; i < x.values.size(); ++i)
                ASSERT_TRUE(x.values[i] == y.values[i] || (std::isnan(x.values[i]) && std::isnan(y.values[i])))
                    << x.name << " row " << i;
        }
    }
}

TEST(CsvReaderParallel, OneThreadAndManyChunksGiveIdenticalTables) {
    const Generated g = generate(200000);
    CsvOptions one;
    one.threads = 1;
    one.chunk_bytes = g.text.size() + 1;  // a single chunk
    auto a = read_csv_text(g.text, "gen.csv", one);
    ASSERT_TRUE(a.ok()) << a.error().to_string();

    // Cross-check against the generator, so both readings are right and not only equal.
    ASSERT_EQ(a->rows, g.rows);
    const Column* id = a->column("id");
    const Column* note = a->column("note");
    const Column* amount = a->column("amount");
    const Column* late = a->column("late_text");
    const Column* score = a->column("score");
    ASSERT_TRUE(id && note && amount && late && score);
    EXPECT_TRUE(id->is_categorical());
    EXPECT_EQ(id->levels.size(), g.rows);
    EXPECT_TRUE(std::holds_alternative<std::vector<std::uint32_t>>(id->codes));
    EXPECT_TRUE(amount->is_numeric());
    EXPECT_TRUE(late->is_categorical());
    EXPECT_TRUE(score->is_numeric());
    for (std::size_t i = 0; i < g.rows; i += 997) {
        EXPECT_EQ(cell(*id, i), g.ids[i]);
        EXPECT_EQ(cell(*note, i), g.notes[i]) << "row " << i;
        if (std::isnan(g.amounts[i])) EXPECT_TRUE(amount->is_missing(i));
        else EXPECT_EQ(amount->values[i], g.amounts[i]);
    }
    EXPECT_EQ(cell(*late, 180000), "unknown");

    for (std::size_t chunk : {std::size_t{4096}, std::size_t{65536}, std::size_t{1} << 20}) {
        CsvOptions many;
        many.threads = 4;
        many.chunk_bytes = chunk;
        auto b = read_csv_text(g.text, "gen.csv", many);
        ASSERT_TRUE(b.ok()) << b.error().to_string();
        SCOPED_TRACE("chunk_bytes " + std::to_string(chunk));
        expect_same_tables(*a, *b);
    }
}

TEST(CsvReaderParallel, ErrorsAreTheSameWhateverTheChunking) {
    Generated g = generate(20000);
    // A ragged row deep in the file, after many quoted newlines.
    const std::size_t cut = g.text.size() * 3 / 4;
    const std::size_t at = g.text.find("\nR", cut) + 1;
    g.text.insert(at, "extra,row\n");
    CsvOptions one;
    one.threads = 1;
    one.chunk_bytes = g.text.size() + 1;
    auto a = read_csv_text(g.text, "gen.csv", one);
    ASSERT_FALSE(a.ok());
    CsvOptions many;
    many.threads = 4;
    many.chunk_bytes = 1000;
    auto b = read_csv_text(g.text, "gen.csv", many);
    ASSERT_FALSE(b.ok());
    EXPECT_EQ(a.error().to_string(), b.error().to_string());
    EXPECT_EQ(a.error().line, 1u + static_cast<std::size_t>(std::count(g.text.begin(), g.text.begin() + at, '\n')));
}

std::string outcome(const Result<Table>& t) {
    std::string out;
    if (!t.ok()) {
        out = "error: ";
        out += t.error().to_string();
        return out;
    }
    out = std::to_string(t->rows);
    out += " rows:";
    for (const auto& c : t->columns) {
        out += ' ';
        out += c.name;
        out += c.is_numeric() ? "/N" : "/C";
        for (std::size_t i = 0; i < t->rows; ++i) {
            out += '|';
            out += cell(c, i);
        }
    }
    return out;
}

TEST(CsvReaderParallel, FieldsSpanningManySplitsAreJoinedOnce) {
    // Most newlines are inside quotes: nearly every split point falls inside a field.
    std::string text = "id,story\n";
    for (int i = 0; i < 400; ++i) {
        text += std::to_string(i) + ",\"";
        for (int k = 0; k < 30; ++k) text += "line " + std::to_string(k) + " of \"\"story\"\"\n";
        text += "\"\n";
    }
    CsvOptions one;
    one.threads = 1;
    one.chunk_bytes = text.size() + 1;
    CsvOptions many;
    many.threads = 4;
    many.chunk_bytes = 100;
    auto a = read_csv_text(text, "s.csv", one);
    auto b = read_csv_text(text, "s.csv", many);
    ASSERT_TRUE(a.ok()) << a.error().to_string();
    EXPECT_EQ(a->rows, 400u);
    EXPECT_EQ(outcome(a), outcome(b));
}

TEST(CsvReaderParallel, DamagedInputsGiveTheSameOutcomeWhateverTheChunking) {
    // Random byte damage (quotes, delimiters, newlines, invalid bytes, NULs) must never crash
    // and must give the same table or the same error in one chunk as in many small ones.
    const Generated g = generate(300);
    std::mt19937_64 rng(7);
    const char damage[] = {'"', ',', '\n', '\r', '\xFF', '\xC3', '\0', ';', 'x', '1', 'e'};
    for (int round = 0; round < 300; ++round) {
        std::string text = g.text;
        const int edits = 1 + static_cast<int>(rng() % 4);
        for (int e = 0; e < edits; ++e) {
            const std::size_t at = rng() % text.size();
            const char c = damage[rng() % sizeof damage];
            switch (rng() % 3) {
                case 0: text[at] = c; break;
                case 1: text.insert(text.begin() + static_cast<std::ptrdiff_t>(at), c); break;
                default: text.erase(at, 1 + rng() % 3); break;
            }
        }
        CsvOptions one;
        one.threads = 1;
        one.chunk_bytes = text.size() + 1;
        CsvOptions many;
        many.threads = 3;
        many.chunk_bytes = 64 + rng() % 512;
        const std::string a = outcome(read_csv_text(text, "d.csv", one));
        const std::string b = outcome(read_csv_text(text, "d.csv", many));
        ASSERT_EQ(a, b) << "round " << round;
    }
}

// Cross-check with pandas.read_csv: tests/core/io/data/clinic_visits.golden.json holds pandas
// 1.5's reading of the fixture (tests/reference/csv_reader_reference.py writes and re-checks it).
TEST(CsvReaderReference, AgreesWithPandasOnTheClinicFixture) {
    const std::string dir = std::string(FOLDLINE_TEST_DATA_DIR) + "/data/";
    std::ifstream gf(dir + "clinic_visits.golden.json");
    ASSERT_TRUE(gf) << "golden file missing";
    const nlohmann::json golden = nlohmann::json::parse(gf);
    for (unsigned threads : {1u, 2u}) {
        CsvOptions o;
        o.threads = threads;
        o.chunk_bytes = threads == 1 ? 0 : 5000;
        auto t = read_csv(dir + "clinic_visits.csv", o);
        ASSERT_TRUE(t.ok()) << t.error().to_string();
        ASSERT_EQ(t->rows, golden["rows"].get<std::size_t>());
        ASSERT_EQ(t->columns.size(), golden["columns"].size());
        for (std::size_t i = 0; i < t->columns.size(); ++i) {
            const Column& c = t->columns[i];
            const auto& g = golden["columns"][i];
            SCOPED_TRACE(c.name);
            EXPECT_EQ(c.name, g["name"].get<std::string>());
            EXPECT_EQ(c.is_numeric() ? "numeric" : "categorical", g["type"].get<std::string>());
            EXPECT_EQ(c.missing_count, g["missing"].get<std::size_t>());
            EXPECT_EQ(c.distinct_count(), g["distinct"].get<std::size_t>());
            if (c.is_categorical()) {
                EXPECT_EQ(c.levels, g["levels"].get<std::vector<std::string>>());
            } else {
                double sum = 0;
                for (double x : c.values)
                    if (!std::isnan(x)) sum += x;
                EXPECT_NEAR(sum, g["sum"].get<double>(), 1e-9 * std::max(1.0, std::abs(sum)));
            }
        }
    }
}

}  // namespace
