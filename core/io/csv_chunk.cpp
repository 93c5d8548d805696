#include "core/io/csv_chunk.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/io/number_parse.h"
#include "core/io/utf8.h"

namespace foldline {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string quoted_cell(std::string_view text) {
    constexpr std::size_t kShown = 40;
    std::string s(text.substr(0, kShown));
    if (text.size() > kShown) s += "...";
    return "'" + s + "'";
}

inline void encode_level(const ChunkPlan& plan, ChunkColumn& col, const CsvField& f, std::string& scratch) {
    // The usual cell (not quoted-with-escapes) is tested for escapes once, and its text stays in
    // the input, so the dictionary keeps a view of it.
    if (!f.escaped) [[likely]] {
        const std::string_view v = f.raw();
        if (plan.missing(v)) {
            col.codes.push_missing();
            ++col.missing;
        } else if (static_cast<std::size_t>(plan.data + plan.size - f.data) >= 16) {
            col.codes.push(col.dict.intern_padded(v));
        } else {
            col.codes.push(col.dict.intern(v, true));
        }
        return;
    }
    const std::string_view v = unescape_field(f, scratch);
    if (plan.missing(v)) {
        col.codes.push_missing();
        ++col.missing;
        return;
    }
    col.codes.push(col.dict.intern(v, false));
}

// Position of the first invalid UTF-8 byte of a level just added, or npos.
inline std::size_t invalid_byte(const ChunkColumn& col, std::size_t levels_before) {
    if (col.dict.size() == levels_before) return utf8::npos;
    return utf8::find_invalid(col.dict.levels().back());
}

std::string byte_hex(unsigned char c) {
    const char* hex = "0123456789ABCDEF";
    return std::string("0x") + hex[c >> 4] + hex[c & 15];
}

void reset_as_categorical(ChunkColumn& col) {
    col.categorical = true;
    col.values = {};
    col.dict = LevelDictionary{};
    col.codes.clear();
    col.missing = 0;
    col.overflow = false;
    col.overflow_text.clear();
}

}  // namespace

MissingMarkers::MissingMarkers(const std::vector<std::string>& markers) {
    for (const auto& m : markers) {
        if (m.empty()) {
            empty_ = true;
            continue;
        }
        markers_.push_back(m);
        max_len_ = std::max(max_len_, m.size());
        first_[static_cast<unsigned char>(m[0])] = true;
    }
}

void encode_as_categorical(const ChunkPlan& plan, Chunk& chunk, const std::vector<std::size_t>& cols,
                           std::size_t row_limit) {
    for (auto c : cols) {
        reset_as_categorical(chunk.cols[c]);
        chunk.cols[c].codes.reserve(row_limit);
    }
    CsvTokenizer tok(plan.data + chunk.begin, plan.data + chunk.end, plan.delimiter,
                     plan.max_field_bytes, plan.max_fields_per_row);
    std::vector<CsvField> fields;
    std::string scratch;
    const std::size_t ncols = plan.kinds.size();
    for (std::size_t row = 0; row < row_limit;) {
        if (tok.next(fields) != RecordStatus::Record) break;  // the first pass saw the same
        if (fields.size() != ncols) continue;                 // a skipped ragged row
        for (auto c : cols) encode_level(plan, chunk.cols[c], fields[c], scratch);
        ++row;
    }
}

