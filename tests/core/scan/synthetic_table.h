#pragma once
// Small helpers that build row-level and pre-counted tables in code for the scan tests.
#include <map>
#include <random>
#include <string>
#include <tuple>
#include <vector>

#include "core/table/table.h"

namespace foldline::testing {

/// "L" + 3 -> "L3" (spelled out to keep GCC 12's -Wrestrict false positive away).
inline std::string numbered(const char* prefix, long k) {
    std::string s(prefix);
    s += std::to_string(k);
    return s;
}

/// Builds a categorical column from labels ("" = missing), levels in order of first appearance.
inline Column cat_column(const std::string& name, const std::vector<std::string>& values) {
    std::vector<std::string> levels;
    std::map<std::string, std::uint32_t> index;
    std::vector<std::uint32_t> codes;
    codes.reserve(values.size());
    for (const auto& v : values) {
        if (v.empty()) {
            codes.push_back(UINT32_MAX);
            continue;
        }
        auto [it, fresh] = index.emplace(v, static_cast<std::uint32_t>(levels.size()));
        if (fresh) levels.push_back(v);
        codes.push_back(it->second);
    }
    for (auto& c : codes)
        if (c == UINT32_MAX) c = static_cast<std::uint32_t>(levels.size());
    return Column::categorical(name, levels, codes);
}

/// Row-wise builder: add_row({"B", "1", "north"}) in the order of `names`.
struct TableBuilder {
    std::vector<std::string> names;
    std::vector<std::vector<std::string>> cols;
    std::vector<double> weights;
    explicit TableBuilder(std::vector<std::string> n) : names(std::move(n)), cols(names.size()) {}
    void add_row(const std::vector<std::string>& v, double weight = -1) {
        for (std::size_t i = 0; i < names.size(); ++i) cols[i].push_back(v[i]);
        if (weight >= 0) weights.push_back(weight);
    }
    Table build() const {
        Table t;
        for (std::size_t i = 0; i < names.size(); ++i) t.columns.push_back(cat_column(names[i], cols[i]));
        t.rows = cols.empty() ? 0 : cols[0].size();
        t.weights = weights;
        t.source = "synthetic";
        return t;
    }
};

/// Aggregates a row-level table of categorical columns into one row per distinct combination,
/// with the count as weight: what a pre-counted file of the same data holds.
inline Table precount(const Table& rows) {
    std::map<std::vector<std::string>, double> counts;
    for (std::size_t i = 0; i < rows.rows; ++i) {
        std::vector<std::string> key;
        for (const auto& c : rows.columns) {
            const auto code = c.code(i);
            key.push_back(code == c.missing_code() ? "" : c.levels[code]);
        }
        counts[key] += rows.weight(i);
    }
    std::vector<std::string> names;
    for (const auto& c : rows.columns) names.push_back(c.name);
    TableBuilder b(names);
    for (const auto& [key, n] : counts) b.add_row(key, n);
    Table t = b.build();
    t.weight_column = "count";
    return t;
}

/// The planted-reversal scenario (invented lender): group B applies mostly for low-approval
/// products yet is `lift` ahead within each of three products. `noise` extra independent
/// categorical columns with 2..5 levels.
inline Table planted_reversal(std::mt19937_64& rng, int n, double lift, int noise) {
    std::vector<std::string> names{"group", "approved", "product"};
    for (int k = 0; k < noise; ++k) names.push_back(numbered("noise", k));
    TableBuilder b(names);
    const double mix_a[3] = {0.6, 0.3, 0.1}, mix_b[3] = {0.1, 0.3, 0.6}, rate_a[3] = {0.7, 0.5, 0.3};
    std::uniform_real_distribution<double> u(0, 1);
    for (int i = 0; i < n; ++i) {
        const bool is_b = u(rng) < 0.5;
        const double* mix = is_b ? mix_b : mix_a;
        const double x = u(rng);
        const int prod = x < mix[0] ? 0 : x < mix[0] + mix[1] ? 1 : 2;
        const double rate = rate_a[prod] + (is_b ? lift : 0.0);
        std::vector<std::string> row{is_b ? "B" : "A", u(rng) < rate ? "1" : "0", numbered("P", prod)};
        for (int k = 0; k < noise; ++k)
            row.push_back(numbered("L", static_cast<int>(u(rng) * (2 + k % 4))));
        b.add_row(row);
    }
    return b.build();
}

}  // namespace foldline::testing
