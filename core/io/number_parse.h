#pragma once
// Decimal number recognition for type inference: an optional sign, digits with an optional
// decimal point, an optional exponent; surrounding spaces are allowed. "inf", "nan", hex and
// thousands separators are not numbers (the column then reads as categorical).
#include <string_view>

namespace foldline {

enum class NumberParse { Ok, NotANumber, OutOfRange };

/// Parses `text` into `out`. Empty text → NotANumber. A magnitude beyond the double range
/// (e.g. 1e400) → OutOfRange; a value too small for a double reads as 0 or a subnormal.
NumberParse parse_number(std::string_view text, double& out);

}  // namespace foldline
