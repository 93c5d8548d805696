// libFuzzer target: the CSV reader on arbitrary text with a fuzzed delimiter, count column,
// caps and chunk size. The first 4 bytes choose the options; the rest is the file. Must never
// crash, hang or trip a sanitizer; an accepted table must be internally consistent.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/io/csv_reader.h"

using namespace foldline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size < 4) return 0;
    static const char delims[] = {0, ',', ';', '\t', '|', ' ', 'x'};
    CsvOptions o;
    o.delimiter = delims[data[0] % sizeof delims];
    if (data[1] & 1) o.count_column = "n";
    if (data[1] & 2) o.skip_ragged = true;
    if (data[1] & 4) o.missing_markers = {};
    o.max_field_bytes = 1 + data[2] * 16u;
    o.max_fields_per_row = 1 + (data[3] & 63u);
    o.chunk_bytes = (data[1] & 8) ? 64 : 0;
    o.threads = (data[1] & 16) ? 2 : 1;
    const std::string_view text(reinterpret_cast<const char*>(data + 4), size - 4);
    CsvReport report;
    auto r = read_csv_text(text, "fuzz.csv", o, &report);
    if (!r.ok()) {
        if (r.error().message.empty()) std::abort();  // every refusal says why
        return 0;
    }
    const Table& t = *r;
    if (t.rows == 0 || t.columns.empty()) std::abort();  // csv_reader.h: no rows is an Error
    if (t.weighted() && t.weights.size() != t.rows) std::abort();
    for (double w : t.weights)
        if (!(w >= 0) || !std::isfinite(w)) std::abort();  // counts: whole numbers >= 0
    for (const auto& c : t.columns) {
        if (c.size() != t.rows) std::abort();
        if (c.is_numeric())
            for (double v : c.values)
                if (std::isinf(v)) std::abort();  // no infinity enters a numeric column
        if (c.is_categorical())
            for (std::size_t i = 0; i < t.rows; ++i)
                if (!c.is_missing(i) && c.code(i) >= c.levels.size()) std::abort();
    }
    return 0;
}
