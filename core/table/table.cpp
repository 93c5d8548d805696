#include "core/table/table.h"

#include <algorithm>
#include <numeric>
#include <unordered_set>

namespace foldline {

std::size_t Column::size() const {
    if (type == ColumnType::Numeric) return values.size();
    return visit_codes(*this, [](const auto& v) { return v.size(); });
}

std::uint32_t Column::code(std::size_t i) const {
    return visit_codes(*this, [i](const auto& v) { return static_cast<std::uint32_t>(v[i]); });
}

bool Column::is_missing(std::size_t i) const {
    if (type == ColumnType::Numeric) return std::isnan(values[i]);
    return code(i) == missing_code();
}

std::size_t Column::distinct_count() const {
    if (type == ColumnType::Categorical) {
        // Levels can exist without rows only if a caller built them that way; count used codes.
        std::vector<char> seen(levels.size() + 1, 0);
        visit_codes(*this, [&](const auto& v) {
            for (auto c : v) seen[c] = 1;
        });
        return static_cast<std::size_t>(std::count(seen.begin(), seen.end() - 1, 1));
    }
    std::unordered_set<double> seen;
    for (double x : values)
        if (!std::isnan(x)) seen.insert(x == 0.0 ? 0.0 : x);  // -0 and +0 are one value
    return seen.size();
}

bool Column::is_binary() const { return distinct_count() == 2; }

Column Column::categorical(std::string name, std::vector<std::string> levels,
                           const std::vector<std::uint32_t>& codes32) {
    Column c;
    c.name = std::move(name);
    c.type = ColumnType::Categorical;
    c.levels = std::move(levels);
    const std::uint32_t miss = static_cast<std::uint32_t>(c.levels.size());
    c.missing_count = static_cast<std::size_t>(std::count(codes32.begin(), codes32.end(), miss));
    auto narrow = [&](auto tag) {
        using T = decltype(tag);
        std::vector<T> v(codes32.size());
        std::transform(codes32.begin(), codes32.end(), v.begin(),
                       [](std::uint32_t x) { return static_cast<T>(x); });
        c.codes = std::move(v);
    };
    if (miss < 0xFFu) narrow(std::uint8_t{});
    else if (miss < 0xFFFFu) narrow(std::uint16_t{});
    else c.codes = codes32;
    return c;
}

Column Column::numeric(std::string name, std::vector<double> values) {
    Column c;
    c.name = std::move(name);
    c.type = ColumnType::Numeric;
    c.values = std::move(values);
    c.missing_count = static_cast<std::size_t>(
        std::count_if(c.values.begin(), c.values.end(), [](double x) { return std::isnan(x); }));
    c.codes = std::vector<std::uint8_t>{};
    return c;
}

double Table::total_weight() const {
    if (weights.empty()) return static_cast<double>(rows);
    return std::accumulate(weights.begin(), weights.end(), 0.0);
}

std::optional<std::size_t> Table::find(const std::string& name) const {
    for (std::size_t i = 0; i < columns.size(); ++i)
        if (columns[i].name == name) return i;
    return std::nullopt;
}

const Column* Table::column(const std::string& name) const {
    auto i = find(name);
    return i ? &columns[*i] : nullptr;
}

}  // namespace foldline
