#pragma once
// Decimal number recognition for type inference: an optional sign, digits with an optional
// decimal point, an optional exponent; surrounding spaces are allowed. "inf", "nan", hex and
// thousands separators are not numbers (the column then reads as categorical).
#include <cstdint>
#include <string_view>

namespace foldline {

enum class NumberParse { Ok, NotANumber, OutOfRange };

/// The general parser behind parse_number (spaces, '+', exponents, long mantissas).
NumberParse parse_number_general(std::string_view text, double& out);

/// Parses `text` into `out`. Empty text → NotANumber. A magnitude beyond the double range
/// (e.g. 1e400) → OutOfRange; a value too small for a double reads as 0 or a subnormal.
/// Inline fast path: at most 15 significant digits, an optional '-' and decimal point, no
/// exponent. Mantissa and power of ten are then exact doubles, so one division rounds
/// correctly; everything else goes to parse_number_general.
inline NumberParse parse_number(std::string_view text, double& out) {
    const char* q = text.data();
    const char* e = q + text.size();
    const bool neg = q < e && *q == '-';
    q += neg;
    std::uint64_t m = 0;
    int digits = 0, frac = -1;
    for (; q < e && digits <= 15; ++q) {
        const char c = *q;
        if (static_cast<unsigned char>(c - '0') < 10) {
            m = m * 10 + static_cast<std::uint64_t>(c - '0');
            ++digits;
            frac += frac >= 0;
        } else if (c == '.' && frac < 0) {
            frac = 0;
        } else {
            break;
        }
    }
    if (q == e && digits > 0 && digits <= 15) {
        static constexpr double kPow10[] = {1e0, 1e1, 1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                                            1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15};
        double v = static_cast<double>(m);
        if (frac > 0) v /= kPow10[frac];
        out = neg ? -v : v;
        return NumberParse::Ok;
    }
    return parse_number_general(text, out);
}

}  // namespace foldline
