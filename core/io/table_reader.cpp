#include "core/io/table_reader.h"

#include <algorithm>
#include <cctype>
#include <cstring>
#include <fstream>

#include "core/io/stat_file_reader.h"
#include "core/io/xls_reader.h"
#include "core/io/xlsx_reader.h"

namespace foldline {

std::string_view format_name(FileFormat f) {
    switch (f) {
        case FileFormat::Csv: return "CSV";
        case FileFormat::Xpt: return "SAS transport";
        case FileFormat::Sas7bdat: return "SAS data set";
        case FileFormat::Sav: return "SPSS";
        case FileFormat::Dta: return "Stata";
        case FileFormat::Xlsx: return "xlsx";
        case FileFormat::Xls: return "xls";
    }
    return "CSV";
}

std::string_view format_key(FileFormat f) {
    switch (f) {
        case FileFormat::Csv: return "csv";
        case FileFormat::Xpt: return "xpt";
        case FileFormat::Sas7bdat: return "sas7bdat";
        case FileFormat::Sav: return "sav";
        case FileFormat::Dta: return "dta";
        case FileFormat::Xlsx: return "xlsx";
        case FileFormat::Xls: return "xls";
    }
    return "csv";
}

FileFormat detect_format(const std::string& path) {
    std::string ext;
    if (const auto dot = path.find_last_of('.'); dot != std::string::npos && path.find('/', dot) == std::string::npos)
        ext = path.substr(dot + 1);
    std::transform(ext.begin(), ext.end(), ext.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    char head[80] = {};
    std::ifstream in(path, std::ios::binary);
    in.read(head, sizeof head);
    const auto got = static_cast<std::size_t>(in.gcount());
    const std::string_view h(head, got);
    // First bytes that settle it, whatever the extension says.
    if (h.starts_with("PK\x03\x04")) return FileFormat::Xlsx;
    if (h.starts_with("\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1")) return FileFormat::Xls;
    if (h.starts_with("$FL2") || h.starts_with("$FL3")) return FileFormat::Sav;
    if (h.starts_with("HEADER RECORD*******LIBRARY HEADER RECORD!!!!!!!") ||
        h.starts_with("HEADER RECORD*******LIBV8   HEADER RECORD!!!!!!!"))
        return FileFormat::Xpt;
    if (h.starts_with("<stata_dta>")) return FileFormat::Dta;
    static const unsigned char kSasMagic[32] = {0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00,
                                                0x00, 0xc2, 0xea, 0x81, 0x60, 0xb3, 0x14, 0x11, 0xcf, 0xbd, 0x92,
                                                0x08, 0x00, 0x09, 0xc7, 0x31, 0x8c, 0x18, 0x1f, 0x10, 0x11};
    if (got >= 32 && std::memcmp(head, kSasMagic, 32) == 0) return FileFormat::Sas7bdat;
    // Otherwise the extension (old Stata files have no text signature; a damaged file of a
    // named format is still reported by that format's reader, not read as CSV text).
    if (ext == "xpt" || ext == "xport") return FileFormat::Xpt;
    if (ext == "sas7bdat") return FileFormat::Sas7bdat;
    if (ext == "sav" || ext == "zsav") return FileFormat::Sav;
    if (ext == "dta") return FileFormat::Dta;
    if (ext == "xlsx" || ext == "xlsm") return FileFormat::Xlsx;
    if (ext == "xls") return FileFormat::Xls;
    return FileFormat::Csv;
}

namespace {

std::vector<std::string> categorical_overrides(const ReadOptions& o) {
    std::vector<std::string> v;
    for (const auto& [name, type] : o.type_overrides)
        if (type == ColumnType::Categorical) v.push_back(name);
    return v;
}

Result<Table> read_csv_with_mark(const std::string& path, const ReadOptions& opts, ReadReport& report,
                                 const Work& work) {
    if (opts.decimal != DecimalMark::Comma) {
        auto t = read_csv(path, opts, &report.csv, work);
        if (t) report.numbers = decide_decimal_marks(*t, opts.decimal, categorical_overrides(opts));
        return t;
    }
    // A decimal comma for every column: read all of them as text, then turn the columns whose
    // every level is a decimal-comma number into numbers.
    CsvOptions as_text = opts;
    as_text.all_text = true;
    auto t = read_csv(path, as_text, &report.csv, work);
    if (!t) return t;
    std::vector<std::string> keep = categorical_overrides(opts);
    report.numbers = decide_decimal_marks(*t, DecimalMark::Comma, keep);
    for (const auto& [name, type] : opts.type_overrides) {
        const Column* c = t->column(name);
        if (type == ColumnType::Numeric && c && c->is_categorical())
            return make_error("column '" + name + "' is set to numeric but not every value reads as a number with a decimal comma",
                              path);
    }
    return t;
}

}  // namespace

Result<Table> read_table(const std::string& path, const ReadOptions& opts, ReadReport* report_out,
                         const Work& work) {
    ReadReport report;
    report.format = detect_format(path);
    report.sheet = opts.sheet;
    if (!opts.sheet.empty() && report.format != FileFormat::Xlsx && report.format != FileFormat::Xls)
        return usage_error(make_error("a sheet is named ('" + opts.sheet + "') but this is a " +
                                      std::string(format_name(report.format)) + " file, not a workbook",
                                      path));
    Result<Table> t = make_error("");
    switch (report.format) {
        case FileFormat::Csv: t = read_csv_with_mark(path, opts, report, work); break;
        case FileFormat::Xpt: t = read_stat_file(path, StatFormat::Xpt, opts, &report.warnings, work); break;
        case FileFormat::Sas7bdat: t = read_stat_file(path, StatFormat::Sas7bdat, opts, &report.warnings, work); break;
        case FileFormat::Sav: t = read_stat_file(path, StatFormat::Sav, opts, &report.warnings, work); break;
        case FileFormat::Dta: t = read_stat_file(path, StatFormat::Dta, opts, &report.warnings, work); break;
        case FileFormat::Xlsx: t = read_xlsx(path, opts.sheet, opts, &report.warnings, work); break;
        case FileFormat::Xls: t = read_xls(path, opts.sheet, opts, &report.warnings, work); break;
    }
    if (!t) return t;
    if (report.format == FileFormat::Xlsx || report.format == FileFormat::Xls)
        report.numbers = decide_decimal_marks(*t, opts.decimal, categorical_overrides(opts));
    report.warnings.insert(report.warnings.begin(), report.csv.warnings.begin(), report.csv.warnings.end());
    if (report_out) *report_out = std::move(report);
    return t;
}

}  // namespace foldline
