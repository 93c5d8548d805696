#include "core/io/csv_reader.h"

#include <algorithm>
#include <array>
#include <atomic>
#include <cstring>
#include <cstdio>
#include <mutex>
#include <set>
#include <type_traits>
#include <unordered_set>

#include <sys/mman.h>

#include "core/common/run_tasks.h"
#include "core/io/csv_chunk.h"
#include "core/io/csv_tokenizer.h"
#include "core/io/mapped_file.h"
#include "core/io/utf8.h"

namespace foldline {

namespace {

constexpr std::size_t kMiB = 1u << 20;

/// Serialises progress calls from worker threads.
class Progress {
public:
    Progress(const Work& work, double total) : work_(work), total_(total) {}
    void add(double bytes, const char* step) {
        std::lock_guard<std::mutex> lock(mu_);
        done_ += bytes;
        work_.report(done_, total_, step);
    }

private:
    const Work& work_;
    double total_;
    double done_ = 0;
    std::mutex mu_;
};

// 1-based line and column of byte `offset`, found by re-reading from `start` (error path only).
std::pair<std::size_t, std::size_t> locate(std::string_view text, std::size_t start, char delim,
                                           std::size_t offset, const CsvOptions& opts) {
    const std::size_t line = 1 + static_cast<std::size_t>(
                                     std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(offset), '\n'));
    CsvTokenizer tok(text.data() + start, text.data() + text.size(), delim, opts.max_field_bytes,
                     opts.max_fields_per_row);
    std::vector<CsvField> fields;
    const char* target = text.data() + offset;
    while (tok.next(fields) == RecordStatus::Record) {
        if (tok.position() <= target) continue;
        std::size_t column = 0;
        for (std::size_t i = 0; i < fields.size(); ++i)
            if (fields[i].data <= target) column = i + 1;
        return {line, column};
    }
    return {line, 0};
}

std::string byte_hex(unsigned char c) {
    char buf[8];
    std::snprintf(buf, sizeof buf, "0x%02X", c);
    return buf;
}

// Unique, non-empty column names; renames are reported as warnings.
std::vector<std::string> unique_names(std::vector<std::string> names, std::vector<std::string>& warnings) {
    std::unordered_set<std::string> taken;
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (names[i].empty()) {
            std::string n = "column_" + std::to_string(i + 1);
            for (int k = 2; std::find(names.begin(), names.end(), n) != names.end(); ++k)
                n = "column_" + std::to_string(i + 1) + "_" + std::to_string(k);
            warnings.push_back("column " + std::to_string(i + 1) + " has no name in the header; named '" + n + "'");
            names[i] = n;
        }
    }
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (taken.insert(names[i]).second) continue;
        std::string n;
        for (int k = 2;; ++k) {
            n = names[i] + "_" + std::to_string(k);
            if (!taken.count(n) && std::find(names.begin() + static_cast<std::ptrdiff_t>(i) + 1, names.end(), n) == names.end())
                break;
        }
        warnings.push_back("duplicate column name '" + names[i] + "' (column " + std::to_string(i + 1) +
                           ") renamed '" + n + "'");
        names[i] = n;
        taken.insert(n);
    }
    return names;
}

// Offset just past the first newline outside quotes at or after `from` (which is outside
// quotes); the end of text when there is none. Every '"' toggles quoting, as in RFC 4180.
std::size_t next_record_start(std::string_view text, std::size_t from) {
    bool in_quotes = false;
    for (std::size_t i = from; i < text.size(); ++i) {
        const char c = text[i];
        if (c == '"') in_quotes = !in_quotes;
        else if (c == '\n' && !in_quotes) return i + 1;
    }
    return text.size();
}

