// libFuzzer target: the .xlsx reader on arbitrary bytes (a zip archive of XML parts). The first
// byte chooses the options (sheet, count column, missing markers, tight limits); the rest is the
// workbook. Must never crash, hang or trip a sanitizer, and stays within the limits it is given;
// an accepted table must be internally consistent.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/io/xlsx_reader.h"

using namespace foldline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size < 1) return 0;
    CsvOptions o;
    if (data[0] & 1) o.count_column = "n";
    if (data[0] & 2) o.missing_markers = {};
    const char* sheet = (data[0] & 4) ? "visits" : "";
    SpreadsheetLimits limits;
    limits.max_part_bytes = 8u << 20;  // keeps each run small; the reader must refuse past it
    limits.max_cells = (data[0] & 8) ? 64 : 1u << 20;
    const std::string_view bytes(reinterpret_cast<const char*>(data + 1), size - 1);
    auto r = read_xlsx_bytes(bytes, "fuzz.xlsx", sheet, o, nullptr, {}, limits);
    if (!r.ok()) {
        if (r.error().message.empty()) std::abort();  // every refusal says why
        return 0;
    }
    const Table& t = *r;
    if (t.rows == 0 || t.columns.empty()) std::abort();  // no rows is an Error
    if (t.rows * (t.columns.size() + (t.weighted() ? 1 : 0)) > limits.max_cells) std::abort();
    if (t.weighted() && t.weights.size() != t.rows) std::abort();
    for (double w : t.weights)
        if (!(w >= 0) || !std::isfinite(w)) std::abort();
    for (const auto& c : t.columns) {
        if (c.size() != t.rows) std::abort();
        std::size_t missing = 0;
        for (std::size_t i = 0; i < t.rows; ++i) {
            if (c.is_categorical() && c.code(i) > c.missing_code()) std::abort();
            missing += c.is_missing(i);
        }
        if (missing != c.missing_count) std::abort();
    }
    return 0;
}
