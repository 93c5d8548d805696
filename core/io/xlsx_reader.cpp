#include "core/io/xlsx_reader.h"

#include <expat.h>
#include <zip.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <set>

#include "core/io/column_builder.h"
#include "core/io/mapped_file.h"

namespace foldline {

namespace {

constexpr std::size_t kPiece = 64u << 10;

std::string_view local_name(const char* qname) {
    const char* colon = std::strrchr(qname, ':');
    return colon ? std::string_view(colon + 1) : std::string_view(qname);
}

const char* attribute(const char** atts, std::string_view local, bool prefixed = false) {
    for (int i = 0; atts[i]; i += 2) {
        const bool has_prefix = std::strchr(atts[i], ':') != nullptr;
        if (local_name(atts[i]) == local && has_prefix == prefixed) return atts[i + 1];
    }
    return nullptr;
}

std::string column_letters(std::size_t index) {
    std::string s;
    for (std::size_t n = index + 1; n > 0; n = (n - 1) / 26) s.insert(s.begin(), static_cast<char>('A' + (n - 1) % 26));
    return s;
}

std::string cell_name(std::size_t col, std::uint64_t row) { return column_letters(col) + std::to_string(row); }

/// "AB12" → column 27 (0-based) and row 12; false when it is not a cell reference.
bool parse_ref(std::string_view ref, std::size_t& col, std::uint64_t& row) {
    std::size_t i = 0, c = 0;
    while (i < ref.size() && ref[i] >= 'A' && ref[i] <= 'Z' && i < 3) c = c * 26 + static_cast<std::size_t>(ref[i++] - 'A' + 1);
    if (i == 0 || c > 16384) return false;
    std::uint64_t r = 0;
    const auto res = std::from_chars(ref.data() + i, ref.data() + ref.size(), r);
    if (res.ec != std::errc() || res.ptr != ref.data() + ref.size() || r == 0 || r > 1048576) return false;
    col = c - 1;
    row = r;
    return true;
}

/// A zip archive opened on bytes in memory, with bounded streaming reads of its parts.
class Archive {
public:
    Archive(std::string_view bytes, std::string name, const SpreadsheetLimits& limits)
        : name_(std::move(name)), limits_(limits) {
        zip_error_t err;
        zip_error_init(&err);
        zip_source_t* src = zip_source_buffer_create(bytes.data(), bytes.size(), 0, &err);
        if (src) {
            zip_ = zip_open_from_source(src, ZIP_RDONLY, &err);
            if (!zip_) zip_source_free(src);
        }
        if (!zip_) open_error_ = zip_error_code_zip(&err);
        zip_error_fini(&err);
    }
    ~Archive() {
        if (zip_) zip_discard(zip_);
    }
    Archive(const Archive&) = delete;
    Archive& operator=(const Archive&) = delete;

    bool ok() const { return zip_ != nullptr; }
    int open_error() const { return open_error_; }
    bool has(const std::string& part) const { return zip_ && zip_name_locate(zip_, part.c_str(), 0) >= 0; }

