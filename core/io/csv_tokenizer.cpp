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

RecordStatus CsvTokenizer::fail(std::size_t line, std::size_t column, std::string message) {
    error_ = TokenError{line, column, std::move(message)};
    p_ = end_;
    return RecordStatus::Error;
}

bool CsvTokenizer::start_record() {
    // Skip blank lines (LF or CRLF).
    for (;;) {
        if (p_ >= end_) return false;
        if (*p_ == '\n') {
            ++line_;
            ++p_;
        } else if (*p_ == '\r' && (p_ + 1 == end_ || p_[1] == '\n')) {
            p_ += p_ + 1 == end_ ? 1 : 2;
            if (p_[-1] == '\n') ++line_;
        } else {
            break;
        }
    }
    record_line_ = line_;
    return true;
}

CsvTokenizer::FieldEnd CsvTokenizer::too_many_fields(std::size_t column) {
    fail(record_line_, column,
         "row has more than " + std::to_string(max_fields_) + " fields (limit max_fields_per_row)");
    return FieldEnd::Error;
}

CsvTokenizer::FieldEnd CsvTokenizer::field_too_long(std::size_t line, std::size_t column) {
    fail(line, column, "field longer than " + std::to_string(max_field_) + " bytes (limit max_field_bytes)");
    return FieldEnd::Error;
}

CsvTokenizer::FieldEnd CsvTokenizer::stray_quote(std::size_t column) {
    fail(line_, column,
         "unexpected '\"' inside an unquoted field (expected the whole field in quotes, with inner "
         "quotes doubled)");
    return FieldEnd::Error;
}

CsvTokenizer::FieldEnd CsvTokenizer::quoted_field(CsvField& f, std::size_t column) {
    const std::size_t open_line = line_;
    const char* start = ++p_;
    bool escaped = false;
    const char* close = nullptr;
    // Look for the closing quote no further than the field-size cap allows, so a hostile or
    // broken file fails early instead of being scanned to its end.
    const std::size_t room = static_cast<std::size_t>(end_ - start);
    const char* window_end = room > max_field_ + 1 ? start + max_field_ + 1 : end_;
    while (!close) {
        // A doubled quote straddling the window's end leaves p_ one past it: the field is then
        // already longer than the cap (and the search length must not go negative).
        if (p_ > window_end) p_ = window_end;
        const void* q = std::memchr(p_, '"', static_cast<std::size_t>(window_end - p_));
        const char* qq = q ? static_cast<const char*>(q) : window_end;
        line_ += static_cast<std::size_t>(std::count(p_, qq, '\n'));
        if (!q && window_end != end_) return field_too_long(open_line, column);
        if (!q) {
            fail(open_line, column, "quoted field opened here is never closed (expected a closing '\"')");
            error_.unclosed_quote = true;
            error_.open_quote = start - 1;
            return FieldEnd::Error;
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
    if (size > max_field_) return field_too_long(open_line, column);
    f = CsvField{start, static_cast<std::uint32_t>(size), true, escaped};
    if (p_ >= end_) return FieldEnd::Record;
    const char c = *p_;
    if (c == delim_) {
        ++p_;
        return FieldEnd::Delimiter;
    }
    if (c == '\n') {
        ++p_;
        ++line_;
        return FieldEnd::Record;
    }
    if (c == '\r' && (p_ + 1 == end_ || p_[1] == '\n')) {
        p_ += p_ + 1 == end_ ? 1 : 2;
        if (p_[-1] == '\n') ++line_;
        return FieldEnd::Record;
    }
    fail(line_, column,
         "unexpected character after a closing quote (expected the delimiter " + delimiter_name(delim_) +
             " or the end of the line)");
    return FieldEnd::Error;
}

RecordStatus CsvTokenizer::next(std::vector<CsvField>& fields) {
    fields.clear();
    if (!start_record()) return RecordStatus::End;
    CsvField f;
    for (;;) {
        const FieldEnd e = next_field(f, fields.size() + 1);
        if (e == FieldEnd::Error) return RecordStatus::Error;
        fields.push_back(f);
        if (e == FieldEnd::Record) return RecordStatus::Record;
    }
}

}  // namespace foldline
