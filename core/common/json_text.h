#pragma once
// Parsing a JSON document read from a file, with the parser's complaint turned into an Error
// that names the file, line and column — shared by the diagram and project readers.
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "core/common/error.h"
#include "core/common/text_position.h"

namespace foldline {

/// The parsed document, or an Error "<prefix><parser's explanation>" at the offending line and
/// column of `source`. Empty text is a parse error at line 1.
inline Result<nlohmann::json> parse_json_text(std::string_view text, const std::string& source,
                                              const std::string& prefix) {
    try {
        return nlohmann::json::parse(text.begin(), text.end());
    } catch (const nlohmann::json::parse_error& e) {
        auto [line, col] = line_column(text, e.byte);
        std::string what = e.what();
        // Keep the parser's own explanation (after "parse error at ...: "), drop its prefix.
        if (auto p = what.find("syntax error"); p != std::string::npos) what = what.substr(p);
        return make_error(prefix + what, source, line, col);
    }
}

}  // namespace foldline
