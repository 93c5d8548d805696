// core/io/table_reader.h and the readers behind it, against files written by independent
// writers Debian ships: R's haven (r-cran-haven: SAS transport v5/v8, SAS data set, SPSS .sav
// and .zsav, Stata .dta), pandas' DataFrame.to_stata, python3-openpyxl (.xlsx) and python3-xlwt
// (.xls). Each fixture holds the same invented clinic visits as clinic_followup.csv (see the
// generator scripts in data/formats/), so each must read as the very same Table as the CSV.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>

#include "core/io/column_builder.h"
#include "core/io/decimal_mark.h"
#include "core/io/table_reader.h"
#include "core/io/xlsx_reader.h"

namespace foldline {
namespace {

const std::string kDir = std::string(FOLDLINE_TEST_DATA_DIR) + "/data/formats/";

Table must_read(const std::string& file, const ReadOptions& o = {}, ReadReport* rep = nullptr) {
    auto t = read_table(kDir + file, o, rep);
    EXPECT_TRUE(t) << file << ": " << (t ? "" : t.error().to_string());
    return t ? std::move(*t) : Table{};
}

// Same columns, types, levels, codes and numbers (NaN equal to NaN), weights too.
void expect_same_table(const Table& want, const Table& got, const std::string& what) {
    ASSERT_EQ(want.rows, got.rows) << what;
    ASSERT_EQ(want.columns.size(), got.columns.size()) << what;
    EXPECT_EQ(want.weights, got.weights) << what;
    for (std::size_t c = 0; c < want.columns.size(); ++c) {
        const Column& a = want.columns[c];
        const Column& b = got.columns[c];
        EXPECT_EQ(a.name, b.name) << what;
        ASSERT_EQ(a.type, b.type) << what << " column " << a.name;
        EXPECT_EQ(a.missing_count, b.missing_count) << what << " column " << a.name;
        if (a.is_categorical()) {
            EXPECT_EQ(a.levels, b.levels) << what << " column " << a.name;
            for (std::size_t i = 0; i < a.size(); ++i) ASSERT_EQ(a.code(i), b.code(i)) << what << " " << a.name << " row " << i;
        } else {
            for (std::size_t i = 0; i < a.size(); ++i) {
                const double x = a.values[i], y = b.values[i];
                ASSERT_TRUE((std::isnan(x) && std::isnan(y)) || x == y) << what << " " << a.name << " row " << i;
            }
        }
    }
}

TEST(TableReader, EveryFormatReadsAsTheCsv) {
    const Table csv = must_read("clinic_followup.csv");
    // The reference itself, as the CSV reader types it (no guess of ours behind the comparison).
    ASSERT_EQ(csv.rows, 200u);
    ASSERT_TRUE(csv.column("comment")->is_numeric());
    EXPECT_EQ(csv.column("comment")->missing_count, 200u);
    for (const char* f : {"clinic_followup_v5.xpt", "clinic_followup_v8.xpt", "clinic_followup.sas7bdat",
                          "clinic_followup.sav", "clinic_followup.zsav", "clinic_followup_haven.dta",
                          "clinic_followup_pandas.dta", "clinic_followup.xls"}) {
        SCOPED_TRACE(f);
        expect_same_table(csv, must_read(f), f);
    }
    ReadOptions o;
    o.sheet = "visits";
    expect_same_table(csv, must_read("clinic_followup.xlsx", o), "clinic_followup.xlsx");
}

TEST(TableReader, FormatsAreDetected) {
    EXPECT_EQ(detect_format(kDir + "clinic_followup_v5.xpt"), FileFormat::Xpt);
    EXPECT_EQ(detect_format(kDir + "clinic_followup_v8.xpt"), FileFormat::Xpt);
    EXPECT_EQ(detect_format(kDir + "clinic_followup.sas7bdat"), FileFormat::Sas7bdat);
    EXPECT_EQ(detect_format(kDir + "clinic_followup.zsav"), FileFormat::Sav);
    EXPECT_EQ(detect_format(kDir + "clinic_followup_pandas.dta"), FileFormat::Dta);
    EXPECT_EQ(detect_format(kDir + "clinic_followup.xlsx"), FileFormat::Xlsx);
    EXPECT_EQ(detect_format(kDir + "clinic_followup.xls"), FileFormat::Xls);
    EXPECT_EQ(detect_format(kDir + "clinic_followup.csv"), FileFormat::Csv);
}

TEST(TableReader, VariableAndValueLabels) {
    const Table sav = must_read("clinic_followup.sav");
    const Column* site = sav.column("site");
    ASSERT_TRUE(site);
    EXPECT_EQ(site->label, "Clinic site");
    EXPECT_EQ(site->description, "codes: 1 = North clinic; 2 = South clinic");
    // The user-defined missing code 9 ("not recorded") is a missing cell, not a level.
    const Column* recov = sav.column("recov");
    EXPECT_EQ(recov->levels, (std::vector<std::string>{"yes", "no"}));
    EXPECT_EQ(recov->missing_count, 6u);
    EXPECT_EQ(recov->description, "codes: 0 = no; 1 = yes; 9 = not recorded");
    const Table xpt = must_read("clinic_followup_v5.xpt");
    EXPECT_EQ(xpt.column("visitdt")->label, "Follow-up visit date");
    EXPECT_EQ(xpt.column("visitdt")->levels.front(), "2024-01-01");
    // Special missing .A in SAS, .a in Stata: missing ages.
    EXPECT_EQ(xpt.column("age")->missing_count, 5u);
    EXPECT_EQ(must_read("clinic_followup_haven.dta").column("age")->missing_count, 5u);
    EXPECT_EQ(must_read("clinic_followup_pandas.dta").column("recov")->label, "Recovered at follow-up");
}

TEST(TableReader, PreCountedWorkbook) {
    ReadOptions o;
    o.count_column = "n";
    const Table t = must_read("clinic_counts.xlsx", o);
    EXPECT_TRUE(t.weighted());
    EXPECT_EQ(t.weight_column, "n");
    EXPECT_DOUBLE_EQ(t.total_weight(), 194.0);  // 200 visits, 6 outcomes not recorded
    o.count_column = "nope";
    auto bad = read_table(kDir + "clinic_counts.xlsx", o);
    ASSERT_FALSE(bad);
    EXPECT_NE(bad.error().message.find("count column 'nope' is not in the file"), std::string::npos);
    o.count_column = "site";
    bad = read_table(kDir + "clinic_counts.xlsx", o);
    ASSERT_FALSE(bad);
    EXPECT_NE(bad.error().message.find("set to numeric"), std::string::npos) << bad.error().message;
}

TEST(TableReader, PreCountedStatFile) {
    ReadOptions o;
    o.count_column = "age";  // a numeric column with missing cells is not a count
    auto bad = read_table(kDir + "clinic_followup.sav", o);
    ASSERT_FALSE(bad);
    EXPECT_NE(bad.error().message.find("a missing count in count column 'age'"), std::string::npos)
        << bad.error().message;
}

TEST(TableReader, WorkbookCellKinds) {
    ReadReport rep;
    const Table t = must_read("kinds.xlsx", {}, &rep);
    ASSERT_EQ(t.rows, 3u);
    EXPECT_EQ(t.column("flag")->levels, (std::vector<std::string>{"TRUE", "FALSE"}));
    EXPECT_EQ(t.column("when")->levels, (std::vector<std::string>{"2024-03-01", "1999-12-31"}));  // 1904 system
    EXPECT_TRUE(t.column("score")->is_numeric());
    EXPECT_EQ(t.column("score")->missing_count, 1u);  // the #N/A error cell
    EXPECT_EQ(t.column("label")->levels.front(), "\xC3\x9Cn\xC3\xAF" "code");
    ASSERT_FALSE(rep.warnings.empty());
    EXPECT_NE(rep.warnings.front().find("error cells"), std::string::npos);
}

TEST(TableReader, SpreadsheetDates) {
    // Serial 45352 is 2024-03-01 in the 1900 system; 60 is the phantom 1900-02-29, so 59 is
    // 1900-02-28 and 61 is 1900-03-01 (the serial rule as spreadsheets apply it, from memory).
    EXPECT_EQ(spreadsheet_date_text(45352, false, false), "2024-03-01");
    EXPECT_EQ(spreadsheet_date_text(59, false, false), "1900-02-28");
    EXPECT_EQ(spreadsheet_date_text(61, false, false), "1900-03-01");
    EXPECT_EQ(spreadsheet_date_text(45352.5, false, true), "2024-03-01T12:00:00");
    EXPECT_EQ(spreadsheet_date_text(0, true, false), "1904-01-01");
}

TEST(TableReader, SheetsAreNamedOrFirst) {
    auto first = read_table(kDir + "clinic_followup.xlsx");  // sheet "notes": a header only
    ASSERT_FALSE(first);
    EXPECT_NE(first.error().message.find("no data rows"), std::string::npos) << first.error().message;
    ReadOptions o;
    o.sheet = "nope";
    auto missing = read_table(kDir + "clinic_followup.xlsx", o);
    ASSERT_FALSE(missing);
    EXPECT_NE(missing.error().message.find("no sheet named 'nope' (its sheets: 'notes', 'visits')"), std::string::npos)
        << missing.error().message;
    auto on_csv = read_table(kDir + "clinic_followup.csv", o);
    ASSERT_FALSE(on_csv);
    EXPECT_EQ(on_csv.error().kind, ErrorKind::Usage);
    o.sheet = "visits";
    EXPECT_TRUE(read_table(kDir + "clinic_followup.xls", o));  // the .xls has one sheet, "visits"
}

TEST(TableReader, MergedCellsAndFormulasAreReported) {
    auto merged = read_table(kDir + "merged.xlsx");
    ASSERT_FALSE(merged);
    EXPECT_NE(merged.error().message.find("merged cells A2:A3"), std::string::npos) << merged.error().message;
    auto formula = read_table(kDir + "formula.xlsx");
    ASSERT_FALSE(formula);
    EXPECT_NE(formula.error().message.find("cell B2 holds a formula with no saved result"), std::string::npos)
        << formula.error().message;
}

std::string slurp(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return {std::istreambuf_iterator<char>(in), {}};
}

std::string temp_file(const std::string& name, const std::string& bytes) {
    const auto dir = std::filesystem::temp_directory_path() / ("foldline_table_reader_" + std::to_string(::getpid()));
    std::filesystem::create_directories(dir);
    const auto p = (dir / name).string();
    std::ofstream(p, std::ios::binary) << bytes;
    return p;
}

TEST(TableReaderHostile, TruncatedFilesAreRefused) {
    for (const char* f : {"clinic_followup_v5.xpt", "clinic_followup_v8.xpt", "clinic_followup.sas7bdat",
                          "clinic_followup.sav", "clinic_followup.zsav", "clinic_followup_haven.dta",
                          "clinic_followup.xlsx", "clinic_followup.xls"}) {
        SCOPED_TRACE(f);
        const std::string bytes = slurp(kDir + f);
        for (std::size_t cut : {std::size_t{10}, bytes.size() / 2 + 3, bytes.size() - 7}) {
            const std::string p = temp_file(std::string("cut_") + f, bytes.substr(0, cut));
            ReadOptions o;
            if (std::string(f) == "clinic_followup.xlsx") o.sheet = "visits";
            auto t = read_table(p, o);
            // A cut in trailing padding can leave every row readable; then the table is whole.
            if (t) {
                EXPECT_EQ(t->rows, 200u);
                continue;
            }
            EXPECT_EQ(t.error().file, p);
            EXPECT_FALSE(t.error().message.empty());
        }
    }
}

TEST(TableReaderHostile, WrongMagicIsRefused) {
    const std::string text = "site,recov\nNorth,yes\n";
    for (const char* name : {"text.xlsx", "text.xls", "text.sav", "text.dta", "text.xpt", "text.sas7bdat"}) {
        SCOPED_TRACE(name);
        auto t = read_table(temp_file(name, text));
        ASSERT_FALSE(t);
        EXPECT_FALSE(t.error().message.empty());
    }
    auto x = read_table(temp_file("text2.xlsx", text));
    EXPECT_NE(x.error().message.find("not an .xlsx workbook"), std::string::npos) << x.error().message;
    // A zip archive that is not a workbook.
    const std::string zip = slurp(kDir + "bomb.xlsx");
    EXPECT_FALSE(read_table(temp_file("empty.xlsx", zip.substr(0, 30))));
}

TEST(TableReaderHostile, SpreadsheetBombsAreRefused) {
    auto bomb = read_table(kDir + "bomb.xlsx");
    ASSERT_FALSE(bomb);
    EXPECT_NE(bomb.error().message.find("zip bomb"), std::string::npos) << bomb.error().message;
    auto huge = read_table(kDir + "huge_dimension.xlsx");
    ASSERT_FALSE(huge);
    EXPECT_NE(huge.error().message.find("cell XFD1048576 holds a value but column XFD has no name"), std::string::npos)
        << huge.error().message;
    // A sheet past the cell limit stops at the limit.
    CsvOptions o;
    SpreadsheetLimits small;
    small.max_cells = 100;
    auto capped = read_xlsx(kDir + "clinic_followup.xlsx", "visits", o, nullptr, {}, small);
    ASSERT_FALSE(capped);
    EXPECT_NE(capped.error().message.find("more than 100 cells"), std::string::npos) << capped.error().message;
}

TEST(DecimalMark, AutomaticReadingSaysWhatItDid) {
    ReadReport rep;
    const Table t = must_read("decimal_comma.csv", {}, &rep);
    const Table ref = must_read("decimal_point.csv");
    EXPECT_EQ(t.column("revenue")->values, ref.column("revenue")->values);
    EXPECT_EQ(t.column("margin")->values, ref.column("margin")->values);
    // "1,250": a decimal comma or comma thousands — left as text and reported.
    EXPECT_TRUE(t.column("returned")->is_categorical());
    // "1.234" read as 1.234, and said so, because other columns use decimal commas.
    EXPECT_DOUBLE_EQ(t.column("units")->values[0], 1.234);
    ASSERT_EQ(rep.numbers.size(), 4u);
    EXPECT_EQ(rep.numbers[0].column, "revenue");
    EXPECT_EQ(rep.numbers[0].kind, NumberReading::DecimalComma);
    EXPECT_EQ(rep.numbers[1].kind, NumberReading::DecimalComma);
    EXPECT_EQ(rep.numbers[2].column, "returned");
    EXPECT_EQ(rep.numbers[2].kind, NumberReading::Ambiguous);
    EXPECT_EQ(rep.numbers[3].column, "units");
    EXPECT_EQ(rep.numbers[3].kind, NumberReading::PointKept);
}

TEST(DecimalMark, CommaAskedForReadsEveryColumn) {
    ReadOptions o;
    o.decimal = DecimalMark::Comma;
    const Table t = must_read("decimal_comma.csv", o);
    const Table ref = must_read("decimal_point.csv");
    for (const char* c : {"revenue", "margin", "units", "returned"}) EXPECT_EQ(t.column(c)->values, ref.column(c)->values) << c;
    EXPECT_TRUE(t.column("branch")->is_categorical());
    o.decimal = DecimalMark::Point;
    ReadReport rep;
    const Table p = must_read("decimal_comma.csv", o, &rep);
    EXPECT_TRUE(p.column("revenue")->is_categorical());
    // Nothing read silently as text: the columns written as numbers with a comma are named.
    ASSERT_EQ(rep.numbers.size(), 3u);
    EXPECT_EQ(rep.numbers[0].column, "revenue");
    EXPECT_EQ(rep.numbers[0].kind, NumberReading::NotRead);
    EXPECT_EQ(rep.numbers[0].example, "1.234,50");
    EXPECT_EQ(rep.numbers[1].column, "margin");
    EXPECT_EQ(rep.numbers[2].column, "returned");
    EXPECT_EQ(rep.numbers[2].kind, NumberReading::NotRead);
    EXPECT_NE(rep.numbers[0].describe().find("not with the decimal mark asked for"), std::string::npos);
}

TEST(DecimalMark, CommaAskedForNamesColumnsItCannotRead) {
    // "1.5" and "2.25" are numbers with a decimal point: with a decimal comma asked for they stay
    // text, and the reading says so instead of passing them over.
    ReadOptions o;
    o.decimal = DecimalMark::Comma;
    ReadReport rep;
    const std::string path = (std::filesystem::temp_directory_path() / "foldline_decimal_scores.csv").string();
    {
        std::ofstream f(path, std::ios::binary);
        f << "site;score;amount\nA;1.5;1,5\nB;2.25;2,25\n";
    }
    auto t = read_table(path, o, &rep);
    std::filesystem::remove(path);
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    EXPECT_TRUE(t->column("score")->is_categorical());
    EXPECT_TRUE(t->column("amount")->is_numeric());
    ASSERT_EQ(rep.numbers.size(), 2u);
    EXPECT_EQ(rep.numbers[0].column, "score");
    EXPECT_EQ(rep.numbers[0].kind, NumberReading::NotRead);
    EXPECT_EQ(rep.numbers[0].example, "1.5");
    EXPECT_EQ(rep.numbers[1].column, "amount");
    EXPECT_EQ(rep.numbers[1].kind, NumberReading::DecimalComma);
}

TEST(DecimalMark, GroupedNumbers) {
    double v = 0;
    EXPECT_TRUE(parse_grouped_number("1.234.567,5", ',', v));
    EXPECT_DOUBLE_EQ(v, 1234567.5);
    EXPECT_TRUE(parse_grouped_number("-0,25", ',', v));
    EXPECT_DOUBLE_EQ(v, -0.25);
    EXPECT_TRUE(parse_grouped_number("1,234.5", '.', v));
    EXPECT_DOUBLE_EQ(v, 1234.5);
    EXPECT_FALSE(parse_grouped_number("1.23,4", ',', v));   // a group of two
    EXPECT_FALSE(parse_grouped_number("1234.567,8", ',', v));  // grouping after four digits
    EXPECT_FALSE(parse_grouped_number("12,", ',', v));
    EXPECT_FALSE(parse_grouped_number("abc", ',', v));
}

}  // namespace
}  // namespace foldline