    /// Streams the part through `sink` in pieces; an Error for a missing part, a zip bomb, a
    /// damaged archive, or what the sink returns.
    Status stream(const std::string& part, const std::function<Status(const char*, std::size_t, bool)>& sink,
                  const Work& work) {
        const zip_int64_t index = zip_name_locate(zip_, part.c_str(), 0);
        if (index < 0) return make_error("the workbook has no part '" + part + "' (a damaged or incomplete file?)", name_);
        zip_stat_t st;
        zip_stat_init(&st);
        if (zip_stat_index(zip_, static_cast<zip_uint64_t>(index), 0, &st) != 0)
            return make_error("cannot read the entry of part '" + part + "' in the zip archive", name_);
        const std::uint64_t declared = (st.valid & ZIP_STAT_SIZE) ? st.size : 0;
        const std::uint64_t packed = (st.valid & ZIP_STAT_COMP_SIZE) ? st.comp_size : 0;
        if (declared > limits_.max_part_bytes)
            return make_error("part '" + part + "' declares " + std::to_string(declared) +
                                  " bytes once inflated, beyond the limit of " + std::to_string(limits_.max_part_bytes) +
                                  " (refused: a zip bomb or a workbook too large for this reader)",
                              name_);
        if (declared > (1u << 20) && static_cast<double>(declared) > limits_.max_ratio * static_cast<double>(std::max<std::uint64_t>(packed, 1)))
            return make_error("part '" + part + "' inflates from " + std::to_string(packed) + " to " +
                                  std::to_string(declared) + " bytes, a ratio above " +
                                  std::to_string(static_cast<int>(limits_.max_ratio)) + " (refused as a zip bomb)",
                              name_);
        zip_file_t* f = zip_fopen_index(zip_, static_cast<zip_uint64_t>(index), 0);
        if (!f) return make_error("cannot open part '" + part + "' (" + zip_strerror(zip_) + ")", name_);
        std::unique_ptr<zip_file_t, int (*)(zip_file_t*)> guard(f, zip_fclose);
        std::vector<char> buf(kPiece);
        std::uint64_t total = 0;
        for (;;) {
            if (work.cancelled()) return make_error("cancelled", name_);
            const zip_int64_t n = zip_fread(f, buf.data(), buf.size());
            if (n < 0)
                return make_error("part '" + part + "' is damaged (" + std::string(zip_file_strerror(f)) +
                                      "; a truncated file?)",
                                  name_);
            total += static_cast<std::uint64_t>(n);
            // The entry's header may lie about its size: count what actually comes out.
            if (total > limits_.max_part_bytes || (declared && total > declared))
                return make_error("part '" + part + "' inflates past its declared or allowed size (refused as a zip bomb)",
                                  name_);
            auto st2 = sink(buf.data(), static_cast<std::size_t>(n), n == 0);
            if (!st2) return st2;
            if (n == 0) return Ok{};
        }
    }

    const std::string& name() const { return name_; }

private:
    std::string name_;
    SpreadsheetLimits limits_;
    zip_t* zip_ = nullptr;
    int open_error_ = 0;
};

/// An expat parser whose callbacks are std::functions; names are local (prefix dropped).
class Xml {
public:
    std::function<void(std::string_view, const char**)> on_start;
    std::function<void(std::string_view)> on_end;
    std::function<void(const char*, int)> on_text;
    std::optional<Error> stop_error;

    Xml() : p_(XML_ParserCreate(nullptr)) {
        XML_SetUserData(p_, this);
        XML_SetElementHandler(
            p_,
            [](void* u, const char* n, const char** a) {
                auto* x = static_cast<Xml*>(u);
                if (x->on_start) x->on_start(local_name(n), a);
            },
            [](void* u, const char* n) {
                auto* x = static_cast<Xml*>(u);
                if (x->on_end) x->on_end(local_name(n));
            });
        XML_SetCharacterDataHandler(p_, [](void* u, const char* s, int len) {
            auto* x = static_cast<Xml*>(u);
            if (x->on_text) x->on_text(s, len);
        });
    }
    ~Xml() { XML_ParserFree(p_); }
    Xml(const Xml&) = delete;
    Xml& operator=(const Xml&) = delete;

    /// Stops parsing with `e` (from inside a callback).
    void fail(Error e) {
        if (!stop_error) stop_error = std::move(e);
        XML_StopParser(p_, XML_FALSE);
    }

