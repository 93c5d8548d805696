#pragma once
// The mean-gap part of the printed scan summary (core/report/scan_summary.h).
#include <cstddef>
#include <ostream>

#include "core/scan/scan_result.h"

namespace foldline {

/// The caution beside pay-review figures (summary, memo, workbench).
inline constexpr const char* kPayReviewCaution =
    "A pay-review finding is a statistical screen, not a legal determination under equal-pay law: "
    "defer to counsel.";

/// Class counts, the pooled means of the first finding, and a table of at most `top` flagged
/// mean-gap findings (crude Welch difference, fixed-effects difference, standardised
/// difference, q); with none flagged, a line that says so. Nothing for a result without a mean
/// question.
void mean_summary(std::ostream& os, const ScanResult& r, std::size_t top);

}  // namespace foldline