// Asks for transparent huge pages on a large, not yet touched buffer: a column of a million
// rows then costs a handful of page faults instead of thousands. Only a hint.
void prefer_huge_pages(const void* data, std::size_t bytes) {
    constexpr std::uintptr_t kHuge = 2u << 20;
    const auto b = (reinterpret_cast<std::uintptr_t>(data) + kHuge - 1) & ~(kHuge - 1);
    const auto e = (reinterpret_cast<std::uintptr_t>(data) + bytes) & ~(kHuge - 1);
    if (e > b) ::madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
}

template <typename T>
void release_vector(std::vector<T>& v) {
    std::vector<T>().swap(v);
}

Column assemble_numeric(std::string name, std::vector<Chunk>& chunks, std::size_t c, std::size_t rows) {
    Column col;
    col.name = std::move(name);
    col.type = ColumnType::Numeric;
    col.codes = std::vector<std::uint8_t>{};
    col.values.reserve(rows);
    prefer_huge_pages(col.values.data(), rows * sizeof(double));
    for (auto& ch : chunks) {
        auto& piece = ch.cols[c];
        col.values.insert(col.values.end(), piece.values.begin(), piece.values.end());
        col.missing_count += piece.missing;
        release_vector(piece.values);
    }
    return col;
}

// Writes the chunk's codes as global codes from `out` on; returns the end of what it wrote.
// One-byte local codes go through a 256-entry table (the missing mark included), so the loop
// is a load and a store per cell.
template <typename Code>
Code* remap_into(Code* out, const LocalCodes& local, const std::vector<std::uint32_t>& to_global, Code missing) {
    local.visit([&](const auto& v, auto local_missing) {
        using Local = std::remove_cvref_t<decltype(local_missing)>;
        if constexpr (std::is_same_v<Local, std::uint8_t>) {
            std::array<Code, 256> table;
            table.fill(missing);
            for (std::size_t l = 0; l < to_global.size() && l < 0xFFu; ++l) table[l] = static_cast<Code>(to_global[l]);
            for (const std::uint8_t x : v) *out++ = table[x];
        } else {
            for (auto x : v) *out++ = x == local_missing ? missing : static_cast<Code>(to_global[x]);
        }
    });
    return out;
}

Column assemble_categorical(std::string name, std::vector<Chunk>& chunks, std::size_t c) {
    // Chunk dictionaries merged in file order give the levels in order of first appearance.
    LevelDictionary global;
    std::vector<std::vector<std::uint32_t>> to_global(chunks.size());
    for (std::size_t k = 0; k < chunks.size(); ++k) {
        const auto& levels = chunks[k].cols[c].dict.levels();
        to_global[k].reserve(levels.size());
        for (auto l : levels) to_global[k].push_back(global.intern(l, true));
    }
    Column col;
    col.name = std::move(name);
    col.type = ColumnType::Categorical;
    col.levels.assign(global.levels().begin(), global.levels().end());
    const std::size_t n = col.levels.size();
    auto fill = [&](auto tag) {
        using Code = decltype(tag);
        std::size_t cells = 0;
        for (const auto& ch : chunks) cells += ch.cols[c].codes.size();  // == rows
        std::vector<Code> out;
        out.reserve(cells);
        prefer_huge_pages(out.data(), cells * sizeof(Code));
        out.resize(cells);
        Code* at = out.data();
        for (std::size_t k = 0; k < chunks.size(); ++k) {
            auto& piece = chunks[k].cols[c];
            at = remap_into(at, piece.codes, to_global[k], static_cast<Code>(n));
            col.missing_count += piece.missing;
            piece.codes.clear();
        }
        col.codes = std::move(out);
    };
    if (n < 0xFFu) fill(std::uint8_t{});
    else if (n < 0xFFFFu) fill(std::uint16_t{});
    else fill(std::uint32_t{});
    for (auto& ch : chunks) ch.cols[c].dict = LevelDictionary{};
    return col;
}

