// foldline inspect DATA: reads a data file (CSV/TSV, SAS, SPSS, Stata, xlsx, xls) and describes every column (type, missing cells,
// distinct values, first levels), as text or JSON. The first look at a new source.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iomanip>
#include <iostream>
#include <sstream>
#include <string>
#include <unistd.h>

#include <nlohmann/json.hpp>

#include "app/cli/args.h"
#include "app/cli/command.h"
#include "app/cli/count_warning.h"
#include "core/common/atomic_file.h"
#include "core/io/table_reader.h"

namespace foldline::cli {

namespace {

constexpr const char* kName = "inspect";
constexpr std::size_t kShownLevels = 6;

std::optional<char> parse_delimiter(const std::string& s) {
    if (s == "tab" || s == "\\t" || s == "\t") return '\t';
    if (s == "comma") return ',';
    if (s == "semicolon") return ';';
    if (s == "pipe") return '|';
    if (s.size() == 1 && s[0] != '"' && s[0] != '\n' && s[0] != '\r') return s[0];
    return std::nullopt;
}

std::vector<std::string> split_list(const std::string& s) {
    std::vector<std::string> out;
    std::string cur;
    for (char c : s) {
        if (c == ',') {
            out.push_back(cur);
            cur.clear();
        } else {
            cur.push_back(c);
        }
    }
    out.push_back(cur);
    return out;
}

std::string delimiter_label(char d) {
    switch (d) {
        case '\t': return "tab";
        case ',': return "comma";
        case ';': return "semicolon";
        case '|': return "pipe";
        default: return std::string(1, d);
    }
}

std::string number_text(double x) {
    std::ostringstream os;
    os << std::setprecision(10) << x;
    return os.str();
}

// Distinct non-missing values. Numbers are counted by sorting a copy, which is faster and far
// smaller than a hash set on million-row columns.
std::size_t distinct_values(const Column& c) {
    if (c.is_categorical()) return c.distinct_count();
    std::vector<double> v;
    v.reserve(c.values.size() - c.missing_count);
    for (double x : c.values)
        if (!std::isnan(x)) v.push_back(x == 0.0 ? 0.0 : x);  // -0 and +0 are one value
    std::sort(v.begin(), v.end());
    return static_cast<std::size_t>(std::unique(v.begin(), v.end()) - v.begin());
}

struct Range {
    double lo = NAN, hi = NAN;
};

Range numeric_range(const Column& c) {
    Range r;
    for (double x : c.values) {
        if (std::isnan(x)) continue;
        if (std::isnan(r.lo) || x < r.lo) r.lo = x;
        if (std::isnan(r.hi) || x > r.hi) r.hi = x;
    }
    return r;
}

nlohmann::json describe_json(const Table& t, const ReadReport& read) {
    const CsvReport& rep = read.csv;
    nlohmann::json j;
    j["source"] = t.source;
    j["format"] = std::string(format_key(read.format));
    if (!read.sheet.empty()) j["sheet"] = read.sheet;
    j["rows"] = t.rows;
    if (read.format == FileFormat::Csv) {
        j["delimiter"] = std::string(1, rep.delimiter);
        j["byte_order_mark"] = rep.had_bom;
        j["physical_lines"] = rep.physical_lines;
    }
    j["weighted"] = t.weighted();
    if (t.weighted()) {
        j["count_column"] = t.weight_column;
        j["total_weight"] = t.total_weight();
    }
    j["skipped_lines"] = rep.skipped_lines;
    j["warnings"] = read.warnings;
    auto numbers = nlohmann::json::array();
    for (const auto& n : read.numbers)
        numbers.push_back({{"column", n.column},
                           {"reading", n.kind == NumberReading::DecimalComma     ? "decimal_comma"
                                       : n.kind == NumberReading::ThousandsComma ? "thousands_comma"
                                       : n.kind == NumberReading::PointKept      ? "decimal_point_kept"
                                       : n.kind == NumberReading::NotRead        ? "left_as_text"
                                                                                 : "ambiguous"},
                           {"example", n.example}});
    j["number_readings"] = std::move(numbers);
    auto cols = nlohmann::json::array();
    for (const auto& c : t.columns) {
        nlohmann::json jc;
        jc["name"] = c.name;
        if (!c.label.empty()) jc["label"] = c.label;
        if (!c.description.empty()) jc["description"] = c.description;
        jc["type"] = c.is_numeric() ? "numeric" : "categorical";
        jc["missing"] = c.missing_count;
        const std::size_t distinct = distinct_values(c);
        jc["distinct"] = distinct;
        jc["binary"] = distinct == 2;
        if (c.is_categorical()) {
            jc["levels"] = c.levels;
        } else {
            const Range r = numeric_range(c);
            jc["min"] = std::isnan(r.lo) ? nlohmann::json() : nlohmann::json(r.lo);
            jc["max"] = std::isnan(r.hi) ? nlohmann::json() : nlohmann::json(r.hi);
        }
        cols.push_back(std::move(jc));
    }
    j["columns"] = std::move(cols);
    return j;
}

void describe_text(std::ostream& os, const Table& t, const ReadReport& read) {
    const CsvReport& rep = read.csv;
    os << t.source << ": " << t.rows << " rows, " << t.columns.size() << " columns, ";
    if (read.format == FileFormat::Csv)
        os << delimiter_label(rep.delimiter) << "-separated" << (rep.had_bom ? ", UTF-8 with byte-order mark" : "");
    else
        os << format_name(read.format) << " file" << (read.sheet.empty() ? "" : ", sheet '" + read.sheet + "'");
    os << "\n";
    for (const auto& n : read.numbers) os << "numbers: column '" << n.column << "' " << n.describe() << "\n";
    if (t.weighted())
        os << "pre-counted: each row counts as '" << t.weight_column << "' rows (total " << number_text(t.total_weight())
           << ")\n";
    std::size_t width = 6;
    for (const auto& c : t.columns) width = std::max(width, c.name.size());
    width = std::min<std::size_t>(width, 32);
    os << "\n  " << std::left << std::setw(static_cast<int>(width)) << "column" << "  " << std::setw(11) << "type"
       << std::right << std::setw(9) << "missing" << std::setw(10) << "distinct" << "  values\n";
    for (const auto& c : t.columns) {
        const std::size_t distinct = distinct_values(c);
        std::string values;
        if (c.is_categorical()) {
            for (std::size_t i = 0; i < c.levels.size() && i < kShownLevels; ++i)
                values += (i ? ", " : "") + c.levels[i];
            if (c.levels.size() > kShownLevels) values += ", ... (+" + std::to_string(c.levels.size() - kShownLevels) + ")";
        } else {
            const Range r = numeric_range(c);
            values = std::isnan(r.lo) ? "(all missing)" : number_text(r.lo) + " to " + number_text(r.hi);
        }
        if (distinct == 2) values += "  [binary]";
        if (!c.label.empty()) values += "  \u2014 " + c.label;
        os << "  " << std::left << std::setw(static_cast<int>(width)) << c.name << "  " << std::setw(11)
           << (c.is_numeric() ? "numeric" : "categorical") << std::right << std::setw(9) << c.missing_count
           << std::setw(10) << distinct << "  " << values << "\n";
    }
}

int run_inspect(int argc, char** argv) {
    const std::vector<OptionSpec> specs = {
        {"count-column", true, "name of the column holding pre-counted cell sizes"},
        {"delimiter", true, "field delimiter: , ; | tab (default: detected)"},
        {"json", true, "write the description as JSON to FILE, or - for standard output"},
        {"skip-ragged", false, "skip rows with the wrong number of fields and list their lines"},
        {"missing", true, "comma-separated missing-value markers (default: empty,NA,N/A,NULL,.)"},
        {"threads", true, "parser threads (default: all cores)"},
        {"sheet", true, "workbooks (.xlsx, .xls): the sheet to read (default: the first)"},
        {"decimal", true, "decimal mark of text numbers: auto, . or , (default: auto)"},
    };
    Args args;
    if (auto e = Args::parse(argc, argv, 1, specs, args)) return fail(kName, kUsage, *e);
    if (args.positional().size() != 1)
        return fail(kName, kUsage, "expected one DATA file (usage: foldline inspect DATA [--count-column C] "
                                   "[--delimiter D] [--json FILE|-] [--skip-ragged] [--missing LIST])");
    ReadOptions opts;
    opts.sheet = args.get_or("sheet", "");
    if (auto d = args.get("decimal")) {
        auto m = parse_decimal_mark(*d);
        if (!m) return fail(kName, kUsage, "--decimal expects auto, . or , (got '" + *d + "')");
        opts.decimal = *m;
    }
    if (auto d = args.get("delimiter")) {
        auto c = parse_delimiter(*d);
        if (!c) return fail(kName, kUsage, "--delimiter expects one character or tab, got '" + *d + "'");
        opts.delimiter = *c;
    }
    if (auto m = args.get("missing")) opts.missing_markers = split_list(*m);
    opts.count_column = args.get_or("count-column", "");
    opts.skip_ragged = args.flag("skip-ragged", false);
    if (auto t = args.get("threads")) {
        char* end = nullptr;
        const long n = std::strtol(t->c_str(), &end, 10);
        if (t->empty() || *end || n < 1 || n > 256) return fail(kName, kUsage, "--threads expects a number from 1 to 256");
        opts.threads = static_cast<unsigned>(n);
    }

    ReadReport read;
    auto table = read_table(args.positional()[0], opts, &read);
    if (!table) return fail(kName, table.error().kind == ErrorKind::Usage ? kUsage : kInput, table.error().to_string());
    const CsvReport& report = read.csv;
    for (const auto& w : read.warnings) std::cerr << "foldline inspect: warning: " << w << "\n";
    warn_if_count_column_forgotten(std::cerr, "inspect", *table, opts.count_column);
    if (!report.skipped_lines.empty()) {
        std::cerr << "foldline inspect: skipped " << report.skipped_lines.size() << " ragged rows at lines";
        for (std::size_t i = 0; i < report.skipped_lines.size() && i < 20; ++i) std::cerr << " " << report.skipped_lines[i];
        if (report.skipped_lines.size() > 20) std::cerr << " ...";
        std::cerr << "\n";
    }

    const auto json_target = args.get("json");
    if (!json_target) {
        describe_text(std::cout, *table, read);
        return kOk;
    }
    const std::string text = describe_json(*table, read).dump(2) + "\n";
    if (*json_target == "-") {
        std::cout << text;
        return kOk;
    }
    // The shared atomic writer (fsync, rename; devices and pipes written in place, never renamed
    // over), so a full disk or a read-only folder leaves the previous file as it was.
    if (auto st = write_file_atomically(*json_target, text); !st) return fail(kName, kInput, st.error().to_string());
    describe_text(std::cout, *table, read);
    return kOk;
}

const CommandRegistration registration{Command{
    .name = kName,
    .synopsis = "inspect DATA [--count-column C] [--sheet NAME] [--decimal M] [--delimiter D] [--json FILE|-] [--skip-ragged] [--missing LIST]",
    .summary = "Reads a data file (CSV/TSV, SAS, SPSS, Stata, xlsx, xls) and lists each column's type, missing cells, distinct values and first levels.",
    .help = "Usage: foldline inspect DATA [--count-column C] [--delimiter D] [--json FILE|-] [--skip-ragged]\n"
            "  [--missing LIST] [--threads N] [--sheet NAME] [--decimal auto|.|,]\n"
            "Lists each column of a data file: type, missing cells, distinct values and first levels.\n"
            "DATA is CSV/TSV text, a SAS (.xpt, .sas7bdat), SPSS (.sav, .zsav) or Stata (.dta) file, or an\n"
            ".xlsx or .xls workbook; variable labels are shown beside column names.\n"
            "  --count-column C  name of the column holding pre-counted cell sizes\n"
            "  --sheet NAME      workbooks: the sheet to read (default: the first)\n"
            "  --decimal M       decimal mark of numbers written as text: auto (a column written\n"
            "                    consistently with decimal commas is read so; ambiguous columns are\n"
            "                    listed, not guessed), . or , (default: auto)\n"
            "  --delimiter D     field delimiter: , ; | tab (default: detected)\n"
            "  --json FILE|-     write the description as JSON to FILE, or - for standard output\n"
            "  --skip-ragged     skip rows with the wrong number of fields and list their lines\n"
            "  --missing LIST    comma-separated missing-value markers (default: empty,NA,N/A,NULL,.)\n"
            "  --threads N       parser threads, 1 to 256 (default: all cores)\n"
            "Exit codes: 0 done, 2 usage error, 3 input error (file, line and column), 1 internal error.\n",
    .run = run_inspect,
}};

}  // namespace

}  // namespace foldline::cli
