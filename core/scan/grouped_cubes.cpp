#include "core/scan/grouped_cubes.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <unordered_map>
#include <utility>

#include "core/scan/cube.h"

namespace foldline {
namespace {

/// Weighted rows of the table whose column `c` is missing.
double missing_weight(const Table& t, const Column& c) {
    double m = 0;
    for (std::size_t i = 0; i < t.rows; ++i)
        if (c.is_missing(i)) m += t.weight(i);
    return m;
}

bool same_levels(const Column& a, const Column& b) {
    return a.type == b.type && a.levels == b.levels;
}

struct Chosen {
    std::size_t set = 0;             // index in counts.singles
    Candidate candidate;             // points into counts.singles[set]
};

/// Codes of the values `src` in the chosen candidate's level space (`coded`: src holds the
/// codes themselves, binned by the engine).
Result<std::vector<std::uint32_t>> recode(const Column& src, const Table& single, const Candidate& c,
                                          bool coded = false) {
    const Column& own = single.columns[2];
    const std::uint32_t miss = static_cast<std::uint32_t>(c.column->levels.size());
    std::vector<std::uint32_t> out(src.size(), miss);
    if (src.is_categorical() != own.is_categorical()) return make_error("column '" + c.name + "' changed type between grouping sets");
    if (coded && src.is_numeric()) {
        for (std::size_t i = 0; i < src.size(); ++i) {
            const double v = src.values[i];
            if (std::isnan(v)) continue;
            if (!(v >= 0 && v < miss) || v != std::floor(v))
                return make_error("the engine's bin of '" + c.name + "' is not one of its levels");
            out[i] = static_cast<std::uint32_t>(v);
        }
        return out;
    }
    if (src.is_categorical()) {
        // The candidate is the stratifier's own column: match level labels.
        std::unordered_map<std::string, std::uint32_t> at;
        for (std::size_t k = 0; k < c.column->levels.size(); ++k)
            at.emplace(c.column->levels[k], static_cast<std::uint32_t>(k));
        for (std::size_t i = 0; i < src.size(); ++i) {
            if (src.is_missing(i)) continue;
            const auto it = at.find(src.levels[src.code(i)]);
            if (it == at.end()) return make_error("level '" + src.levels[src.code(i)] + "' of '" + c.name + "' is absent from its own grouping set");
            out[i] = it->second;
        }
        return out;
    }
    // A numeric column: every value has the level (integer level or quantile bin) the
    // candidate gave it in the stratifier's own set.
    std::unordered_map<double, std::uint32_t> at;
    for (std::size_t i = 0; i < single.rows; ++i)
        if (!std::isnan(own.values[i])) at.emplace(own.values[i], c.column->code(i));
    for (std::size_t i = 0; i < src.size(); ++i) {
        const double v = src.values[i];
        if (std::isnan(v)) continue;
        const auto it = at.find(v);
        if (it == at.end()) return make_error("a value of '" + c.name + "' is absent from its own grouping set");
        out[i] = it->second;
    }
    return out;
}

}  // namespace

Result<GroupedScanInput> cubes_from_groups(const GroupedCounts& g, const QuestionSpec& spec,
                                           const CandidateOptions& options, bool pairs) {
    if (g.pooled.columns.size() != 2) return make_error("the pooled cells need the outcome and exposure columns");
    auto q = resolve_question(g.pooled, spec);
    if (!q) return q.error();
    GroupedScanInput out;
    out.question = *q;
    out.cubes.rows = g.pooled.total_weight();

    for (const auto& t : g.singles)
        if (t.columns.size() != 3 || !same_levels(t.columns[0], g.pooled.columns[0]) ||
            !same_levels(t.columns[1], g.pooled.columns[1]))
            return make_error("the grouping sets disagree on the outcome or exposure levels");

    std::vector<std::size_t> order;
    if (options.columns.empty()) {
        for (std::size_t k = 0; k < g.singles.size(); ++k) order.push_back(k);
    } else {
        for (const auto& name : options.columns) {
            if (name == spec.outcome || name == spec.exposure)
                return make_error("column '" + name + "' is the outcome or the exposure and cannot stratify");
            const auto it = std::find_if(g.singles.begin(), g.singles.end(),
                                         [&](const Table& t) { return t.columns[2].name == name; });
            if (it == g.singles.end()) return make_error("stratifier column '" + name + "' not found", g.pooled.source);
            const auto k = static_cast<std::size_t>(it - g.singles.begin());
            if (std::find(order.begin(), order.end(), k) == order.end()) order.push_back(k);
        }
    }

    // Each stratifier decided on its own set by exclusion_reason, as select_candidates decides
    // a table's column: rows and missing rows in Σ weights (cells stand for many rows), and
    // "one value per row" only for a source of rows (not pre-counted). select_candidates on
    // the set then forms the levels or bins (and finds a copy of the exposure).
    CandidateOptions one = options;
    one.max_missing_share = 1.0;  // decided below
    std::vector<Chosen> chosen;
    for (std::size_t k : order) {
        const Table& t = g.singles[k];
        const Column& c = t.columns[2];
        ColumnProfile profile;
        profile.rows = t.total_weight();
        profile.missing = missing_weight(t, c);
        profile.categorical = c.is_categorical();
        profile.distinct = static_cast<double>(c.levels.size());  // every level of a set has a cell
        profile.row_level = !g.weighted_source;
        if (auto why = exclusion_reason(profile, options)) {
            out.cubes.excluded.push_back({c.name, std::move(*why)});
            continue;
        }
        one.columns = {c.name};
        auto cs = select_candidates(t, {spec.outcome, spec.exposure}, one, &t.columns[1]);
        if (!cs) return cs.error();
        for (auto& e : cs->excluded) out.cubes.excluded.push_back(std::move(e));
        for (auto& cand : cs->candidates) chosen.push_back({k, std::move(cand)});
    }

    for (const auto& ch : chosen) {
        const Table& t = g.singles[ch.set];
        out.cubes.stratifiers.push_back({ch.candidate.name, ch.candidate.origin, ch.candidate.column->levels});
        out.cubes.singles.push_back(build_cube(*ch.candidate.column, encode_rows(t, *q), t.weights));
        out.candidates.push_back(ch.candidate);
        out.sets.push_back(ch.set);
    }
    if (!pairs) return out;

    // Pair sets by their two column names (either order).
    std::map<std::pair<std::string, std::string>, std::size_t> pair_at;
    for (std::size_t p = 0; p < g.pairs.size(); ++p) {
        const Table& t = g.pairs[p];
        if (t.columns.size() != 4 || !same_levels(t.columns[0], g.pooled.columns[0]) ||
            !same_levels(t.columns[1], g.pooled.columns[1]))
            return make_error("the grouping sets disagree on the outcome or exposure levels");
        pair_at[{t.columns[2].name, t.columns[3].name}] = p;
    }
    for (std::size_t i = 0; i < chosen.size(); ++i)
        for (std::size_t j = i + 1; j < chosen.size(); ++j) {
            const Candidate& a = chosen[i].candidate;
            const Candidate& b = chosen[j].candidate;
            std::size_t ca = 2, cb = 3;
            auto it = pair_at.find({a.name, b.name});
            if (it == pair_at.end()) {
                it = pair_at.find({b.name, a.name});
                std::swap(ca, cb);
            }
            if (it == pair_at.end()) return make_error("no grouping set for the pair '" + a.name + "', '" + b.name + "'");
            const Table& t = g.pairs[it->second];
            auto coded = [&](const std::string& name) {
                return std::find(g.coded_in_pairs.begin(), g.coded_in_pairs.end(), name) != g.coded_in_pairs.end();
            };
            auto codes_a = recode(t.columns[ca], g.singles[chosen[i].set], a, coded(a.name));
            if (!codes_a) return codes_a.error();
            auto codes_b = recode(t.columns[cb], g.singles[chosen[j].set], b, coded(b.name));
            if (!codes_b) return codes_b.error();
            const Column col_a = Column::categorical(a.name, a.column->levels, *codes_a);
            const Column col_b = Column::categorical(b.name, b.column->levels, *codes_b);
            out.cubes.pairs.push_back(build_pair_cube(col_a, col_b, encode_rows(t, *q), t.weights));
        }
    return out;
}

Result<std::vector<std::uint32_t>> stratifier_codes(const GroupedCounts& counts, const GroupedScanInput& input,
                                                    std::size_t i, const Column& raw) {
    if (i >= input.candidates.size() || input.sets[i] >= counts.singles.size())
        return make_error("no such stratifier in the grouped counts");
    return recode(raw, counts.singles[input.sets[i]], input.candidates[i]);
}

std::vector<double> bin_cuts(const GroupedCounts& counts, const GroupedScanInput& input, std::size_t i) {
    if (i >= input.candidates.size() || input.sets[i] >= counts.singles.size()) return {};
    const Table& t = counts.singles[input.sets[i]];
    const Column& values = t.columns[2];
    const Column& levels = *input.candidates[i].column;
    if (!values.is_numeric()) return {};
    std::vector<std::pair<double, std::uint32_t>> by_value;
    for (std::size_t r = 0; r < t.rows; ++r)
        if (!std::isnan(values.values[r])) by_value.emplace_back(values.values[r], levels.code(r));
    std::sort(by_value.begin(), by_value.end());
    std::vector<double> cuts;
    std::uint32_t at = 0;
    for (std::size_t k = 0; k < by_value.size(); ++k) {
        const auto [v, code] = by_value[k];
        if (k == 0) {
            if (code != 0) return {};
            continue;
        }
        if (code == at) continue;
        if (code != at + 1 || v == by_value[k - 1].first) return {};  // levels must follow the values
        cuts.push_back(v);
        at = code;
    }
    if (at + 1 != levels.levels.size()) return {};
    return cuts;
}

}  // namespace foldline
