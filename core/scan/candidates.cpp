#include "core/scan/candidates.h"

#include <algorithm>
#include <cmath>
#include <optional>

#include "core/common/run_tasks.h"
#include "core/table/binning.h"

namespace foldline {

namespace {

std::size_t used_levels(const Column& c) {
    std::vector<char> seen(c.levels.size() + 1, 0);
    visit_codes(c, [&](const auto& v) {
        for (auto x : v) seen[x] = 1;
    });
    return static_cast<std::size_t>(std::count(seen.begin(), seen.end() - 1, 1));
}

}  // namespace

bool same_partition(const Column& a, const Column& b) {
    if (!a.is_categorical() || !b.is_categorical() || a.size() != b.size()) return false;
    const std::uint32_t ma = a.missing_code(), mb = b.missing_code();
    std::vector<std::int64_t> fwd(ma + 1, -1), back(mb + 1, -1);
    bool ok = true;
    visit_codes(a, [&](const auto& va) {
        visit_codes(b, [&](const auto& vb) {
            for (std::size_t i = 0; i < va.size() && ok; ++i) {
                const std::uint32_t x = va[i], y = vb[i];
                if ((x == ma) != (y == mb)) ok = false;
                else if (fwd[x] == -1 && back[y] == -1) {
                    fwd[x] = y;
                    back[y] = x;
                } else if (fwd[x] != static_cast<std::int64_t>(y) || back[y] != static_cast<std::int64_t>(x)) {
                    ok = false;
                }
            }
        });
    });
    return ok;
}

Result<CandidateSet> select_candidates(const Table& t, const std::vector<std::string>& skip,
                                       const CandidateOptions& o, const Column* identity_with) {
    CandidateSet out;
    std::vector<std::size_t> order;
    if (o.columns.empty()) {
        for (std::size_t i = 0; i < t.columns.size(); ++i)
            if (std::find(skip.begin(), skip.end(), t.columns[i].name) == skip.end()) order.push_back(i);
    } else {
        for (const auto& name : o.columns) {
            auto i = t.find(name);
            if (!i) return make_error("stratifier column '" + name + "' not found", t.source);
            if (std::find(skip.begin(), skip.end(), name) != skip.end())
                return make_error("column '" + name + "' is the outcome or the exposure and cannot stratify");
            if (std::find(order.begin(), order.end(), *i) == order.end()) order.push_back(*i);
        }
    }
    std::optional<Column> identity_conv;
    if (identity_with && identity_with->is_numeric()) {
        identity_conv = integer_levels(*identity_with, 1u << 16);
        identity_with = identity_conv ? &*identity_conv : nullptr;
    }
    // What exclusion_reason needs of each column: missing rows in Σ weights (a row of a
    // pre-counted table stands for many), levels in use for a categorical column.
    const double rows = t.total_weight();
    auto profile = [&](const Column& c) {
        ColumnProfile p;
        p.rows = rows;
        p.missing = static_cast<double>(c.missing_count);
        if (t.weighted()) {
            p.missing = 0;
            for (std::size_t i = 0; i < t.rows; ++i)
                if (c.is_missing(i)) p.missing += t.weights[i];
        }
        p.categorical = c.is_categorical();
        p.distinct = p.categorical ? static_cast<double>(used_levels(c)) : 0.0;
        p.row_level = !t.weighted();
        return p;
    };
    std::vector<std::optional<std::string>> reason(order.size());
    run_tasks(order.size(), o.threads,
              [&](std::size_t k) { reason[k] = exclusion_reason(profile(t.columns[order[k]]), o); });
    // Numeric columns become levels or bins first, on o.threads threads: each conversion
    // reads a whole column, and they do not depend on each other.
    struct Derived {
        std::optional<Column> levels, bins;
    };
    std::vector<Derived> derived(order.size());
    std::vector<std::size_t> numeric;
    for (std::size_t k = 0; k < order.size(); ++k)
        if (!t.columns[order[k]].is_categorical() && !reason[k]) numeric.push_back(k);
    run_tasks(numeric.size(), o.threads, [&](std::size_t n) {
        const std::size_t k = numeric[n];
        const Column& c = t.columns[order[k]];
        derived[k].levels = integer_levels(c, o.max_levels);
        if (!derived[k].levels && o.bins >= 2) derived[k].bins = quantile_bins(c, o.bins, t.weights);
    });
    for (std::size_t k = 0; k < order.size(); ++k) {
        const std::size_t idx = order[k];
        const Column& c = t.columns[idx];
        auto exclude = [&](std::string why) { out.excluded.push_back({c.name, std::move(why)}); };
        if (reason[k]) {
            exclude(std::move(*reason[k]));
            continue;
        }
        Candidate cand;
        cand.name = c.name;
        if (c.is_categorical()) {
            cand.origin = "categorical";
            cand.column = &c;
        } else {
            if (auto& lv = derived[k].levels) {
                if (lv->levels.size() < 2) {
                    exclude("constant");
                    continue;
                }
                cand.origin = "integer levels";
                cand.derived = std::make_shared<const Column>(std::move(*lv));
            } else if (o.bins < 2) {
                exclude("numeric with many values (quantile binning is off)");
                continue;
            } else {
                auto& b = derived[k].bins;
                if (!b || b->levels.size() < 2) {
                    exclude("constant");
                    continue;
                }
                cand.origin = "quantile bins (" + std::to_string(b->levels.size()) + ")";
                cand.derived = std::make_shared<const Column>(std::move(*b));
            }
            cand.column = cand.derived.get();
        }
        if (identity_with && same_partition(*cand.column, *identity_with)) {
            exclude("identical to the exposure");
            continue;
        }
        out.candidates.push_back(std::move(cand));
    }
    return out;
}

}  // namespace foldline
