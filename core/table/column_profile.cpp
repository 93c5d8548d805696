#include "core/table/column_profile.h"

namespace foldline {
namespace {

std::string whole(double x) { return std::to_string(static_cast<long long>(x)); }

}  // namespace

std::optional<std::string> exclusion_reason(const ColumnProfile& p, std::size_t max_levels,
                                            double max_missing_share) {
    if (p.rows > 0 && p.missing > max_missing_share * p.rows)
        return "mostly missing (" + whole(p.missing) + " of " + whole(p.rows) + " rows)";
    if (!p.categorical) return std::nullopt;
    const double levels = static_cast<double>(max_levels);
    if (p.distinct < 2) return "constant";
    if (p.row_level && p.distinct == p.rows - p.missing && p.rows > levels) return "one value per row";
    if (p.distinct > levels) return "too many levels (" + whole(p.distinct) + " > " + std::to_string(max_levels) + ")";
    return std::nullopt;
}

}  // namespace foldline
