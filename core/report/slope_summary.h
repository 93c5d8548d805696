#pragma once
// The readable ranked summary of a slope scan that `foldline scan` prints.
#include "core/scan/slope_scan.h"

#include <string>

namespace foldline {

/// Plain text: the question, the pooled slope, one line per finding in rank order (stable
/// findings counted, not listed, beyond `max_stable`), and the hidden-group hint when present.
/// An empty result gives the header and "no checks".
std::string slope_summary_text(const SlopeScanResult& result, std::size_t max_stable = 5);

}  // namespace foldline
