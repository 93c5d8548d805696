#include "core/io/utf8.h"

#include <cstdint>
#include <cstring>

namespace foldline::utf8 {

namespace {

bool cont(unsigned char c) { return (c & 0xC0u) == 0x80u; }

// Length (2..4) of the valid multi-byte sequence at p, or 0.
std::size_t sequence_length(const unsigned char* p, const unsigned char* limit) {
    const unsigned char c = p[0];
    const std::ptrdiff_t room = limit - p;
    if (c >= 0xC2 && c <= 0xDF) return room >= 2 && cont(p[1]) ? 2 : 0;
    if (c >= 0xE0 && c <= 0xEF) {
        if (room < 3 || !cont(p[1]) || !cont(p[2])) return 0;
        if (c == 0xE0 && p[1] < 0xA0) return 0;  // overlong
        if (c == 0xED && p[1] > 0x9F) return 0;  // UTF-16 surrogates
        return 3;
    }
    if (c >= 0xF0 && c <= 0xF4) {
        if (room < 4 || !cont(p[1]) || !cont(p[2]) || !cont(p[3])) return 0;
        if (c == 0xF0 && p[1] < 0x90) return 0;  // overlong
        if (c == 0xF4 && p[1] > 0x8F) return 0;  // above U+10FFFF
        return 4;
    }
    return 0;
}

}  // namespace

std::size_t find_invalid(std::string_view text) {
    const auto* u = reinterpret_cast<const unsigned char*>(text.data());
    const auto* end = u + text.size();
    std::size_t i = 0;
    const std::size_t n = text.size();
    while (i < n) {
        if (i + 8 <= n) {
            std::uint64_t w;
            std::memcpy(&w, u + i, 8);
            if ((w & 0x8080808080808080ull) == 0) {
                i += 8;
                continue;
            }
        }
        if (u[i] < 0x80) {
            ++i;
            continue;
        }
        const std::size_t len = sequence_length(u + i, end);
        if (len == 0) return i;
        i += len;
    }
    return npos;
}

}  // namespace foldline::utf8