    Status feed(const char* data, std::size_t n, bool final, const std::string& file, const std::string& part) {
        if (XML_Parse(p_, data, static_cast<int>(n), final ? 1 : 0) == XML_STATUS_ERROR) {
            if (stop_error) return *stop_error;
            return make_error("part '" + part + "' is not well-formed XML at line " +
                                  std::to_string(XML_GetCurrentLineNumber(p_)) + ", column " +
                                  std::to_string(XML_GetCurrentColumnNumber(p_)) + ": " +
                                  XML_ErrorString(XML_GetErrorCode(p_)),
                              file);
        }
        if (stop_error) return *stop_error;
        return Ok{};
    }

private:
    XML_Parser p_;
};

Status parse_part(Archive& zip, const std::string& part, Xml& xml, const Work& work) {
    return zip.stream(
        part, [&](const char* d, std::size_t n, bool final) { return xml.feed(d, n, final, zip.name(), part); }, work);
}

struct Workbook {
    std::vector<std::pair<std::string, std::string>> sheets;  ///< name, part path
    bool date1904 = false;
    std::string shared_strings_part;
    std::string styles_part;
};

std::string resolve_target(std::string target) {
    if (!target.empty() && target.front() == '/') return target.substr(1);
    return "xl/" + target;
}

Result<Workbook> read_workbook(Archive& zip, const Work& work) {
    Workbook wb;
    std::vector<std::pair<std::string, std::string>> sheet_ids;  // name, relationship id
    {
        Xml xml;
        xml.on_start = [&](std::string_view n, const char** a) {
            if (n == "sheet") {
                const char* name = attribute(a, "name");
                const char* id = attribute(a, "id", true);
                sheet_ids.emplace_back(name ? name : "", id ? id : "");
            } else if (n == "workbookPr") {
                const char* d = attribute(a, "date1904");
                wb.date1904 = d && (std::strcmp(d, "1") == 0 || std::strcmp(d, "true") == 0);
            }
        };
        if (auto st = parse_part(zip, "xl/workbook.xml", xml, work); !st) return st.error();
    }
    std::map<std::string, std::string> targets;
    if (zip.has("xl/_rels/workbook.xml.rels")) {
        Xml xml;
        xml.on_start = [&](std::string_view n, const char** a) {
            if (n != "Relationship") return;
            const char* id = attribute(a, "Id");
            const char* target = attribute(a, "Target");
            const char* type = attribute(a, "Type");
            if (!id || !target) return;
            targets[id] = resolve_target(target);
            const std::string_view t = type ? type : "";
            if (t.ends_with("/sharedStrings")) wb.shared_strings_part = resolve_target(target);
            if (t.ends_with("/styles")) wb.styles_part = resolve_target(target);
        };
        if (auto st = parse_part(zip, "xl/_rels/workbook.xml.rels", xml, work); !st) return st.error();
    }
    for (std::size_t i = 0; i < sheet_ids.size(); ++i) {
        auto it = targets.find(sheet_ids[i].second);
        std::string part = it != targets.end() ? it->second : "xl/worksheets/sheet" + std::to_string(i + 1) + ".xml";
        wb.sheets.emplace_back(sheet_ids[i].first, std::move(part));
    }
    if (wb.shared_strings_part.empty() && zip.has("xl/sharedStrings.xml")) wb.shared_strings_part = "xl/sharedStrings.xml";
    if (wb.styles_part.empty() && zip.has("xl/styles.xml")) wb.styles_part = "xl/styles.xml";
    if (wb.sheets.empty()) return make_error("the workbook lists no sheets (expected at least one)", zip.name());
    return wb;
}

Result<std::vector<std::string>> read_shared_strings(Archive& zip, const std::string& part, const Work& work) {
    std::vector<std::string> strings;
    if (part.empty()) return strings;
    Xml xml;
    bool in_si = false, in_t = false, in_phonetic = false;
    std::string current;
    xml.on_start = [&](std::string_view n, const char**) {
        if (n == "si") {
            in_si = true;
            current.clear();
        } else if (n == "rPh") {
            in_phonetic = true;
        } else if (n == "t" && in_si && !in_phonetic) {
            in_t = true;
        }
    };
    xml.on_end = [&](std::string_view n) {
        if (n == "si") {
            strings.push_back(std::move(current));
            current.clear();
            in_si = false;
        } else if (n == "rPh") {
            in_phonetic = false;
        } else if (n == "t") {
            in_t = false;
        }
    };
    xml.on_text = [&](const char* s, int len) {
        if (in_t) current.append(s, static_cast<std::size_t>(len));
    };
    if (auto st = parse_part(zip, part, xml, work); !st) return st.error();
    return strings;
}

enum class CellFormat : std::uint8_t { Plain, Date, DateTime, Time };

// Whether a number format code shows a date, a time or both (text in quotes, [colour] and
// escaped characters do not count).
CellFormat classify_format(std::string_view code) {
    bool date = false, time = false;
    bool quoted = false;
    for (std::size_t i = 0; i < code.size(); ++i) {
        const char c = code[i];
        if (c == '"') quoted = !quoted;
        if (quoted) continue;
        if (c == '\\' || c == '_' || c == '*') {
            ++i;
            continue;
        }
        if (c == '[') {
            const auto close = code.find(']', i);
            if (close == std::string_view::npos) break;
            const auto inner = code.substr(i + 1, close - i - 1);
            if (inner == "h" || inner == "hh" || inner == "m" || inner == "mm" || inner == "s" || inner == "ss") time = true;
            i = close;
            continue;
        }
        const char l = static_cast<char>(c | 0x20);
        if (l == 'y' || l == 'd') date = true;
        if (l == 'h' || l == 's') time = true;
    }
    if (date && time) return CellFormat::DateTime;
    if (date) return CellFormat::Date;
    if (time) return CellFormat::Time;
    return CellFormat::Plain;
}

CellFormat builtin_format(long id) {
    if (id >= 14 && id <= 17) return CellFormat::Date;
    if (id == 22) return CellFormat::DateTime;
    if ((id >= 18 && id <= 21) || (id >= 45 && id <= 47)) return CellFormat::Time;
    return CellFormat::Plain;
}

Result<std::vector<CellFormat>> read_styles(Archive& zip, const std::string& part, const Work& work) {
    std::vector<CellFormat> xfs;
    if (part.empty()) return xfs;
    std::map<long, CellFormat> custom;
    std::vector<long> ids;
    bool in_cell_xfs = false;
    Xml xml;
    xml.on_start = [&](std::string_view n, const char** a) {
        if (n == "numFmt") {
            const char* id = attribute(a, "numFmtId");
            const char* code = attribute(a, "formatCode");
            if (id && code) custom[std::strtol(id, nullptr, 10)] = classify_format(code);
        } else if (n == "cellXfs") {
            in_cell_xfs = true;
        } else if (n == "xf" && in_cell_xfs) {
            const char* id = attribute(a, "numFmtId");
            ids.push_back(id ? std::strtol(id, nullptr, 10) : 0);
        }
    };
    xml.on_end = [&](std::string_view n) {
        if (n == "cellXfs") in_cell_xfs = false;
    };
    if (auto st = parse_part(zip, part, xml, work); !st) return st.error();
    for (long id : ids) {
        auto it = custom.find(id);
        xfs.push_back(it != custom.end() ? it->second : builtin_format(id));
    }
    return xfs;
}

std::string time_text(double fraction) {
    auto secs = static_cast<long long>(std::llround(fraction * 86400.0));
    secs = ((secs % 86400) + 86400) % 86400;
    char buf[16];
    std::snprintf(buf, sizeof buf, "%02lld:%02lld:%02lld", secs / 3600, secs / 60 % 60, secs % 60);
    return buf;
}

/// The cells of the current row, then handed to the builders.
struct Cell {
    std::size_t col = 0;
    enum Kind : std::uint8_t { Empty, Number, Text, Level, Error } kind = Empty;
    double number = 0;
    std::string text;
};

class SheetReader {
public:
    SheetReader(const std::string& file, const std::vector<std::string>& strings, const std::vector<CellFormat>& xfs,
                bool date1904, const CsvOptions& opts, const SpreadsheetLimits& limits, Xml& xml)
        : file_(file), strings_(strings), xfs_(xfs), date1904_(date1904), opts_(opts), limits_(limits), xml_(xml) {}

