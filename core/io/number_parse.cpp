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

NumberParse parse_number_general(std::string_view text, double& out) {
    const char* p = text.data();
    const char* e = p + text.size();
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
