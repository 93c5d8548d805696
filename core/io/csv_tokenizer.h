#pragma once
// Splits an RFC 4180 byte range into records and fields without copying: each field is a
// view into the input (quoted fields without their outer quotes; doubled quotes are left in
// place and flagged so the caller can unescape only those). Blank lines are skipped.
#include <bit>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string>
#include <string_view>
#include <vector>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace foldline {

struct CsvField {
    const char* data = nullptr;
    std::uint32_t size = 0;
    bool quoted = false;   ///< the field was enclosed in quotes
    bool escaped = false;  ///< the field contains doubled quotes ("") to unescape

    std::string_view raw() const { return {data, size}; }
};

/// The field's text with doubled quotes collapsed, written into `scratch` (empty field → "").
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
    bool unclosed_quote = false;        ///< a quoted field ran to the end of the range
    const char* open_quote = nullptr;   ///< where that field's opening quote is
};

class CsvTokenizer {
public:
    CsvTokenizer(const char* begin, const char* end, char delimiter, std::size_t max_field_bytes,
                 std::size_t max_fields_per_row);

    /// Reads the next record into `fields`. End when no record remains (an empty or blank-only
    /// range gives End at once); Error with error() filled on malformed input.
    RecordStatus next(std::vector<CsvField>& fields);

    // Field-at-a-time reading, for callers that consume fields as they come:
    // start_record(), then next_field() until it returns Record (or Error).
    enum class FieldEnd : std::uint8_t { Delimiter, Record, Error };
    /// Skips blank lines; false when nothing remains. Sets record_line().
    bool start_record();
    /// Reads field number `column` (1-based) of the current record into f; Delimiter when
    /// another field follows, Record when the record ended, Error with error() filled.
    FieldEnd next_field(CsvField& f, std::size_t column) {
        if (column > max_fields_) return too_many_fields(column);
        if (p_ < end_ && *p_ == '"') return quoted_field(f, column);
        const char* start = p_;
        p_ = find_stop(p_);
        if (p_ < end_ && *p_ == '"') return stray_quote(column);
        const bool at_delim = p_ < end_ && *p_ == delim_;
        const char* stop = p_;
        if (!at_delim && stop > start && stop[-1] == '\r') --stop;  // CRLF, or CR at the very end
        const std::size_t size = static_cast<std::size_t>(stop - start);
        if (size > max_field_) return field_too_long(line_, column);
        f = CsvField{start, static_cast<std::uint32_t>(size), false, false};
        if (at_delim) {
            ++p_;
            return FieldEnd::Delimiter;
        }
        if (p_ < end_) {  // the newline
            ++p_;
            ++line_;
        }
        return FieldEnd::Record;
    }

    /// Newlines before the start of the last record returned (0-based line, relative).
    std::size_t record_line() const { return record_line_; }
    /// Newlines consumed so far, including those inside quoted fields and blank lines.
    std::size_t lines() const { return line_; }
    const char* position() const { return p_; }
    const TokenError& error() const { return error_; }

private:
    RecordStatus fail(std::size_t line, std::size_t column, std::string message);
    FieldEnd quoted_field(CsvField& f, std::size_t column);
    FieldEnd too_many_fields(std::size_t column);
    FieldEnd field_too_long(std::size_t line, std::size_t column);
    FieldEnd stray_quote(std::size_t column);

    /// Bit i set when p[i] is the delimiter, '\n' or '"' (64 bytes from p must be readable).
    std::uint64_t stops_in_block(const char* p) const {
#if defined(__SSE2__)
        const __m128i d = _mm_set1_epi8(delim_);
        const __m128i n = _mm_set1_epi8('\n');
        const __m128i q = _mm_set1_epi8('"');
        std::uint64_t bits = 0;
        for (int k = 0; k < 4; ++k) {
            const __m128i v = _mm_loadu_si128(reinterpret_cast<const __m128i*>(p + 16 * k));
            const __m128i hit =
                _mm_or_si128(_mm_or_si128(_mm_cmpeq_epi8(v, d), _mm_cmpeq_epi8(v, n)), _mm_cmpeq_epi8(v, q));
            bits |= static_cast<std::uint64_t>(static_cast<std::uint32_t>(_mm_movemask_epi8(hit)) & 0xFFFFu)
                    << (16 * k);
        }
        return bits;
#else
        constexpr std::uint64_t ones = 0x0101010101010101ull, k7f = 0x7F7F7F7F7F7F7F7Full;
        auto zero_bytes = [](std::uint64_t x) {  // high bit of each zero byte, exact
            const std::uint64_t t = (x & k7f) + k7f;
            return ~(t | x | k7f);
        };
        const std::uint64_t kd = ones * static_cast<unsigned char>(delim_);
        const std::uint64_t kn = ones * static_cast<unsigned char>('\n');
        const std::uint64_t kq = ones * static_cast<unsigned char>('"');
        std::uint64_t bits = 0;
        for (int k = 0; k < 8; ++k) {
            std::uint64_t w;
            std::memcpy(&w, p + 8 * k, 8);
            const std::uint64_t m = zero_bytes(w ^ kd) | zero_bytes(w ^ kn) | zero_bytes(w ^ kq);
            bits |= (((m >> 7) * 0x0102040810204080ull) >> 56) << (8 * k);  // little-endian byte order
        }
        return bits;
#endif
    }

    /// First delimiter, '\n' or '"' at or after p, or end. The stop bits of the current 64-byte
    /// block depend only on its bytes, so every position inside the block reuses them.
    const char* find_stop(const char* p) {
        for (;;) {
            if (!block_ || p < block_ || p >= block_ + 64) {
                if (end_ - p < 64) break;
                block_ = p;
                block_stops_ = stops_in_block(p);
            }
            const std::uint64_t m = block_stops_ >> (p - block_);
            if (m) return p + std::countr_zero(m);
            p = block_ + 64;
        }
        while (p < end_ && !stop_[static_cast<unsigned char>(*p)]) ++p;
        return p;
    }

    const char* p_;
    const char* end_;
    char delim_;
    std::size_t max_field_;
    std::size_t max_fields_;
    std::size_t line_ = 0;
    std::size_t record_line_ = 0;
    TokenError error_;
    unsigned char stop_[256] = {};
    const char* block_ = nullptr;
    std::uint64_t block_stops_ = 0;
};

/// Printable name of a delimiter for messages: "','", "';'", "tab", "'|'" (any other byte quoted).
std::string delimiter_name(char delimiter);

}  // namespace foldline
