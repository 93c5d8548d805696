#include "core/table/combined_column.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <unordered_map>

namespace foldline {
namespace {

std::vector<std::string> split(const std::string& s) {
    std::vector<std::string> out;
    std::size_t from = 0;
    while (true) {
        const auto at = s.find(kCombineSeparator, from);
        out.push_back(s.substr(from, at == std::string::npos ? std::string::npos : at - from));
        if (at == std::string::npos) return out;
        from = at + 1;
    }
}

std::string number_text(double v) {
    char buf[64];
    auto [p, ec] = std::to_chars(buf, buf + sizeof buf, v);
    (void)ec;
    return std::string(buf, p);
}

}  // namespace

std::vector<std::string> combined_parts(const Table& table, const std::string& name) {
    std::vector<std::string> columns;
    for (const auto& c : table.columns) columns.push_back(c.name);
    return combined_parts(columns, name);
}

std::vector<std::string> combined_parts(const std::vector<std::string>& columns, const std::string& name) {
    auto is_column = [&](const std::string& n) { return std::find(columns.begin(), columns.end(), n) != columns.end(); };
    if (is_column(name) || name.find(kCombineSeparator) == std::string::npos) return {};
    auto parts = split(name);
    if (parts.size() < 2) return {};
    for (std::size_t i = 0; i < parts.size(); ++i) {
        if (parts[i].empty() || !is_column(parts[i])) return {};
        if (std::find(parts.begin(), parts.begin() + static_cast<std::ptrdiff_t>(i), parts[i]) !=
            parts.begin() + static_cast<std::ptrdiff_t>(i))
            return {};
    }
    return parts;
}

Result<Column> combine_columns(const Table& table, const std::vector<std::string>& parts, const std::string& name) {
    if (parts.size() < 2) return make_error("combined groups need two or more columns joined by '+'", table.source);
    std::vector<const Column*> cols;
    for (const auto& p : parts) {
        const Column* c = table.column(p);
        if (!c) return make_error("column '" + p + "' of the combined groups '" + name + "' not found", table.source);
        cols.push_back(c);
    }
    // Each row's key: the parts' codes (a numeric part: its value's bits), so combinations are
    // found without building text per row.
    constexpr std::size_t kMaxLevels = 65535;
    std::unordered_map<std::string, std::uint32_t> index;
    std::vector<std::string> levels;
    std::vector<std::uint32_t> codes(table.rows);
    std::vector<std::uint32_t> missing_rows;
    std::string key;
    for (std::size_t r = 0; r < table.rows; ++r) {
        key.clear();
        bool missing = false;
        for (const Column* c : cols) {
            if (c->is_missing(r)) {
                missing = true;
                break;
            }
            if (c->is_categorical()) {
                const std::uint32_t code = c->code(r);
                key.append(reinterpret_cast<const char*>(&code), sizeof code);
            } else {
                const double v = c->values[r] == 0.0 ? 0.0 : c->values[r];  // one key for -0 and +0
                key.append(reinterpret_cast<const char*>(&v), sizeof v);
            }
        }
        if (missing) {
            missing_rows.push_back(static_cast<std::uint32_t>(r));
            continue;
        }
        auto [it, added] = index.try_emplace(key, static_cast<std::uint32_t>(levels.size()));
        if (added) {
            if (levels.size() >= kMaxLevels)
                return make_error("the combined groups '" + name + "' have more than 65,535 combinations", table.source);
            std::string label;
            for (std::size_t k = 0; k < cols.size(); ++k) {
                if (k) label += kCombineSeparator;
                label += cols[k]->is_categorical() ? cols[k]->levels[cols[k]->code(r)] : number_text(cols[k]->values[r]);
            }
            levels.push_back(std::move(label));
        }
        codes[r] = it->second;
    }
    const auto missing_code = static_cast<std::uint32_t>(levels.size());
    for (auto r : missing_rows) codes[r] = missing_code;
    return Column::categorical(name, std::move(levels), codes);
}

}  // namespace foldline
