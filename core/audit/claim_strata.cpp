#include "core/audit/claim_strata.h"

#include <unordered_map>

#include "core/table/binning.h"

namespace foldline::audit {

namespace {

constexpr std::uint64_t kMissingKey = UINT64_MAX;
// Joint keys up to this many values are numbered through a flat array (one pass, no hashing);
// above it through a hash map.
constexpr std::uint64_t kDenseKeys = std::uint64_t{1} << 22;

// key[i] = key[i] × radix + code(i), or the missing key; false when the product overflows.
bool fold_in(std::vector<std::uint64_t>& key, const Column& c, std::uint64_t& span) {
    const std::uint64_t radix = c.levels.empty() ? 1 : c.levels.size();
    if (span > (UINT64_MAX - 1) / radix) return false;
    span *= radix;
    const auto miss = c.missing_code();
    visit_codes(c, [&](const auto& codes) {
        for (std::size_t i = 0; i < key.size(); ++i) {
            const std::uint32_t v = codes[i];
            if (key[i] == kMissingKey || v == miss) key[i] = kMissingKey;
            else key[i] = key[i] * radix + v;
        }
    });
    return true;
}

}  // namespace

ClaimStrata::ClaimStrata(const Table& table, int bins, std::size_t max_levels, std::size_t joint_budget_bytes)
    : table_(&table), bins_(bins), max_levels_(max_levels), budget_(joint_budget_bytes) {}

std::size_t ClaimStrata::cuts_made() const {
    std::lock_guard lock(mutex_);
    return cuts_made_;
}

std::size_t ClaimStrata::joints_made() const {
    std::lock_guard lock(mutex_);
    return joints_made_;
}

Result<std::shared_ptr<const Column>> ClaimStrata::categorical(const std::string& name) {
    std::lock_guard lock(mutex_);
    if (auto it = cut_.find(name); it != cut_.end()) return it->second;
    const Column* c = table_->column(name);
    if (!c) return make_error("column '" + name + "' is not in the data", table_->source);
    std::shared_ptr<const Column> out;
    if (c->is_numeric()) {
        auto levels = integer_levels(*c, max_levels_);
        if (!levels) levels = quantile_bins(*c, bins_, table_->weights);
        if (!levels) return make_error("numeric column '" + name + "' cannot be cut into strata", table_->source);
        out = std::make_shared<const Column>(std::move(*levels));
        ++cuts_made_;
    } else {
        out = std::shared_ptr<const Column>(std::shared_ptr<const Column>{}, c);  // the table's own, not owned
    }
    cut_.emplace(name, out);
    return out;
}

Result<std::shared_ptr<const JointStrata>> ClaimStrata::joint(const std::vector<std::string>& names) {
    {
        std::lock_guard lock(mutex_);
        if (auto it = joint_.find(names); it != joint_.end()) return it->second;
    }
    auto out = std::make_shared<JointStrata>();
    if (names.empty()) return std::shared_ptr<const JointStrata>(out);
    std::vector<std::shared_ptr<const Column>> cols;
    for (const auto& n : names) {
        auto c = categorical(n);
        if (!c) return c.error();
        cols.push_back(std::move(*c));
    }
    const std::size_t rows = table_->rows;
    std::vector<std::uint64_t> key(rows, 0);
    std::uint64_t span = 1;
    for (const auto& c : cols)
        if (!fold_in(key, *c, span)) return make_error("too many joint levels to stratify over", table_->source);
    out->codes.resize(rows);
    std::uint32_t next = 0;
    auto number = [&](auto& seen, auto lookup) {
        for (std::size_t i = 0; i < rows; ++i) {
            if (key[i] == kMissingKey) {
                out->codes[i] = UINT32_MAX;  // fixed up once the level count is known
                continue;
            }
            std::uint32_t& slot = lookup(seen, key[i]);
            if (slot == UINT32_MAX) slot = next++;
            out->codes[i] = slot;
        }
    };
    if (span <= kDenseKeys) {
        std::vector<std::uint32_t> seen(static_cast<std::size_t>(span), UINT32_MAX);
        number(seen, [](auto& s, std::uint64_t k) -> std::uint32_t& { return s[static_cast<std::size_t>(k)]; });
    } else {
        std::unordered_map<std::uint64_t, std::uint32_t> seen;
        number(seen, [](auto& s, std::uint64_t k) -> std::uint32_t& { return s.try_emplace(k, UINT32_MAX).first->second; });
    }
    out->levels = next;
    for (auto& c : out->codes)
        if (c == UINT32_MAX) c = next;
    std::lock_guard lock(mutex_);
    ++joints_made_;
    const std::size_t bytes = out->codes.size() * sizeof(std::uint32_t);
    if (joint_bytes_ + bytes <= budget_) {
        joint_bytes_ += bytes;
        joint_.emplace(names, out);
    }
    return std::shared_ptr<const JointStrata>(out);
}

}  // namespace foldline::audit
