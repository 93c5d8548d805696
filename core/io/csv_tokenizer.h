#pragma once
// Splits an RFC 4180 byte range into records and fields without copying: each field is a
// view into the input (quoted fields without their outer quotes; doubled quotes are left in
// place and flagged so the caller can unescape only those). Blank lines are skipped.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace foldline {

struct CsvField {
    const char* data = nullptr;
    std::uint32_t size = 0;
    bool quoted = false;   ///< the field was enclosed in quotes
    bool escaped = false;  ///< the field contains doubled quotes ("") to unescape

    std::string_view raw() const { return {data, size}; }
};

/// The field's text with doubled quotes collapsed, written into `scratch`.
std::string_view unescape_field(const CsvField& f, std::string& scratch);

/// The field's text: the raw view, or `scratch` filled with doubled quotes collapsed.
inline std::string_view field_text(const CsvField& f, std::string& scratch) {
    return f.escaped ? unescape_field(f, scratch) : f.raw();
}

enum class RecordStatus { Record, End, Error };

/// Where and why the tokenizer stopped; line is 0-based, counted from the range start.
struct TokenError {
    std::size_t line = 0;
    std::size_t column = 0;  ///< 1-based field number
    std::string message;
    bool unclosed_quote = false;  ///< a quoted field ran to the end of the range
};

class CsvTokenizer {
public:
    CsvTokenizer(const char* begin, const char* end, char delimiter, std::size_t max_field_bytes,
                 std::size_t max_fields_per_row);

    /// Reads the next record into `fields`. End when no record remains (an empty or blank-only
    /// range gives End at once); Error with error() filled on malformed input.
    RecordStatus next(std::vector<CsvField>& fields);

    /// Newlines before the start of the last record returned (0-based line, relative).
    std::size_t record_line() const { return record_line_; }
    /// Newlines consumed so far, including those inside quoted fields and blank lines.
    std::size_t lines() const { return line_; }
    const char* position() const { return p_; }
    const TokenError& error() const { return error_; }

private:
    const char* find_stop(const char* p) const;  ///< first delimiter, '\n' or '"' at or after p, or end
    RecordStatus fail(std::size_t line, std::size_t column, std::string message);

    const char* p_;
    const char* end_;
    char delim_;
    std::size_t max_field_;
    std::size_t max_fields_;
    std::size_t line_ = 0;
    std::size_t record_line_ = 0;
    TokenError error_;
    unsigned char stop_[256] = {};
};

/// Printable name of a delimiter for messages: ",", ";", "tab", "|".
std::string delimiter_name(char delimiter);

}  // namespace foldline
