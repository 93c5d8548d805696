#include "core/io/xls_reader.h"

#include <freexl.h>

#include <string_view>

#include "core/io/column_builder.h"

namespace foldline {

namespace {

std::string freexl_reason(int rc) {
    switch (rc) {
        case FREEXL_FILE_NOT_FOUND: return "the file cannot be opened";
        case FREEXL_INVALID_HANDLE: return "invalid handle";
        case FREEXL_INVALID_CFBF_HEADER: return "no compound-file header (not an .xls workbook)";
        case FREEXL_INVALID_CHARACTER: return "text that cannot be converted to UTF-8";
        case FREEXL_ILLEGAL_CELL_ROW_COL: return "a cell outside the sheet";
        case FREEXL_INVALID_MINI_STREAM: return "an invalid mini stream";
        case FREEXL_INSUFFICIENT_MEMORY: return "not enough memory";
        case FREEXL_UNSUPPORTED_CHARSET: return "an unsupported character set";
        case FREEXL_CFBF_READ_ERROR: return "a read error in the compound file (a truncated file?)";
        case FREEXL_CFBF_SEEK_ERROR: return "a seek error in the compound file (a truncated file?)";
        case FREEXL_CFBF_INVALID_SIGNATURE: return "no compound-file signature (not an .xls workbook)";
        case FREEXL_CFBF_INVALID_SECTOR_SIZE: return "an invalid sector size";
        case FREEXL_CFBF_EMPTY_FAT_CHAIN: return "an empty allocation chain";
        case FREEXL_CFBF_ILLEGAL_FAT_ENTRY: return "an illegal allocation entry";
        case FREEXL_BIFF_INVALID_BOF: return "an invalid start-of-file record";
        case FREEXL_BIFF_INVALID_SST: return "an invalid shared-string table";
        case FREEXL_BIFF_ILLEGAL_SST_INDEX: return "an illegal shared-string index";
        case FREEXL_BIFF_WORKBOOK_NOT_FOUND: return "no workbook stream";
        case FREEXL_BIFF_ILLEGAL_SHEET_INDEX: return "an illegal sheet index";
        case FREEXL_BIFF_UNSELECTED_SHEET: return "no sheet selected";
        case FREEXL_CRAFTED_FILE: return "a severely damaged or crafted file";
        default: return "error " + std::to_string(rc);
    }
}

std::string cell_label(unsigned row, unsigned short col) {
    std::string s;
    for (unsigned n = col + 1u; n > 0; n = (n - 1) / 26) s.insert(s.begin(), static_cast<char>('A' + (n - 1) % 26));
    return s + std::to_string(row + 1);
}

}  // namespace

Result<Table> read_xls(const std::string& path, const std::string& sheet, const CsvOptions& opts,
                       std::vector<std::string>* warnings, const Work& work, std::uint64_t max_cells) {
    const void* handle = nullptr;
    const int rc = freexl_open(path.c_str(), &handle);
    struct Closer {
        const void* h;
        ~Closer() {
            if (h) freexl_close(h);
        }
    } closer{handle};
    if (rc != FREEXL_OK)
        return make_error("cannot read this as an .xls workbook (" + freexl_reason(rc) + ")", path);
    unsigned int info = 0;
    if (freexl_get_info(handle, FREEXL_BIFF_PASSWORD, &info) == FREEXL_OK && info == FREEXL_BIFF_OBFUSCATED)
        return make_error("the workbook is password-protected (save an unprotected copy)", path);
    unsigned int sheets = 0;
    if (freexl_get_info(handle, FREEXL_BIFF_SHEET_COUNT, &sheets) != FREEXL_OK || sheets == 0)
        return make_error("the workbook lists no sheets (expected at least one)", path);
    unsigned short index = 0;
    if (!sheet.empty()) {
        std::string list;
        bool found = false;
        for (unsigned short i = 0; i < sheets; ++i) {
            const char* name = nullptr;
            if (freexl_get_worksheet_name(handle, i, &name) != FREEXL_OK || !name) continue;
            list += (list.empty() ? "'" : ", '") + std::string(name) + "'";
            if (!found && sheet == name) {
                index = i;
                found = true;
            }
        }
        if (!found) return make_error("the workbook has no sheet named '" + sheet + "' (its sheets: " + list + ")", path);
    }
    if (freexl_select_active_worksheet(handle, index) != FREEXL_OK)
        return make_error("cannot select the sheet", path);
    unsigned int rows = 0;
    unsigned short cols = 0;
    if (freexl_worksheet_dimensions(handle, &rows, &cols) != FREEXL_OK)
        return make_error("cannot read the sheet's size", path);
    if (rows == 0 || cols == 0) return make_error("the sheet is empty (expected a header row and at least one data row)", path);
    if (static_cast<std::uint64_t>(rows) * cols > max_cells)
        return make_error("the sheet declares " + std::to_string(rows) + " rows × " + std::to_string(cols) +
                              " columns, beyond this reader's limit of " + std::to_string(max_cells) + " cells",
                          path);

    struct Value {
        enum Kind { Empty, Number, Text, Level } kind = Empty;
        double number = 0;
        std::string text;
    };
    auto cell = [&](unsigned r, unsigned short c, Value& v) -> Status {
        FreeXL_CellValue x;
        const int crc = freexl_get_cell_value(handle, r, c, &x);
        if (crc != FREEXL_OK)
            return make_error("cell " + cell_label(r, c) + " cannot be read (" + freexl_reason(crc) + ")", path, r + 1, c + 1u);
        v = Value{};
        switch (x.type) {
            case FREEXL_CELL_INT: v.kind = Value::Number; v.number = x.value.int_value; break;
            case FREEXL_CELL_DOUBLE: v.kind = Value::Number; v.number = x.value.double_value; break;
            case FREEXL_CELL_TEXT:
            case FREEXL_CELL_SST_TEXT:
                v.kind = Value::Text;
                v.text = x.value.text_value ? x.value.text_value : "";
                if (v.text.empty()) v.kind = Value::Empty;
                break;
            case FREEXL_CELL_DATE:
            case FREEXL_CELL_TIME:
                v.kind = Value::Level;
                v.text = x.value.text_value ? x.value.text_value : "";
                break;
            case FREEXL_CELL_DATETIME: {
                v.kind = Value::Level;
                v.text = x.value.text_value ? x.value.text_value : "";
                if (v.text.size() > 10 && v.text[10] == ' ') v.text[10] = 'T';
                break;
            }
            default: break;
        }
        return Ok{};
    };

    // Header: the first row with a value.
    unsigned r = 0;
    std::vector<Value> row(cols);
    auto read_row = [&](unsigned at) -> Result<bool> {
        bool any = false;
        for (unsigned short c = 0; c < cols; ++c) {
            if (auto st = cell(at, c, row[c]); !st) return st.error();
            any = any || row[c].kind != Value::Empty;
        }
        return any;
    };
    std::vector<std::string> names;
    for (; r < rows; ++r) {
        auto any = read_row(r);
        if (!any) return any.error();
        if (!*any) continue;
        std::size_t ncols = 0;
        bool any_text = false;
        for (unsigned short c = 0; c < cols; ++c)
            if (row[c].kind != Value::Empty) {
                ncols = c + 1u;
                any_text = any_text || row[c].kind == Value::Text;
            }
        if (!any_text)
            return make_error("row " + std::to_string(r + 1) +
                                  " holds numbers only (expected a header row of column names as the sheet's first row)",
                              path, r + 1);
        for (std::size_t c = 0; c < ncols; ++c)
            names.push_back(row[c].kind == Value::Number ? number_to_text(row[c].number) : row[c].text);
        break;
    }
    if (names.empty()) return make_error("the sheet is empty (expected a header row and at least one data row)", path);
    const unsigned header_row = r;
    std::vector<std::string> notes;
    names = unique_column_names(std::move(names), notes);
    std::vector<ColumnBuilder> builders;
    for (auto& n : names) builders.emplace_back(std::move(n), &opts.missing_markers);
    for (++r; r < rows; ++r) {
        if (work.cancelled()) return make_error("cancelled", path);
        auto any = read_row(r);
        if (!any) return any.error();
        if (!*any) continue;
        for (unsigned short c = static_cast<unsigned short>(builders.size()); c < cols; ++c)
            if (row[c].kind != Value::Empty)
                return make_error("cell " + cell_label(r, c) + " holds a value but its column has no name in the header row (expected a name in " +
                                      cell_label(header_row, c) + ")",
                                  path, r + 1, c + 1u);
        for (std::size_t c = 0; c < builders.size(); ++c) {
            auto& v = row[c];
            switch (v.kind) {
                case Value::Empty: builders[c].add_missing(); break;
                case Value::Number: builders[c].add_number(v.number); break;
                case Value::Text: builders[c].add_text(v.text); break;
                case Value::Level: builders[c].add_level(v.text); break;
            }
        }
        work.report(r, rows, "reading");
    }
    if (warnings)
        for (auto& n : notes) warnings->push_back(std::move(n));
    return finish_table(builders, path, opts.count_column, opts.type_overrides, header_row + 2);
}

}  // namespace foldline