void parse_chunk(const ChunkPlan& plan, Chunk& chunk, const Work& work) {
    const std::size_t ncols = plan.kinds.size();
    chunk.parsed = true;
    chunk.rows = chunk.lines = 0;
    chunk.skipped.clear();
    chunk.failed = chunk.overran = false;
    chunk.error = TokenError{};
    chunk.cols.clear();
    chunk.cols.resize(ncols);
    const std::size_t reserve_rows =
        (chunk.end - chunk.begin) / std::max<std::size_t>(plan.bytes_per_row, 1) * 21 / 20 + 16;
    for (std::size_t c = 0; c < ncols; ++c) {
        ChunkColumn& col = chunk.cols[c];
        col.categorical = plan.kinds[c] == ColumnKind::Categorical;
        if (col.categorical) col.codes.reserve(reserve_rows);
        else col.values.reserve(reserve_rows);
    }

    CsvTokenizer tok(plan.data + chunk.begin, plan.data + chunk.end, plan.delimiter,
                     plan.max_field_bytes, plan.max_fields_per_row);
    using FieldEnd = CsvTokenizer::FieldEnd;
    std::string scratch;
    std::size_t line = 0;
    auto fail = [&](std::size_t at_line, std::size_t column, std::string message) {
        chunk.failed = true;
        chunk.error = TokenError{at_line, column, std::move(message)};
        return false;
    };
    auto token_failed = [&] {
        const TokenError& e = tok.error();
        if (e.unclosed_quote && chunk.end != plan.size) {
            chunk.overran = true;
            chunk.overrun_from = static_cast<std::size_t>(e.open_quote - plan.data);
        } else {
            chunk.failed = true;
        }
        chunk.error = e;
    };
    auto ragged = [&](std::size_t found) {
        return fail(line, std::min(found, ncols) + 1,
                    "expected " + std::to_string(ncols) + " fields as in the header, found " + std::to_string(found));
    };
    auto bad_utf8 = [&](std::size_t c, const CsvField& f, const ChunkColumn& col, std::size_t bad) {
        return fail(line + static_cast<std::size_t>(std::count(f.data, f.data + std::min<std::size_t>(bad, f.size), '\n')),
                    c + 1,
                    "invalid UTF-8 byte " + byte_hex(static_cast<unsigned char>(col.dict.levels().back()[bad])) +
                        " (expected UTF-8 text; re-save the file as UTF-8)");
    };

    // One cell of column c in the current row; false (with chunk.error set) on bad input.
    auto process = [&](std::size_t c, const CsvField& f) __attribute__((always_inline)) -> bool {
        ChunkColumn& col = chunk.cols[c];
        if (col.categorical) {
            const std::size_t before = col.dict.size();
            encode_level(plan, col, f, scratch);
            if (const auto bad = invalid_byte(col, before); bad != utf8::npos) return bad_utf8(c, f, col, bad);
            return true;
        }
        const std::string_view v = field_text(f, scratch);
        const ColumnKind kind = plan.kinds[c];
        if (plan.missing(v)) {
            if (kind == ColumnKind::Count)
                return fail(line, c + 1, "count is missing (expected a whole number of 0 or more)");
            col.values.push_back(kNaN);
            ++col.missing;
            return true;
        }
        double x = 0;
        const NumberParse r = parse_number(v, x);
        if (r == NumberParse::Ok) {
            if (kind == ColumnKind::Count) {
                if (x < 0)
                    return fail(line, c + 1, "count " + quoted_cell(v) + " is negative (expected a whole number of 0 or more)");
                if (x != std::floor(x))
                    return fail(line, c + 1, "count " + quoted_cell(v) + " is fractional (expected a whole number of 0 or more)");
                if (x > 9007199254740992.0)  // 2^53: beyond it doubles no longer count one by one
                    return fail(line, c + 1, "count " + quoted_cell(v) +
                                                 " is beyond 2^53 = 9007199254740992 (expected a count a double holds exactly)");
            }
            col.values.push_back(x);
            return true;
        }
        if (r == NumberParse::OutOfRange) {
            if (kind == ColumnKind::Count)
                return fail(line, c + 1, "count " + quoted_cell(v) + " is beyond the range of a double");
            col.values.push_back(kNaN);
            if (!col.overflow) {
                col.overflow = true;
                col.overflow_line = line;
                col.overflow_text = std::string(v);
            }
            return true;
        }
        if (kind == ColumnKind::Count)
            return fail(line, c + 1, "count " + quoted_cell(v) + " is not a number (expected a whole number of 0 or more)");
        if (kind == ColumnKind::Numeric)
            return fail(line, c + 1, "expected a number (the column is set to numeric), found " + quoted_cell(v));
        // Not a number: the column is categorical. Encode this chunk's earlier rows first so
        // levels keep their order of first appearance.
        std::string keep(v);  // scratch is reused by the re-read
        encode_as_categorical(plan, chunk, {c}, chunk.rows);
        ChunkColumn& cat = chunk.cols[c];
        cat.codes.reserve(reserve_rows);
        const std::size_t before = cat.dict.size();
        if (f.escaped) cat.codes.push(cat.dict.intern(keep, false));
        else cat.codes.push(cat.dict.intern(f.raw(), true));
        if (const auto bad = invalid_byte(cat, before); bad != utf8::npos) return bad_utf8(c, f, cat, bad);
        return true;
    };

    std::vector<CsvField> fields;
    fields.reserve(ncols + 1);
    CsvField f;
    while (tok.start_record()) {
        line = tok.record_line();
        if (plan.skip_ragged) {
            // Whole record first: a ragged row is skipped before any of its cells is used.
            fields.clear();
            FieldEnd e;
            do {
                e = tok.next_field(f, fields.size() + 1);
                if (e == FieldEnd::Error) return token_failed();
                fields.push_back(f);
            } while (e == FieldEnd::Delimiter);
            if (fields.size() != ncols) {
                chunk.skipped.push_back(line);
                continue;
            }
            for (std::size_t c = 0; c < ncols; ++c)
                if (!process(c, fields[c])) return;
        } else {
            // Cells are used as they are read; a ragged row is an error anyway.
            for (std::size_t c = 0; c < ncols; ++c) {
                FieldEnd e = tok.next_field(f, c + 1);
                if (e == FieldEnd::Error) return token_failed();
                if (e == FieldEnd::Record && c + 1 < ncols) {
                    ragged(c + 1);
                    return;
                }
                if (!process(c, f)) return;
                if (e == FieldEnd::Delimiter && c + 1 == ncols) {
                    std::size_t found = ncols;
                    while (e == FieldEnd::Delimiter) {
                        e = tok.next_field(f, ++found);
                        if (e == FieldEnd::Error) return token_failed();
                    }
                    ragged(found);
                    return;
                }
            }
        }
        ++chunk.rows;
        if ((chunk.rows & 0x1FFF) == 0 && work.cancelled()) {
            fail(0, 0, "cancelled");
            return;
        }
    }
    chunk.lines = tok.lines();
}

}  // namespace foldline
