#pragma once
// Tables typed in by hand: K strata × two groups × (positives, total), as a reviewer copies
// them from a published report. The result is the same weighted Table a pre-counted CSV gives,
// so every statistic treats both alike.
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline {

struct TypedStratum {
    std::string level;
    double pos_focal, n_focal, pos_reference, n_reference;
};

/// Builds a weighted table with columns <stratum_name>, <group_name> (levels focal_label,
/// reference_label), <outcome_name> (levels positive_label, negative_label); four rows per
/// stratum in the given order, weights = counts (rows with a zero count are kept, so every
/// level exists).
/// Errors: no strata, an empty or repeated stratum label, equal group labels, equal or empty
/// outcome labels, repeated column names, a count that is negative, fractional or not finite,
/// positives above the total.
Result<Table> table_from_counts(const std::vector<TypedStratum>& strata,
                                const std::string& stratum_name = "stratum",
                                const std::string& group_name = "group",
                                const std::string& outcome_name = "outcome",
                                const std::string& focal_label = "focal",
                                const std::string& reference_label = "reference",
                                const std::string& positive_label = "1",
                                const std::string& negative_label = "0");

}  // namespace foldline
