// libFuzzer target: the rows filter (core/table/row_filter.h) on arbitrary text. Every refusal
// must point at a character of the text; an accepted filter must write itself back in a normal
// form that reads again to the same normal form and the same SQL, and applying it to a small
// fixed table (text, number and missing cells, a count column) must give a consistent table:
// the kept rows are exactly the mask's ones, with their weights.
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "core/io/csv_reader.h"
#include "core/table/row_filter.h"

using namespace foldline;

namespace {

const Table& sample() {
    static const Table t = [] {
        CsvOptions o;
        o.count_column = "n";
        auto r = read_csv_text(
            "region,year,income,\"two words\",approved,n\n"
            "north,2023,10.5,a,yes,3\n"
            "south,2024,,b,no,1\n"
            ",2024,30,,yes,2\n"
            "east,2022,40,a,no,5\n"
            "north,2024,-1e3,b,yes,1\n"
            "it's,2024,60,a,no,4\n",
            "fuzz.csv", o);
        if (!r.ok()) std::abort();
        return std::move(*r);
    }();
    return t;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    auto f = filter::parse(text);
    if (!f.ok()) {
        if (f.error().kind != ErrorKind::Usage) std::abort();
        if (f.error().message.rfind("rows filter, character ", 0) != 0) std::abort();  // points at a character
        return 0;
    }
    const std::string canon = filter::canonical_text(*f);
    const std::string sql = filter::to_sql(*f);
    if (f->empty() != canon.empty() || f->empty() != sql.empty()) std::abort();
    auto again = filter::parse(canon);
    if (!again.ok()) std::abort();  // the normal form must read back
    if (filter::canonical_text(*again) != canon || filter::to_sql(*again) != sql) std::abort();
    for (const auto& c : filter::columns(*f))
        if (c.empty()) std::abort();

    const Table& t = sample();
    auto mask = filter::keep_mask(*f, t);
    const Status st = filter::check(*f, t);
    if (mask.ok() != st.ok()) std::abort();
    if (!mask.ok()) {
        if (mask.error().message.rfind("rows filter, character ", 0) != 0) std::abort();
        return 0;
    }
    if (mask->size() != t.rows) std::abort();
    auto kept = filter::apply(*f, t);
    if (!kept.ok()) std::abort();
    std::size_t ones = 0;
    double weight = 0;
    for (std::size_t r = 0; r < t.rows; ++r) {
        if ((*mask)[r] > 1) std::abort();
        ones += (*mask)[r];
        if ((*mask)[r]) weight += t.weights[r];
    }
    if (kept->rows != ones || kept->weights.size() != ones || kept->total_weight() != weight) std::abort();
    if (kept->filter != canon || kept->columns.size() != t.columns.size()) std::abort();
    for (const auto& c : kept->columns) {
        if (c.size() != kept->rows) std::abort();
        std::size_t missing = 0;
        for (std::size_t i = 0; i < kept->rows; ++i) {
            if (c.is_categorical() && c.code(i) > c.missing_code()) std::abort();
            missing += c.is_missing(i);
        }
        if (missing != c.missing_count) std::abort();
    }
    return 0;
}
