#pragma once
// Where a byte offset falls in a text, for error messages about JSON and CSV inputs.
#include <cstddef>
#include <string_view>
#include <utility>

namespace foldline {

/// 1-based line and column of a 1-based byte offset (as JSON parsers report positions).
/// Offsets past the end give the position just after the last character; 0 gives {1, 1}.
inline std::pair<std::size_t, std::size_t> line_column(std::string_view text, std::size_t byte) {
    std::size_t line = 1, col = 1;
    for (std::size_t i = 0; i + 1 < byte && i < text.size(); ++i) {
        if (text[i] == '\n') {
            ++line;
            col = 1;
        } else {
            ++col;
        }
    }
    return {line, col};
}

}  // namespace foldline
