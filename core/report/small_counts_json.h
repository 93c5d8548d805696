#pragma once
// JSON form of a rate finding's small-count assessment (core/scan/small_counts.h): the
// `small_counts` object of every rate finding in the scan document (docs/json.md).
#include <nlohmann/json.hpp>

#include "core/scan/small_counts.h"

namespace foldline::report {

/// {mantel_fleiss, adjusted_test, adjusted_reason, exact (null unless attempted), fisher
/// [per stratum, empty unless the exact test was attempted], breslow_day_fit, homogeneity_test,
/// homogeneity_reason, zelen (null unless run)}. Infinite figures are null, as everywhere.
nlohmann::json small_counts_to_json(const SmallCounts& sc);

}  // namespace foldline::report