    void start(std::string_view n, const char** a) {
        if (n == "row") {
            row_cells_.clear();
            next_col_ = 0;
            const char* r = attribute(a, "r");
            row_number_ = r ? std::strtoull(r, nullptr, 10) : row_number_ + 1;
        } else if (n == "c") {
            cell_ = Cell{};
            const char* r = attribute(a, "r");
            std::size_t col = next_col_;
            std::uint64_t row = row_number_;
            if (r && !parse_ref(r, col, row)) return fail("cell reference '" + std::string(r) + "' is not valid");
            if (row != row_number_) row_number_ = row;
            cell_.col = col;
            next_col_ = col + 1;
            const char* t = attribute(a, "t");
            type_ = t ? t : "n";
            const char* s = attribute(a, "s");
            format_ = CellFormat::Plain;
            if (s) {
                const auto xf = std::strtoul(s, nullptr, 10);
                if (xf < xfs_.size()) format_ = xfs_[xf];
            }
            has_formula_ = has_value_ = false;
            value_.clear();
        } else if (n == "v" || (n == "t" && in_is_)) {
            in_value_ = true;
            has_value_ = true;
        } else if (n == "is") {
            in_is_ = true;
        } else if (n == "rPh") {
            in_phonetic_ = true;
        } else if (n == "f") {
            has_formula_ = true;
        } else if (n == "mergeCell") {
            const char* ref = attribute(a, "ref");
            xml_.fail(make_error("merged cells " + std::string(ref ? ref : "") +
                                     " (expected one value per cell: unmerge them and fill each cell, then save again)",
                                 file_));
        }
    }

