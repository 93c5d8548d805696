#include "core/scan/joint_strata.h"

#include <unordered_map>

#include "core/table/binning.h"

namespace foldline {

Result<Column> joint_stratifier(const Table& table, const std::vector<std::string>& names, int bins,
                                std::size_t max_levels) {
    std::vector<Column> cut;  // categorical versions of numeric members
    std::vector<const Column*> cols;
    cut.reserve(names.size());
    for (const auto& n : names) {
        const Column* c = table.column(n);
        if (!c) return make_error("column '" + n + "' is not in the data", table.source);
        if (c->is_numeric()) {
            auto levels = integer_levels(*c, max_levels);
            if (!levels) levels = quantile_bins(*c, bins, table.weights);
            if (!levels) return make_error("numeric column '" + n + "' cannot be cut into strata", table.source);
            cut.push_back(std::move(*levels));
            c = &cut.back();
        }
        cols.push_back(c);
    }
    const std::size_t rows = table.rows;
    std::vector<std::uint32_t> codes(rows);
    std::vector<std::string> labels;
    std::unordered_map<std::uint64_t, std::uint32_t> seen;
    std::vector<std::uint32_t> joint(cols.size());
    std::vector<std::uint32_t> pending_missing;
    for (std::size_t i = 0; i < rows; ++i) {
        bool missing = false;
        std::uint64_t key = 0;
        for (std::size_t k = 0; k < cols.size(); ++k) {
            const std::uint32_t c = cols[k]->code(i);
            if (c == cols[k]->missing_code()) {
                missing = true;
                break;
            }
            const std::uint64_t radix = cols[k]->levels.size();
            if (key > (UINT64_MAX - c) / (radix ? radix : 1))
                return make_error("too many joint levels to stratify over", table.source);
            key = key * radix + c;
        }
        if (missing) {
            codes[i] = UINT32_MAX;  // fixed up once the level count is known
            continue;
        }
        auto [it, fresh] = seen.try_emplace(key, static_cast<std::uint32_t>(labels.size()));
        if (fresh) {
            std::string label;
            for (std::size_t k = 0; k < cols.size(); ++k) {
                if (k) label += " | ";
                label += cols[k]->levels[cols[k]->code(i)];
            }
            labels.push_back(cols.empty() ? std::string("(all)") : std::move(label));
        }
        codes[i] = it->second;
    }
    const auto miss = static_cast<std::uint32_t>(labels.size());
    for (auto& c : codes)
        if (c == UINT32_MAX) c = miss;
    std::string name;
    for (std::size_t k = 0; k < names.size(); ++k) name += (k ? " × " : "") + names[k];
    return Column::categorical(name.empty() ? "(all)" : name, std::move(labels), codes);
}

}  // namespace foldline
