#pragma once
// UTF-8 validity checks over raw bytes (RFC 3629: no overlong forms, no surrogates, nothing
// above U+10FFFF).
#include <cstddef>
#include <string_view>

namespace foldline::utf8 {

inline constexpr std::size_t npos = static_cast<std::size_t>(-1);

/// Offset of the first byte of `text` that is not valid UTF-8 (including a sequence cut off
/// by the end of text), or npos when all of it is valid. Empty text → npos.
std::size_t find_invalid(std::string_view text);

}  // namespace foldline::utf8
