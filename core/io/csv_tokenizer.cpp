#include "core/io/csv_tokenizer.h"

#include <algorithm>
#include <bit>
#include <cstdint>
#include <cstring>
#include <limits>

namespace foldline {

std::string_view unescape_field(const CsvField& f, std::string& scratch) {
    scratch.clear();
    for (std::uint32_t i = 0; i < f.size; ++i) {
        scratch.push_back(f.data[i]);
        if (f.data[i] == '"' && i + 1 < f.size && f.data[i + 1] == '"') ++i;
    }
    return scratch;
}

std::string delimiter_name(char d) {
    if (d == '\t') return "tab";
    return std::string("'") + d + "'";
}

CsvTokenizer::CsvTokenizer(const char* begin, const char* end, char delimiter,
                           std::size_t max_field_bytes, std::size_t max_fields_per_row)
    : p_(begin),
      end_(end),
      delim_(delimiter),
      max_field_(std::min<std::size_t>(max_field_bytes, std::numeric_limits<std::uint32_t>::max())),
      max_fields_(max_fields_per_row) {
    stop_[static_cast<unsigned char>(delimiter)] = 1;
    stop_[static_cast<unsigned char>('\n')] = 1;
    stop_[static_cast<unsigned char>('"')] = 1;
}

namespace {

// One high bit per byte of x that is zero (exact, no carries between bytes).
inline std::uint64_t zero_bytes(std::uint64_t x) {
    constexpr std::uint64_t k7f = 0x7F7F7F7F7F7F7F7Full;
    const std::uint64_t t = (x & k7f) + k7f;
    return ~(t | x | k7f);
}

}  // namespace

const char* CsvTokenizer::find_stop(const char* p) const {
    // Eight bytes at a time while a full word remains (little-endian: lowest byte first).
    constexpr std::uint64_t ones = 0x0101010101010101ull;
    const std::uint64_t kd = ones * static_cast<unsigned char>(delim_);
    const std::uint64_t kn = ones * static_cast<unsigned char>('\n');
    const std::uint64_t kq = ones * static_cast<unsigned char>('"');
    while (end_ - p >= 8) {
        std::uint64_t w;
        std::memcpy(&w, p, 8);
        const std::uint64_t m = zero_bytes(w ^ kd) | zero_bytes(w ^ kn) | zero_bytes(w ^ kq);
        if (m) return p + (std::countr_zero(m) >> 3);
        p += 8;
    }
    while (p < end_ && !stop_[static_cast<unsigned char>(*p)]) ++p;
    return p;
}

RecordStatus CsvTokenizer::fail(std::size_t line, std::size_t column, std::string message) {
    error_ = TokenError{line, column, std::move(message)};
    p_ = end_;
    return RecordStatus::Error;
}

RecordStatus CsvTokenizer::next(std::vector<CsvField>& fields) {
    fields.clear();
    // Skip blank lines (LF or CRLF).
    for (;;) {
        if (p_ >= end_) return RecordStatus::End;
        if (*p_ == '\n') {
            ++line_;
            ++p_;
        } else if (*p_ == '\r' && (p_ + 1 == end_ || p_[1] == '\n')) {
            p_ += p_ + 1 == end_ ? 1 : 2;
            if (p_ <= end_ && p_[-1] == '\n') ++line_;
        } else {
            break;
        }
    }
    record_line_ = line_;
    for (;;) {
        const std::size_t column = fields.size() + 1;
        if (fields.size() >= max_fields_)
            return fail(record_line_, column,
                        "row has more than " + std::to_string(max_fields_) +
                            " fields (limit max_fields_per_row)");
        if (p_ < end_ && *p_ == '"') {
            const std::size_t open_line = line_;
            const char* start = ++p_;
            bool escaped = false;
            const char* close = nullptr;
            while (!close) {
                const void* q = std::memchr(p_, '"', static_cast<std::size_t>(end_ - p_));
                const char* qq = q ? static_cast<const char*>(q) : end_;
                line_ += static_cast<std::size_t>(std::count(p_, qq, '\n'));
                if (!q) {
                    fail(open_line, column, "quoted field opened here is never closed (expected a closing '\"')");
                    error_.unclosed_quote = true;
                    return RecordStatus::Error;
                }
                if (qq + 1 < end_ && qq[1] == '"') {
                    escaped = true;
                    p_ = qq + 2;
                } else {
                    close = qq;
                    p_ = qq + 1;
                }
            }
            const std::size_t size = static_cast<std::size_t>(close - start);
            if (size > max_field_)
                return fail(open_line, column,
                            "field longer than " + std::to_string(max_field_) +
                                " bytes (limit max_field_bytes)");
            fields.push_back(CsvField{start, static_cast<std::uint32_t>(size), true, escaped});
            if (p_ >= end_) return RecordStatus::Record;
            const char c = *p_;
            if (c == delim_) {
                ++p_;
                continue;
            }
            if (c == '\n') {
                ++p_;
                ++line_;
                return RecordStatus::Record;
            }
            if (c == '\r' && (p_ + 1 == end_ || p_[1] == '\n')) {
                p_ += p_ + 1 == end_ ? 1 : 2;
                if (p_[-1] == '\n') ++line_;
                return RecordStatus::Record;
            }
            return fail(line_, column,
                        "unexpected character after a closing quote (expected the delimiter " +
                            delimiter_name(delim_) + " or the end of the line)");
        }
        const char* start = p_;
        p_ = find_stop(p_);
        if (p_ < end_ && *p_ == '"')
            return fail(line_, column,
                        "unexpected '\"' inside an unquoted field (expected the whole field "
                        "in quotes, with inner quotes doubled)");
        const bool at_delim = p_ < end_ && *p_ == delim_;
        const char* stop = p_;
        if (!at_delim && stop > start && stop[-1] == '\r') --stop;  // CRLF, or CR at the very end
        const std::size_t size = static_cast<std::size_t>(stop - start);
        if (size > max_field_)
            return fail(line_, column,
                        "field longer than " + std::to_string(max_field_) +
                            " bytes (limit max_field_bytes)");
        fields.push_back(CsvField{start, static_cast<std::uint32_t>(size), false, false});
        if (at_delim) {
            ++p_;
            continue;
        }
        if (p_ < end_) {  // the newline
            ++p_;
            ++line_;
        }
        return RecordStatus::Record;
    }
}

}  // namespace foldline
