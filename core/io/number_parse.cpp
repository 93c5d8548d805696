#include "core/io/number_parse.h"

#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <system_error>

namespace foldline {

namespace {
bool is_digit(char c) { return static_cast<unsigned char>(c - '0') < 10; }
}  // namespace

NumberParse parse_number(std::string_view text, double& out) {
    const char* p = text.data();
    const char* e = p + text.size();
    // Fast path: at most 15 significant digits with an optional decimal point and no exponent.
    // Mantissa and the power of ten are both exact doubles, so one division rounds correctly.
    {
        const char* q = p;
        const bool neg = q < e && *q == '-';
        q += neg;
        std::uint64_t m = 0;
        int digits = 0, frac = -1;
        for (; q < e && digits <= 15; ++q) {
            const char c = *q;
            if (is_digit(c)) {
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
    }
    while (p < e && *p == ' ') ++p;
    while (e > p && e[-1] == ' ') --e;
    if (p == e) return NumberParse::NotANumber;
    const char* s = p;
    if (*s == '+') {
        ++s;
        p = s;  // from_chars does not take '+'
    } else if (*s == '-') {
        ++s;
    }
    if (s == e || !(is_digit(*s) || (*s == '.' && s + 1 < e && is_digit(s[1]))))
        return NumberParse::NotANumber;
    double v = 0;
    const auto r = std::from_chars(p, e, v, std::chars_format::general);
    if (r.ptr != e) return NumberParse::NotANumber;
    if (r.ec == std::errc::result_out_of_range) {
        // Tell overflow from underflow with the C library on a terminated copy.
        const std::string copy(p, e);
        const double w = std::strtod(copy.c_str(), nullptr);
        if (std::isinf(w)) return NumberParse::OutOfRange;
        out = w;
        return NumberParse::Ok;
    }
    if (r.ec != std::errc()) return NumberParse::NotANumber;
    out = v;
    return NumberParse::Ok;
}

}  // namespace foldline
