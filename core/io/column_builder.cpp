#include "core/io/column_builder.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <limits>
#include <unordered_set>

#include "core/io/number_parse.h"

namespace foldline {

ColumnBuilder::ColumnBuilder(std::string name, const std::vector<std::string>* missing_markers)
    : name_(std::move(name)), markers_(missing_markers) {}

void ColumnBuilder::add_number(double v) {
    values_.push_back(v);
    text_.push_back(std::isnan(v) ? kMissing : kNumber);
}

void ColumnBuilder::add_missing() {
    values_.push_back(std::numeric_limits<double>::quiet_NaN());
    text_.push_back(kMissing);
}

void ColumnBuilder::add_text(std::string_view text) {
    if (markers_ && std::find(markers_->begin(), markers_->end(), text) != markers_->end()) return add_missing();
    double v = 0;
    if (parse_number(text, v) == NumberParse::Ok) {
        // Kept as text too, so a categorical column shows the cell as written ("1.50").
        values_.push_back(v);
        text_.push_back(dict_.intern(text, false) | 0x80000000u);
        any_text_ = true;
        return;
    }
    values_.push_back(std::numeric_limits<double>::quiet_NaN());
    text_.push_back(dict_.intern(text, false));
    any_text_ = true;
    any_level_only_ = true;
}

void ColumnBuilder::add_level(std::string_view text) {
    if (markers_ && std::find(markers_->begin(), markers_->end(), text) != markers_->end()) return add_missing();
    values_.push_back(std::numeric_limits<double>::quiet_NaN());
    text_.push_back(dict_.intern(text, false));
    any_text_ = true;
    any_level_only_ = true;
}

std::string number_to_text(double v) {
    char buf[64];
    const auto r = std::to_chars(buf, buf + sizeof buf, v);
    return std::string(buf, r.ptr);
}

Result<Column> ColumnBuilder::finish(std::optional<ColumnType> forced, const std::string& source,
                                     std::size_t row_offset) && {
    const bool categorical = forced ? *forced == ColumnType::Categorical : any_level_only_;
    if (!categorical) {
        if (any_level_only_) {
            for (std::size_t i = 0; i < text_.size(); ++i)
                if (text_[i] != kNumber && text_[i] != kMissing && !(text_[i] & 0x80000000u))
                    return make_error("column '" + name_ + "' is set to numeric but row " +
                                          std::to_string(i + row_offset) + " holds '" +
                                          std::string(dict_.levels()[text_[i]]) + "' (expected a number)",
                                      source, i + row_offset);
        }
        Column col = Column::numeric(name_, std::move(values_));
        return col;
    }
    // Levels in order of first appearance, number cells written out.
    LevelDictionary levels;
    std::vector<std::uint32_t> codes(text_.size());
    for (std::size_t i = 0; i < text_.size(); ++i) {
        const std::uint32_t t = text_[i];
        if (t == kMissing) {
            codes[i] = kMissing;
        } else if (t == kNumber) {
            codes[i] = levels.intern(number_to_text(values_[i]), false);
        } else {
            codes[i] = levels.intern(dict_.levels()[t & 0x7FFFFFFFu], false);
        }
    }
    std::vector<std::string> names(levels.levels().begin(), levels.levels().end());
    const auto missing = static_cast<std::uint32_t>(names.size());
    for (auto& c : codes)
        if (c == kMissing) c = missing;
    std::vector<double>().swap(values_);
    std::vector<std::uint32_t>().swap(text_);
    return Column::categorical(name_, std::move(names), codes);
}

std::vector<std::string> unique_column_names(std::vector<std::string> names, std::vector<std::string>& warnings) {
    std::unordered_set<std::string> taken;
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (names[i].empty()) {
            std::string n = "column_" + std::to_string(i + 1);
            for (int k = 2; std::find(names.begin(), names.end(), n) != names.end(); ++k)
                n = "column_" + std::to_string(i + 1) + "_" + std::to_string(k);
            warnings.push_back("column " + std::to_string(i + 1) + " has no name in the header; named '" + n + "'");
            names[i] = n;
        }
    }
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (taken.insert(names[i]).second) continue;
        std::string n;
        for (int k = 2;; ++k) {
            n = names[i] + "_" + std::to_string(k);
            if (!taken.count(n) && std::find(names.begin() + static_cast<std::ptrdiff_t>(i) + 1, names.end(), n) == names.end())
                break;
        }
        warnings.push_back("duplicate column name '" + names[i] + "' (column " + std::to_string(i + 1) +
                           ") renamed '" + n + "'");
        names[i] = n;
        taken.insert(n);
    }
    return names;
}

Result<Table> finish_table(std::vector<ColumnBuilder>& columns, const std::string& source,
                           const std::string& count_column,
                           const std::map<std::string, ColumnType>& type_overrides, std::size_t row_offset) {
    auto has = [&](const std::string& n) {
        return std::any_of(columns.begin(), columns.end(), [&](const ColumnBuilder& b) { return b.name() == n; });
    };
    std::string list;
    for (const auto& b : columns) list += (list.empty() ? "" : ", ") + b.name();
    for (const auto& [name, type] : type_overrides)
        if (!has(name)) return make_error("a type is set for column '" + name + "', which is not in the file", source);
    if (!count_column.empty()) {
        if (!has(count_column))
            return make_error("count column '" + count_column + "' is not in the file (columns: " + list + ")", source);
        if (columns.size() == 1)
            return make_error("count column '" + count_column +
                                  "' is the only column (expected at least one column to count by)",
                              source);
    }
    Table table;
    table.source = source;
    table.rows = columns.empty() ? 0 : columns.front().size();
    if (table.rows == 0) return make_error("no data rows (expected at least one row below the header)", source);
    for (std::size_t c = 0; c < columns.size(); ++c) {
        const std::string name = columns[c].name();
        const bool is_count = name == count_column;
        std::optional<ColumnType> forced;
        if (auto it = type_overrides.find(name); it != type_overrides.end()) forced = it->second;
        if (is_count) forced = ColumnType::Numeric;
        auto col = std::move(columns[c]).finish(forced, source, row_offset);
        if (!col) return col.error();
        if (!is_count) {
            table.columns.push_back(std::move(*col));
            continue;
        }
        for (std::size_t i = 0; i < col->values.size(); ++i) {
            const double w = col->values[i];
            const char* why = nullptr;
            if (std::isnan(w)) why = "a missing count";
            else if (w < 0) why = "a negative count";
            else if (w != std::floor(w)) why = "a fractional count";
            else if (w > 9007199254740992.0) why = "a count above 2^53";
            if (why)
                return make_error(std::string(why) + " in count column '" + name + "' at row " +
                                      std::to_string(i + row_offset) +
                                      " (expected a whole number of observations, 0 or more)",
                                  source, i + row_offset);
        }
        table.weights = std::move(col->values);
        table.weight_column = name;
    }
    return table;
}

}  // namespace foldline
