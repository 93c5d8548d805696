#pragma once
// The readable ranked summary of a scan (rate comparisons and trend checks) that `foldline scan`
// prints, for every kind of question.
#include <cstddef>
#include <string>

#include "core/scan/scan_result.h"

namespace foldline {

/// Plain text: the data's name and rows, the question, the stratifiers and left-out columns,
/// the class counts and a table of at most `top` flagged rate findings (then the same for the
/// slope findings when any), and the screening caution. With no flagged finding the table says
/// so: "(direction flips in N comparisons, none significant)" when stable findings' point
/// estimates change direction under stratification, otherwise "(no comparison changes under
/// stratification)"; likewise for slopes. An empty result gives the headers and the caution.
std::string scan_summary_text(const ScanResult& result, const std::string& path, std::size_t top);

}  // namespace foldline
