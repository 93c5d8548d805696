#pragma once
// Guessing the field delimiter of a CSV/TSV text from its first records.
#include <string_view>

namespace foldline {

/// Delimiter among , ; \t | that splits the first records of `text` (quotes respected) into
/// the same number of fields, more than one, preferring the most fields; failing that, the one
/// most frequent in the first record; ',' when none occurs (empty text too).
char detect_delimiter(std::string_view text);

}  // namespace foldline