Result<Table> read_impl(std::string_view text, const std::string& name, const CsvOptions& opts,
                        CsvReport* report_out, const Work& work, const MappedFile* map) {
    CsvReport report;
    auto err = [&](std::string message, std::size_t line = 0, std::size_t column = 0) {
        return make_error(std::move(message), name, line, column);
    };
    if (text.empty()) return err("empty file (expected a header row and at least one data row)");
    const auto* u = reinterpret_cast<const unsigned char*>(text.data());
    if (text.size() >= 2 && ((u[0] == 0xFF && u[1] == 0xFE) || (u[0] == 0xFE && u[1] == 0xFF)))
        return err("the file is UTF-16 text (it starts with a UTF-16 byte-order mark); expected UTF-8 — "
                   "re-save it as UTF-8 CSV", 1, 1);
    if (text.size() >= 4 && u[0] == 0 && u[1] == 0 && u[2] == 0xFE && u[3] == 0xFF)
        return err("the file is UTF-32 text; expected UTF-8 — re-save it as UTF-8 CSV", 1, 1);
    std::size_t start = 0;
    if (text.size() >= 3 && u[0] == 0xEF && u[1] == 0xBB && u[2] == 0xBF) {
        start = 3;
        report.had_bom = true;
    }
    const char delim = opts.delimiter ? opts.delimiter : detect_delimiter(text.substr(start));
    if (delim == '"' || delim == '\n' || delim == '\r')
        return err("the delimiter cannot be a quote or a line break");
    report.delimiter = delim;

    // Header.
    CsvTokenizer header_tok(text.data() + start, text.data() + text.size(), delim, opts.max_field_bytes,
                            opts.max_fields_per_row);
    std::vector<CsvField> fields;
    const RecordStatus hs = header_tok.next(fields);
    if (hs == RecordStatus::End) return err("empty file (only blank lines; expected a header row and data rows)");
    if (hs == RecordStatus::Error) {
        const auto& e = header_tok.error();
        return err(e.message, e.line + 1, e.column);
    }
    const std::size_t header_line = header_tok.record_line() + 1;
    const std::size_t body_start = static_cast<std::size_t>(header_tok.position() - text.data());
    const std::size_t body_first_line = header_tok.lines() + 1;
    std::vector<std::string> raw_names;
    {
        std::string scratch;
        for (const auto& f : fields) raw_names.emplace_back(field_text(f, scratch));
    }
    if (auto bad = utf8::find_invalid(text.substr(start, body_start - start)); bad != utf8::npos) {
        bad += start;
        const auto [line, column] = locate(text, start, delim, bad, opts);
        return err("invalid UTF-8 byte " + byte_hex(u[bad]) + " in the header (expected UTF-8 text; re-save the file as UTF-8)",
                   line, column);
    }
    const std::vector<std::string> names = unique_names(raw_names, report.warnings);
    const std::size_t ncols = names.size();

    // How each column is read.
    ChunkPlan plan;
    plan.data = text.data();
    plan.delimiter = delim;
    plan.kinds.assign(ncols, opts.all_text ? ColumnKind::Categorical : ColumnKind::Inferred);
    plan.missing = MissingMarkers(opts.missing_markers);
    plan.skip_ragged = opts.skip_ragged;
    plan.max_field_bytes = opts.max_field_bytes;
    plan.max_fields_per_row = opts.max_fields_per_row;
    for (const auto& [col_name, type] : opts.type_overrides) {
        const auto it = std::find(names.begin(), names.end(), col_name);
        if (it == names.end())
            return err("a type is set for column '" + col_name + "', which is not in the header", header_line);
        plan.kinds[static_cast<std::size_t>(it - names.begin())] =
            type == ColumnType::Numeric ? ColumnKind::Numeric : ColumnKind::Categorical;
    }
    std::size_t count_index = ncols;
    if (!opts.count_column.empty()) {
        const auto it = std::find(names.begin(), names.end(), opts.count_column);
        if (it == names.end()) {
            std::string list;
            for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
            return err("count column '" + opts.count_column + "' is not in the header (columns: " + list + ")",
                       header_line);
        }
        count_index = static_cast<std::size_t>(it - names.begin());
        if (names.size() == 1)
            return err("count column '" + opts.count_column +
                           "' is the only column (expected at least one column to count by)",
                       header_line);
        plan.kinds[count_index] = ColumnKind::Count;
    }

    // Row size estimate from the first rows, for reserving column storage.
    {
        CsvTokenizer probe(text.data() + body_start, text.data() + std::min(text.size(), body_start + (256u << 10)),
                           delim, opts.max_field_bytes, opts.max_fields_per_row);
        std::size_t n = 0;
        while (n < 200 && probe.next(fields) == RecordStatus::Record) ++n;
        if (n > 0)
            plan.bytes_per_row = std::max<std::size_t>(
                1, static_cast<std::size_t>(probe.position() - (text.data() + body_start)) / n);
    }

    // Chunks: split after the first newline past each nominal boundary, parse all of them in
    // parallel, then check the guess in file order: a chunk that starts right after a record
    // and ends cleanly proves the next one starts right after a record too. When a quoted
    // field spans a split (the chunk "overran"), the split moves to the end of that field's
    // record and both chunks are read again.
    const unsigned threads = resolve_threads(opts.threads);
    const std::size_t body = text.size() - body_start;
    std::size_t target = opts.chunk_bytes;
    if (target == 0) target = std::clamp<std::size_t>(body / (std::size_t{threads} * 4), kMiB, 8 * kMiB);
    target = std::max<std::size_t>(target, body / 65536 + 1);  // at most ~64K chunks, whatever was asked
    std::vector<Chunk> chunks;
    for (std::size_t begin = body_start; begin < text.size();) {
        std::size_t end = text.size();
        if (text.size() - begin > target) {
            const void* nl = std::memchr(text.data() + begin + target, '\n', text.size() - begin - target);
            if (nl) end = static_cast<std::size_t>(static_cast<const char*>(nl) - text.data()) + 1;
        }
        Chunk ch;
        ch.begin = begin;
        ch.end = end;
        chunks.push_back(std::move(ch));
        begin = end;
    }
    Progress progress(work, static_cast<double>(body));
    plan.size = text.size();

    std::atomic<std::size_t> first_failed{chunks.size()};
    run_tasks(chunks.size(), threads, [&](std::size_t i) {
        if (i > first_failed.load(std::memory_order_relaxed) || work.cancelled()) return;
        parse_chunk(plan, chunks[i], work);
        if (map) map->release(chunks[i].begin, chunks[i].end);
        if (chunks[i].failed) {
            std::size_t cur = first_failed.load();
            while (i < cur && !first_failed.compare_exchange_weak(cur, i)) {
            }
        }
        progress.add(static_cast<double>(chunks[i].end - chunks[i].begin), "reading");
    });
    if (work.cancelled()) return err("cancelled");
    std::vector<std::size_t> first_line(1, body_first_line);
    for (std::size_t i = 0; i < chunks.size(); ++i) {
        if (!chunks[i].parsed) {  // skipped after an earlier (guessed) failure, or moved
            parse_chunk(plan, chunks[i], work);
            if (map) map->release(chunks[i].begin, chunks[i].end);
        }
        while (chunks[i].overran) {
            // The record holding the open quote ends at the first newline outside quotes after
            // it; the next chunk starts there instead (and is read again), so no cascade.
            const std::size_t t = next_record_start(text, chunks[i].overrun_from);
            chunks[i].end = t;
            while (i + 1 < chunks.size() && chunks[i + 1].end <= t)
                chunks.erase(chunks.begin() + static_cast<std::ptrdiff_t>(i) + 1);
            if (i + 1 < chunks.size()) {
                chunks[i + 1].begin = t;
                chunks[i + 1].parsed = false;
            }
            parse_chunk(plan, chunks[i], work);
            if (map) map->release(chunks[i].begin, chunks[i].end);
        }
        if (work.cancelled()) return err("cancelled");
        if (chunks[i].failed) {
            const auto& e = chunks[i].error;
            if (e.message == "cancelled") return err("cancelled");
            return err(e.message, first_line[i] + e.line, e.column);
        }
        first_line.push_back(first_line[i] + chunks[i].lines);
    }
    const std::size_t newlines = first_line[chunks.size()] - 1;
    report.physical_lines = newlines + (text.back() == '\n' ? 0 : 1);

    std::size_t rows = 0;
    for (std::size_t i = 0; i < chunks.size(); ++i) {
        rows += chunks[i].rows;
        for (auto l : chunks[i].skipped) report.skipped_lines.push_back(first_line[i] + l);
    }
    if (rows == 0) {
        std::string why = "no data rows after the header (expected at least one)";
        if (!report.skipped_lines.empty())
            why = "no data rows left after skipping " + std::to_string(report.skipped_lines.size()) + " ragged rows";
        // The line where a first row was expected (after the header's own line end).
        const bool header_closed = body_start > start && text[body_start - 1] == '\n';
        return err(why, header_closed ? body_first_line : body_first_line + 1);
    }

    // Column types: categorical if any chunk found a non-number.
    std::vector<bool> categorical(ncols, false);
    for (std::size_t c = 0; c < ncols; ++c) {
        categorical[c] = plan.kinds[c] == ColumnKind::Categorical;
        for (const auto& ch : chunks) categorical[c] = categorical[c] || ch.cols[c].categorical;
        if (categorical[c]) continue;
        for (std::size_t i = 0; i < chunks.size(); ++i) {
            const auto& piece = chunks[i].cols[c];
            if (!piece.overflow) continue;
            return err("number '" + piece.overflow_text.substr(0, 40) + "' is beyond the range of a double in numeric column '" +
                           names[c] + "' (expected a magnitude below about 1.8e308)",
                       first_line[i] + piece.overflow_line, c + 1);
        }
    }
    // Chunks that read a categorical column as numbers re-read it as levels.
    run_tasks(chunks.size(), threads, [&](std::size_t i) {
        std::vector<std::size_t> redo;
        for (std::size_t c = 0; c < ncols; ++c)
            if (categorical[c] && !chunks[i].cols[c].categorical) redo.push_back(c);
        if (redo.empty()) return;
        encode_as_categorical(plan, chunks[i], redo, chunks[i].rows);
        if (map) map->release(chunks[i].begin, chunks[i].end);
    });

    // Assemble columns (independent of each other, so in parallel).
    std::vector<Column> assembled(ncols);
    run_tasks(ncols, threads, [&](std::size_t c) {
        assembled[c] = categorical[c] ? assemble_categorical(names[c], chunks, c)
                                      : assemble_numeric(names[c], chunks, c, rows);
    });
    Table table;
    table.source = name;
    table.rows = rows;
    table.columns.reserve(ncols);
    for (std::size_t c = 0; c < ncols; ++c) {
        if (c == count_index) {
            table.weights = std::move(assembled[c].values);
            table.weight_column = names[c];
            continue;
        }
        table.columns.push_back(std::move(assembled[c]));
    }
    progress.add(0, "done");
    if (report_out) *report_out = std::move(report);
    return table;
}

}  // namespace

Result<Table> read_csv_text(std::string_view text, const std::string& name, const CsvOptions& opts,
                            CsvReport* report, const Work& work) {
    return read_impl(text, name, opts, report, work, nullptr);
}

Result<Table> read_csv(const std::string& path, const CsvOptions& opts, CsvReport* report, const Work& work) {
    auto file = MappedFile::open(path);
    if (!file) return file.error();
    auto table = read_impl(file->bytes(), path, opts, report, work, &*file);
    if (file->changed_since_open())
        return make_error("the file changed while being read (truncated, rewritten or appended to); "
                          "read it again once it is no longer being written", path);
    return table;
}

}  // namespace foldline