    void end(std::string_view n) {
        if (n == "v" || n == "t") {
            in_value_ = false;
        } else if (n == "is") {
            in_is_ = false;
        } else if (n == "rPh") {
            in_phonetic_ = false;
        } else if (n == "c") {
            finish_cell();
        } else if (n == "row") {
            finish_row();
        }
    }

    void text(const char* s, int len) {
        if (in_value_ && !in_phonetic_) value_.append(s, static_cast<std::size_t>(len));
    }

    Result<Table> finish(std::vector<std::string>* warnings) {
        if (builders_.empty()) return make_error("the sheet is empty (expected a header row and at least one data row)", file_);
        if (errors_ > 0 && warnings)
            warnings->push_back(std::to_string(errors_) + " error cells (#N/A, #DIV/0! …) read as missing");
        if (warnings)
            for (auto& n : notes_) warnings->push_back(std::move(n));
        return finish_table(builders_, file_, opts_.count_column, opts_.type_overrides, static_cast<std::size_t>(header_row_) + 1);
    }

    /// Data rows get their sheet row number in messages: ColumnBuilder rows map through this.
    std::uint64_t rows() const { return data_rows_; }

private:
    void fail(std::string message) {
        xml_.fail(make_error(std::move(message), file_, static_cast<std::size_t>(row_number_), cell_.col + 1));
    }

    void finish_cell() {
        if (has_value_ && value_.empty() && type_ != "inlineStr" && type_ != "str") has_value_ = false;  // <v/>
        if (type_ == "s") {
            if (!has_value_) return;
            std::size_t index = 0;
            const auto r = std::from_chars(value_.data(), value_.data() + value_.size(), index);
            if (r.ec != std::errc() || index >= strings_.size())
                return fail("cell " + cell_name(cell_.col, row_number_) + " points at shared string " + value_ +
                            ", which the workbook does not hold");
            cell_.kind = Cell::Text;
            cell_.text = strings_[index];
        } else if (type_ == "inlineStr" || type_ == "str") {
            if (!has_value_ && has_formula_)
                return fail("cell " + cell_name(cell_.col, row_number_) +
                            " holds a formula with no saved result (open and save the workbook in a spreadsheet "
                            "program so the results are stored)");
            if (!has_value_) return;
            cell_.kind = Cell::Text;
            cell_.text = std::move(value_);
        } else if (type_ == "b") {
            if (!has_value_ && has_formula_)
                return fail("cell " + cell_name(cell_.col, row_number_) +
                            " holds a formula with no saved result (open and save the workbook in a spreadsheet "
                            "program so the results are stored)");
            if (!has_value_) return;
            cell_.kind = Cell::Level;
            cell_.text = value_ == "1" ? "TRUE" : "FALSE";
        } else if (type_ == "e") {
            if (!has_value_ && has_formula_)
                return fail("cell " + cell_name(cell_.col, row_number_) +
                            " holds a formula with no saved result (open and save the workbook in a spreadsheet "
                            "program so the results are stored)");
            cell_.kind = Cell::Error;
        } else if (type_ == "d") {
            if (!has_value_) return;
            cell_.kind = Cell::Level;
            cell_.text = value_.size() > 10 && value_.substr(10) == "T00:00:00" ? value_.substr(0, 10) : value_;
        } else {  // "n"
            if (!has_value_) {
                if (has_formula_)
                    return fail("cell " + cell_name(cell_.col, row_number_) +
                                " holds a formula with no saved result (open and save the workbook in a spreadsheet "
                                "program so the results are stored)");
                return;
            }
            double v = 0;
            const char* b = value_.data();
            const char* e = b + value_.size();
            while (b < e && *b == ' ') ++b;
            const auto r = std::from_chars(b, e, v);
            if (r.ec != std::errc() || r.ptr != e || !std::isfinite(v))
                return fail("cell " + cell_name(cell_.col, row_number_) + " holds '" + value_.substr(0, 40) +
                            "' where a number was expected");
            if (format_ == CellFormat::Plain) {
                cell_.kind = Cell::Number;
                cell_.number = v;
            } else {
                cell_.kind = Cell::Level;
                if (format_ == CellFormat::Time && v < 1) cell_.text = time_text(v);
                else cell_.text = spreadsheet_date_text(v, date1904_, format_ != CellFormat::Date);
            }
        }
        row_cells_.push_back(std::move(cell_));
    }

