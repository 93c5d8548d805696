#pragma once
// Parsing a JSON document read from a file, with the parser's complaint turned into an Error
// that names the file, line and column — shared by the diagram and project readers.
#include <cstddef>
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "core/common/error.h"
#include "core/common/text_position.h"

namespace foldline {

namespace detail {
// The DOM builder with its error hook replaced: every complaint of the parser (a syntax error,
// and also a number too large for a double, which nlohmann reports as out_of_range and would
// otherwise throw past a catch of parse_error) is kept with its byte offset instead of thrown.
class PositionedJsonBuilder : public nlohmann::detail::json_sax_dom_parser<nlohmann::json> {
public:
    explicit PositionedJsonBuilder(nlohmann::json& result)
        : nlohmann::detail::json_sax_dom_parser<nlohmann::json>(result, false) {}

    template <class Exception>
    bool parse_error(std::size_t byte, const std::string& token, const Exception& e) {
        failed = true;
        offset = byte;
        token_length = token.size();
        what = e.what();
        return false;
    }

    bool failed = false;
    std::size_t offset = 0;
    std::size_t token_length = 0;
    std::string what;
};
}  // namespace detail

/// The parsed document, or an Error "<prefix><parser's explanation>" at the offending line and
/// column of `source`. Empty text is a parse error at line 1; a number beyond the range of a
/// double ("1e400") is an error at the number's first character.
inline Result<nlohmann::json> parse_json_text(std::string_view text, const std::string& source,
                                              const std::string& prefix) {
    nlohmann::json result;
    detail::PositionedJsonBuilder builder(result);
    const bool ok = nlohmann::json::sax_parse(text.begin(), text.end(), &builder);
    if (ok && !builder.failed) return result;
    std::string what = builder.what;
    std::size_t byte = builder.offset;
    if (auto p = what.find("syntax error"); p != std::string::npos) {
        // Keep the parser's own explanation (after "parse error at ...: "), drop its prefix.
        what = what.substr(p);
    } else if (auto q = what.find("number overflow"); q != std::string::npos) {
        // The parser stands just past the number; point at its first digit instead.
        what = what.substr(q) + " (the number is beyond the range of a double)";
        if (byte > builder.token_length) byte -= builder.token_length - 1;
    } else if (auto r = what.find("] "); r != std::string::npos) {
        what = what.substr(r + 2);
    }
    auto [line, col] = line_column(text, byte);
    return make_error(prefix + what, source, line, col);
}

}  // namespace foldline
