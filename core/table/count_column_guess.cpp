#include "core/table/count_column_guess.h"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <unordered_set>
#include <vector>

namespace foldline {

namespace {

constexpr std::array<const char*, 21> kCountWords = {
    "n", "count", "counts", "freq", "frequency", "weight", "wt", "number", "num", "total", "tally",
    "cases", "patients", "people", "persons", "subjects", "records", "customers", "applicants", "employees", "cnt"};

bool is_count_word(const std::string& w) {
    return std::any_of(kCountWords.begin(), kCountWords.end(), [&](const char* k) { return w == k; });
}

bool whole_non_negative(double x) { return std::isfinite(x) && x >= 0 && x == std::floor(x); }

/// Row key over every column but `skip`: categorical codes and numeric bit patterns (NaN as one
/// value), so two rows with the same key agree on every other column.
struct RowKeys {
    const Table& t;
    std::size_t skip;
    std::vector<std::uint64_t> key(std::size_t row) const {
        std::vector<std::uint64_t> k;
        k.reserve(t.columns.size());
        for (std::size_t c = 0; c < t.columns.size(); ++c) {
            if (c == skip) continue;
            const Column& col = t.columns[c];
            if (col.is_categorical()) {
                k.push_back(col.code(row));
            } else {
                const double v = col.values[row];
                std::uint64_t bits = 0;
                if (std::isnan(v)) {
                    bits = ~std::uint64_t{0};
                } else {
                    const double z = v == 0 ? 0.0 : v;  // -0 and +0 are one value
                    std::memcpy(&bits, &z, sizeof bits);
                }
                k.push_back(bits);
            }
        }
        return k;
    }
};

struct KeyHash {
    std::size_t operator()(const std::vector<std::uint64_t>& k) const {
        std::uint64_t h = 1469598103934665603ull;  // FNV-1a over the words
        for (std::uint64_t w : k) {
            h ^= w;
            h *= 1099511628211ull;
        }
        return static_cast<std::size_t>(h);
    }
};

/// A cell table's other columns take few values each: one that is (nearly) unique per row, such
/// as an identifier or a measurement, marks row-level data however its rows combine.
bool others_few_valued(const Table& t, std::size_t skip) {
    for (std::size_t c = 0; c < t.columns.size(); ++c)
        if (c != skip && 2 * t.columns[c].distinct_count() > t.rows) return false;
    return true;
}

bool others_unique(const Table& t, std::size_t skip) {
    const RowKeys keys{t, skip};
    std::unordered_set<std::vector<std::uint64_t>, KeyHash> seen;
    seen.reserve(t.rows);
    for (std::size_t i = 0; i < t.rows; ++i)
        if (!seen.insert(keys.key(i)).second) return false;
    return true;
}

}  // namespace

bool looks_like_count_name(const std::string& name) {
    std::string lower;
    for (char ch : name) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
    // Trim, then split on the usual joiners: any one word that is a count word will do.
    std::vector<std::string> words;
    std::string cur;
    for (char ch : lower) {
        if (ch == '_' || ch == '-' || ch == '.' || ch == ' ' || ch == '\t') {
            if (!cur.empty()) words.push_back(cur), cur.clear();
        } else {
            cur += ch;
        }
    }
    if (!cur.empty()) words.push_back(cur);
    return std::any_of(words.begin(), words.end(), is_count_word);
}

std::optional<CountColumnGuess> guess_count_column(const Table& table) {
    if (table.weighted() || table.columns.size() < 2 || table.rows < 2) return std::nullopt;
    for (std::size_t c = 0; c < table.columns.size(); ++c) {
        const Column& col = table.columns[c];
        if (!col.is_numeric() || col.missing_count > 0 || !looks_like_count_name(col.name)) continue;
        if (col.values.size() != table.rows) continue;
        double total = 0;
        bool whole = true;
        for (double v : col.values) {
            if (!whole_non_negative(v)) {
                whole = false;
                break;
            }
            total += v;
        }
        if (!whole || !others_few_valued(table, c) || !others_unique(table, c)) continue;
        return CountColumnGuess{col.name, total};
    }
    return std::nullopt;
}

}  // namespace foldline