    void finish_row() {
        const bool any = std::any_of(row_cells_.begin(), row_cells_.end(), [](const Cell& c) { return c.kind != Cell::Empty; });
        if (!any) return;  // a row with no value, like a blank line
        if (!header_done_) return take_header();
        for (const auto& c : row_cells_)
            if (c.col >= builders_.size() && c.kind != Cell::Empty) {
                cell_.col = c.col;
                return fail("cell " + cell_name(c.col, row_number_) + " holds a value but column " +
                            column_letters(c.col) + " has no name in the header row (expected a name in " +
                            cell_name(c.col, header_row_) + ")");
            }
        if ((data_rows_ + 1) * builders_.size() > limits_.max_cells)
            return fail("the sheet holds more than " + std::to_string(limits_.max_cells) +
                        " cells, beyond this reader's limit (split the sheet or save it as CSV)");
        std::size_t next = 0;
        for (auto& c : row_cells_) {
            if (c.col >= builders_.size()) continue;
            if (c.col < next) return fail("cell " + cell_name(c.col, row_number_) + " appears twice in its row");
            for (; next < c.col; ++next) builders_[next].add_missing();
            auto& b = builders_[c.col];
            switch (c.kind) {
                case Cell::Empty: b.add_missing(); break;
                case Cell::Number: b.add_number(c.number); break;
                case Cell::Text: b.add_text(c.text); break;
                case Cell::Level: b.add_level(c.text); break;
                case Cell::Error:
                    ++errors_;
                    b.add_missing();
                    break;
            }
            next = c.col + 1;
        }
        for (; next < builders_.size(); ++next) builders_[next].add_missing();
        ++data_rows_;
    }

    void take_header() {
        header_done_ = true;
        header_row_ = row_number_;
        std::size_t ncols = 0;
        bool any_text = false;
        for (const auto& c : row_cells_) {
            if (c.kind == Cell::Empty) continue;
            ncols = std::max(ncols, c.col + 1);
            any_text = any_text || c.kind == Cell::Text;
        }
        if (!any_text)
            return fail("row " + std::to_string(row_number_) +
                        " holds numbers only (expected a header row of column names as the sheet's first row)");
        std::vector<std::string> names(ncols);
        for (const auto& c : row_cells_) {
            if (c.col >= ncols) continue;
            if (c.kind == Cell::Text || c.kind == Cell::Level) names[c.col] = c.text;
            else if (c.kind == Cell::Number) names[c.col] = number_to_text(c.number);
        }
        names = unique_column_names(std::move(names), notes_);
        for (auto& n : names) builders_.emplace_back(std::move(n), &opts_.missing_markers);
    }

    const std::string& file_;
    const std::vector<std::string>& strings_;
    const std::vector<CellFormat>& xfs_;
    bool date1904_;
    const CsvOptions& opts_;
    const SpreadsheetLimits& limits_;
    Xml& xml_;

    std::vector<ColumnBuilder> builders_;
    std::vector<std::string> notes_;
    bool header_done_ = false;
    std::uint64_t header_row_ = 0;
    std::uint64_t data_rows_ = 0;
    std::size_t errors_ = 0;

