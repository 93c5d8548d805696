#include "core/table/typed_table.h"

#include <cmath>
#include <cstdint>
#include <set>

namespace foldline {

namespace {

const char* const kSource = "typed-in table";

bool whole_non_negative(double x) { return std::isfinite(x) && x >= 0 && x == std::floor(x); }

}  // namespace

Result<Table> table_from_counts(const std::vector<TypedStratum>& strata, const std::string& stratum_name,
                                const std::string& group_name, const std::string& outcome_name,
                                const std::string& focal_label, const std::string& reference_label,
                                const std::string& positive_label, const std::string& negative_label) {
    auto err = [](std::string message, std::size_t row = 0, std::size_t column = 0) {
        return make_error(std::move(message), kSource, row, column);
    };
    if (strata.empty()) return err("no strata (expected at least one row of counts)");
    if (stratum_name.empty() || group_name.empty() || outcome_name.empty())
        return err("column names must not be empty");
    if (stratum_name == group_name || stratum_name == outcome_name || group_name == outcome_name)
        return err("the stratum, group and outcome columns need three different names");
    if (focal_label.empty() || reference_label.empty() || focal_label == reference_label)
        return err("the focal and reference groups need two different, non-empty labels");
    if (positive_label.empty() || negative_label.empty() || positive_label == negative_label)
        return err("the outcome needs two different, non-empty labels (with and without the event)");

    std::set<std::string> seen;
    for (std::size_t k = 0; k < strata.size(); ++k) {
        const TypedStratum& s = strata[k];
        const std::size_t row = k + 1;
        if (s.level.empty()) return err("stratum " + std::to_string(row) + " has no label", row, 1);
        if (!seen.insert(s.level).second)
            return err("stratum label '" + s.level + "' appears twice (expected each stratum once)", row, 1);
        const double counts[4] = {s.pos_focal, s.n_focal, s.pos_reference, s.n_reference};
        const char* what[4] = {"focal positives", "focal total", "reference positives", "reference total"};
        for (std::size_t j = 0; j < 4; ++j)
            if (!whole_non_negative(counts[j]))
                return err("stratum '" + s.level + "': " + what[j] + " must be a whole number of 0 or more", row, j + 2);
        if (s.pos_focal > s.n_focal)
            return err("stratum '" + s.level + "': focal positives exceed the focal total", row, 2);
        if (s.pos_reference > s.n_reference)
            return err("stratum '" + s.level + "': reference positives exceed the reference total", row, 4);
    }

    const std::size_t rows = strata.size() * 4;
    std::vector<std::string> levels;
    std::vector<std::uint32_t> stratum_codes, group_codes, outcome_codes;
    std::vector<double> weights;
    stratum_codes.reserve(rows);
    group_codes.reserve(rows);
    outcome_codes.reserve(rows);
    weights.reserve(rows);
    for (std::size_t k = 0; k < strata.size(); ++k) {
        const TypedStratum& s = strata[k];
        levels.push_back(s.level);
        const double cells[4] = {s.pos_focal, s.n_focal - s.pos_focal, s.pos_reference, s.n_reference - s.pos_reference};
        for (std::uint32_t j = 0; j < 4; ++j) {
            stratum_codes.push_back(static_cast<std::uint32_t>(k));
            group_codes.push_back(j / 2);    // 0 focal, 1 reference
            outcome_codes.push_back(j % 2);  // 0 = positive_label, 1 = negative_label
            weights.push_back(cells[j]);
        }
    }
    Table t;
    t.source = kSource;
    t.rows = rows;
    t.columns.push_back(Column::categorical(stratum_name, std::move(levels), stratum_codes));
    t.columns.push_back(Column::categorical(group_name, {focal_label, reference_label}, group_codes));
    t.columns.push_back(Column::categorical(outcome_name, {positive_label, negative_label}, outcome_codes));
    t.weights = std::move(weights);
    t.weight_column = "count";
    return t;
}

}  // namespace foldline