    std::vector<Cell> row_cells_;
    Cell cell_;
    std::uint64_t row_number_ = 0;
    std::size_t next_col_ = 0;
    std::string type_;
    CellFormat format_ = CellFormat::Plain;
    std::string value_;
    bool in_value_ = false, in_is_ = false, in_phonetic_ = false;
    bool has_formula_ = false, has_value_ = false;
};

}  // namespace

std::string spreadsheet_date_text(double serial, bool date1904, bool with_time) {
    // Seconds, rounded, so 0.99999999 of a day is the next midnight rather than 23:59:60.
    const auto total = static_cast<long long>(std::llround(serial * 86400.0));
    long long days = total / 86400;
    long long secs = total % 86400;
    if (secs < 0) {
        secs += 86400;
        --days;
    }
    // Days from 1970-01-01: the 1900 system's serial 25569 is 1970-01-01 (serials up to 60 are
    // one day early because of the phantom 1900-02-29); the 1904 system's serial 0 is 1904-01-01.
    long long unix_days = date1904 ? days - 24107 : days - 25569;
    if (!date1904 && days < 61) unix_days += 1;
    // Civil date from days since 1970-01-01.
    long long z = unix_days + 719468;
    const long long era = (z >= 0 ? z : z - 146096) / 146097;
    const auto doe = static_cast<unsigned>(z - era * 146097);
    const unsigned yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
    const long long y = static_cast<long long>(yoe) + era * 400;
    const unsigned doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    const unsigned mp = (5 * doy + 2) / 153;
    const unsigned d = doy - (153 * mp + 2) / 5 + 1;
    const unsigned m = mp < 10 ? mp + 3 : mp - 9;
    char buf[40];
    if (with_time)
        std::snprintf(buf, sizeof buf, "%04lld-%02u-%02uT%02lld:%02lld:%02lld", y + (m <= 2), m, d, secs / 3600,
                      secs / 60 % 60, secs % 60);
    else
        std::snprintf(buf, sizeof buf, "%04lld-%02u-%02u", y + (m <= 2), m, d);
    return buf;
}

Result<Table> read_xlsx_bytes(std::string_view bytes, const std::string& name, const std::string& sheet,
                              const CsvOptions& opts, std::vector<std::string>* warnings, const Work& work,
                              const SpreadsheetLimits& limits) {
    if (bytes.empty()) return make_error("empty file (expected an .xlsx workbook)", name);
    if (bytes.size() < 4 || bytes.substr(0, 2) != "PK")
        return make_error("not an .xlsx workbook (an .xlsx file is a zip archive and starts with 'PK'; "
                          "this one does not — is it CSV text or an older .xls file renamed?)",
                          name);
    Archive zip(bytes, name, limits);
    if (!zip.ok()) {
        zip_error_t e;
        zip_error_init_with_code(&e, zip.open_error());
        std::string why = zip_error_strerror(&e);
        zip_error_fini(&e);
        return make_error("not a readable .xlsx workbook (the zip archive cannot be opened: " + why +
                              "; a truncated or damaged file?)",
                          name);
    }
    if (!zip.has("xl/workbook.xml"))
        return make_error("a zip archive but not an .xlsx workbook (it has no xl/workbook.xml)", name);
    auto wb = read_workbook(zip, work);
    if (!wb) return wb.error();
    std::string part;
    if (sheet.empty()) {
        part = wb->sheets.front().second;
    } else {
        std::string list;
        for (const auto& [n, p] : wb->sheets) {
            if (n == sheet) part = p;
            list += (list.empty() ? "'" : ", '") + n + "'";
        }
        if (part.empty())
            return make_error("the workbook has no sheet named '" + sheet + "' (its sheets: " + list + ")", name);
    }
    auto strings = read_shared_strings(zip, wb->shared_strings_part, work);
    if (!strings) return strings.error();
    auto xfs = read_styles(zip, wb->styles_part, work);
    if (!xfs) return xfs.error();
    Xml xml;
    SheetReader reader(name, *strings, *xfs, wb->date1904, opts, limits, xml);
    xml.on_start = [&](std::string_view n, const char** a) { reader.start(n, a); };
    xml.on_end = [&](std::string_view n) { reader.end(n); };
    xml.on_text = [&](const char* s, int len) { reader.text(s, len); };
    if (auto st = parse_part(zip, part, xml, work); !st) return st.error();
    work.report(1, 1, "done");
    return reader.finish(warnings);
}

Result<Table> read_xlsx(const std::string& path, const std::string& sheet, const CsvOptions& opts,
                        std::vector<std::string>* warnings, const Work& work, const SpreadsheetLimits& limits) {
    auto file = MappedFile::open(path);
    if (!file) return file.error();
    auto table = read_xlsx_bytes(file->bytes(), path, sheet, opts, warnings, work, limits);
    if (file->changed_since_open())
        return make_error("the file changed while being read (truncated, rewritten or appended to); "
                          "read it again once it is no longer being written",
                          path);
    return table;
}

}  // namespace foldline
