#include "core/io/stat_file_reader.h"

#include <readstat.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <limits>
#include <map>
#include <optional>

#include "core/io/column_builder.h"
#include "core/io/mapped_file.h"
#include "core/io/utf8.h"

namespace foldline {

namespace {

enum class Temporal { None, Date, DateTime };

/// Days from 1970-01-01 to y-m-d in the proleptic Gregorian calendar.
long long days_from_civil(long long y, unsigned m, unsigned d) {
    y -= m <= 2;
    const long long era = (y >= 0 ? y : y - 399) / 400;
    const auto yoe = static_cast<unsigned>(y - era * 400);
    const unsigned doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
    const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    return era * 146097 + static_cast<long long>(doe) - 719468;
}

std::string civil_from_days(long long z) {
    z += 719468;
    const long long era = (z >= 0 ? z : z - 146096) / 146097;
    const auto doe = static_cast<unsigned>(z - era * 146097);
    const unsigned yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
    const long long y = static_cast<long long>(yoe) + era * 400;
    const unsigned doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    const unsigned mp = (5 * doy + 2) / 153;
    const unsigned d = doy - (153 * mp + 2) / 5 + 1;
    const unsigned m = mp < 10 ? mp + 3 : mp - 9;
    char buf[32];
    std::snprintf(buf, sizeof buf, "%04lld-%02u-%02u", y + (m <= 2), m, d);
    return buf;
}

// The format's name without width and decimals ("DATE9." → "DATE"), upper case.
std::string format_stem(const char* format) {
    std::string s;
    for (const char* p = format ? format : ""; *p; ++p) {
        const auto c = static_cast<unsigned char>(*p);
        if (std::isdigit(c) || c == '.') break;
        s.push_back(static_cast<char>(std::toupper(c)));
    }
    return s;
}

Temporal temporal_kind(StatFormat f, const char* format) {
    const std::string fmt = format ? format : "";
    if (f == StatFormat::Dta) {
        if (fmt.rfind("%td", 0) == 0 || fmt.rfind("%d", 0) == 0) return Temporal::Date;
        if (fmt.rfind("%tc", 0) == 0 || fmt.rfind("%tC", 0) == 0) return Temporal::DateTime;
        return Temporal::None;
    }
    const std::string stem = format_stem(format);
    static const char* const kSasDates[] = {"DATE", "YYMMDD", "MMDDYY", "DDMMYY", "E8601DA", "B8601DA",
                                            "WEEKDATE", "WORDDATE", "MONYY", "YYMON", "NLDATE", "YYMMDDN",
                                            "MMDDYYN", "DDMMYYN"};
    static const char* const kSasDateTimes[] = {"DATETIME", "E8601DT", "B8601DT", "DATEAMPM", "NLDATM"};
    static const char* const kSpssDates[] = {"DATE", "ADATE", "EDATE", "SDATE", "JDATE"};
    static const char* const kSpssDateTimes[] = {"DATETIME", "YMDHMS"};
    auto in = [&](const auto& list) {
        return std::any_of(std::begin(list), std::end(list), [&](const char* s) { return stem == s; });
    };
    if (f == StatFormat::Sav) {
        if (in(kSpssDates)) return Temporal::Date;
        if (in(kSpssDateTimes)) return Temporal::DateTime;
        return Temporal::None;
    }
    if (in(kSasDates)) return Temporal::Date;
    if (in(kSasDateTimes)) return Temporal::DateTime;
    return Temporal::None;
}

// ISO text of a date or date-time value counted from the format's epoch.
std::string iso_text(StatFormat f, Temporal t, double v) {
    const long long epoch = f == StatFormat::Sav ? days_from_civil(1582, 10, 14) : days_from_civil(1960, 1, 1);
    if (t == Temporal::Date) {
        const double days = f == StatFormat::Sav ? v / 86400.0 : v;
        return civil_from_days(epoch + static_cast<long long>(std::floor(days)));
    }
    const double seconds = f == StatFormat::Dta ? v / 1000.0 : v;
    const auto whole = static_cast<long long>(std::floor(seconds));
    long long day = whole / 86400, rest = whole % 86400;
    if (rest < 0) {
        rest += 86400;
        --day;
    }
    char buf[16];
    std::snprintf(buf, sizeof buf, "T%02lld:%02lld:%02lld", rest / 3600, rest / 60 % 60, rest % 60);
    return civil_from_days(epoch + day) + buf;
}

struct LabelSet {
    std::vector<std::pair<double, std::string>> numbers;
    std::vector<std::pair<std::string, std::string>> texts;
};

struct Variable {
    std::string name;
    std::string label;
    std::string label_set;
    bool is_string = false;
    Temporal temporal = Temporal::None;
    std::vector<double> numbers;     ///< numeric variables: one per row, NaN = missing
    std::vector<std::string> texts;  ///< string variables
    std::vector<bool> text_missing;
};

struct Context {
    StatFormat format = StatFormat::Xpt;
    const Work* work = nullptr;
    std::vector<Variable> vars;
    std::map<std::string, LabelSet> label_sets;
    std::string library_message;
    bool latin1_seen = false;
    std::size_t max_rows = 0;
    bool too_many_rows = false;
    long declared_rows = -1;  ///< from the file's header; -1 when it does not say
};

// Text from the file as UTF-8: valid UTF-8 as is, anything else read as Latin-1.
std::string as_utf8(const char* s, Context& ctx) {
    std::string_view v = s ? s : "";
    if (utf8::find_invalid(v) == utf8::npos) return std::string(v);
    ctx.latin1_seen = true;
    std::string out;
    for (unsigned char c : v) {
        if (c < 0x80) {
            out.push_back(static_cast<char>(c));
        } else {
            out.push_back(static_cast<char>(0xC0 | (c >> 6)));
            out.push_back(static_cast<char>(0x80 | (c & 0x3F)));
        }
    }
    return out;
}

int on_variable(int index, readstat_variable_t* variable, const char* val_labels, void* p) {
    auto& ctx = *static_cast<Context*>(p);
    if (index < 0 || static_cast<std::size_t>(index) != ctx.vars.size()) return READSTAT_HANDLER_ABORT;
    Variable v;
    v.name = as_utf8(readstat_variable_get_name(variable), ctx);
    v.label = as_utf8(readstat_variable_get_label(variable), ctx);
    v.label_set = val_labels ? val_labels : "";
    v.is_string = readstat_variable_get_type_class(variable) == READSTAT_TYPE_CLASS_STRING;
    if (!v.is_string) v.temporal = temporal_kind(ctx.format, readstat_variable_get_format(variable));
    ctx.vars.push_back(std::move(v));
    return READSTAT_HANDLER_OK;
}

int on_value(int obs_index, readstat_variable_t* variable, readstat_value_t value, void* p) {
    auto& ctx = *static_cast<Context*>(p);
    const int index = readstat_variable_get_index(variable);
    if (index < 0 || static_cast<std::size_t>(index) >= ctx.vars.size()) return READSTAT_HANDLER_ABORT;
    if (obs_index < 0 || static_cast<std::size_t>(obs_index) >= ctx.max_rows) {
        ctx.too_many_rows = true;
        return READSTAT_HANDLER_ABORT;
    }
    auto& v = ctx.vars[static_cast<std::size_t>(index)];
    // System, special (tagged) and user-defined missing values are all missing cells.
    const bool missing = readstat_value_is_missing(value, variable) != 0;
    if (v.is_string) {
        v.texts.push_back(missing ? std::string() : as_utf8(readstat_string_value(value), ctx));
        v.text_missing.push_back(missing);
    } else {
        v.numbers.push_back(missing ? std::numeric_limits<double>::quiet_NaN() : readstat_double_value(value));
    }
    return READSTAT_HANDLER_OK;
}

int on_value_label(const char* set, readstat_value_t value, const char* label, void* p) {
    auto& ctx = *static_cast<Context*>(p);
    auto& ls = ctx.label_sets[set ? set : ""];
    if (readstat_value_is_tagged_missing(value) || readstat_value_is_system_missing(value)) return READSTAT_HANDLER_OK;
    if (readstat_value_type_class(value) == READSTAT_TYPE_CLASS_STRING)
        ls.texts.emplace_back(as_utf8(readstat_string_value(value), ctx), as_utf8(label, ctx));
    else
        ls.numbers.emplace_back(readstat_double_value(value), as_utf8(label, ctx));
    return READSTAT_HANDLER_OK;
}

int on_metadata(readstat_metadata_t* metadata, void* p) {
    static_cast<Context*>(p)->declared_rows = readstat_get_row_count(metadata);
    return READSTAT_HANDLER_OK;
}

int on_progress(double, void* p) {
    auto& ctx = *static_cast<Context*>(p);
    return ctx.work->cancelled() ? READSTAT_HANDLER_ABORT : READSTAT_HANDLER_OK;
}

void on_error(const char* message, void* p) {
    auto& ctx = *static_cast<Context*>(p);
    std::string m = message ? message : "";
    while (!m.empty() && (m.back() == '\n' || m.back() == ' ')) m.pop_back();
    if (ctx.library_message.empty()) ctx.library_message = m;
}

}  // namespace

const char* stat_format_name(StatFormat f) {
    switch (f) {
        case StatFormat::Xpt: return "SAS transport";
        case StatFormat::Sas7bdat: return "SAS data set";
        case StatFormat::Sav: return "SPSS";
        case StatFormat::Dta: return "Stata";
    }
    return "";
}


namespace {

// readstat's input over a read-only mapping of the file (core/io/mapped_file.h).
struct MappedInput {
    MappedFile file;
    std::size_t pos = 0;
    std::optional<Error> open_error;
    bool changed = false;  ///< the file changed under the mapping (checked when it is closed)
};

int mapped_open(const char* path, void* io_ctx) {
    auto* in = static_cast<MappedInput*>(io_ctx);
    auto f = MappedFile::open(path);
    if (!f) {
        in->open_error = f.error();
        return -1;
    }
    in->file = std::move(*f);
    in->pos = 0;
    return 0;
}

int mapped_close(void* io_ctx) {
    auto* in = static_cast<MappedInput*>(io_ctx);
    in->changed = in->changed || in->file.changed_since_open();
    in->file = MappedFile();
    return 0;
}

readstat_off_t mapped_seek(readstat_off_t offset, readstat_io_flags_t whence, void* io_ctx) {
    auto* in = static_cast<MappedInput*>(io_ctx);
    const auto size = static_cast<long long>(in->file.bytes().size());
    const long long base = whence == READSTAT_SEEK_SET ? 0 : whence == READSTAT_SEEK_CUR ? static_cast<long long>(in->pos) : size;
    const long long to = base + static_cast<long long>(offset);
    if (to < 0 || to > size) return -1;
    in->pos = static_cast<std::size_t>(to);
    return static_cast<readstat_off_t>(to);
}

ssize_t mapped_read(void* buf, size_t nbyte, void* io_ctx) {
    auto* in = static_cast<MappedInput*>(io_ctx);
    const std::string_view bytes = in->file.bytes();
    const std::size_t n = std::min(nbyte, bytes.size() - std::min(in->pos, bytes.size()));
    if (n) std::memcpy(buf, bytes.data() + in->pos, n);
    in->pos += n;
    return static_cast<ssize_t>(n);
}

readstat_error_t mapped_update(long file_size, readstat_progress_handler progress, void* user_ctx, void* io_ctx) {
    auto* in = static_cast<MappedInput*>(io_ctx);
    if (!progress || file_size <= 0) return READSTAT_OK;
    if (progress(static_cast<double>(in->pos) / static_cast<double>(file_size), user_ctx) != READSTAT_HANDLER_OK)
        return READSTAT_ERROR_USER_ABORT;
    return READSTAT_OK;
}

}  // namespace

Result<Table> read_stat_file(const std::string& path, StatFormat format, const CsvOptions& opts,
                             std::vector<std::string>* warnings, const Work& work) {
    std::error_code ec;
    const auto bytes = std::filesystem::file_size(path, ec);
    if (ec) return make_error("cannot open the file: " + ec.message(), path);
    if (bytes == 0) return make_error(std::string("empty file (expected a ") + stat_format_name(format) + " data file)", path);
    // Transport files are made of 80-byte records: any other size is a cut file.
    if (format == StatFormat::Xpt && bytes % 80 != 0)
        return make_error("the SAS transport file is truncated or damaged (its size, " + std::to_string(bytes) +
                              " bytes, is not a whole number of 80-byte records)",
                          path);
    Context ctx;
    ctx.format = format;
    ctx.work = &work;
    // Every stored row takes at least one byte of the file, so no row index beyond its size.
    ctx.max_rows = static_cast<std::size_t>(bytes);
    readstat_parser_t* parser = readstat_parser_init();
    readstat_set_metadata_handler(parser, on_metadata);
    readstat_set_variable_handler(parser, on_variable);
    readstat_set_value_handler(parser, on_value);
    readstat_set_value_label_handler(parser, on_value_label);
    readstat_set_progress_handler(parser, on_progress);
    readstat_set_error_handler(parser, on_error);
    // The file is read through a read-only mapping: readstat's own input reads every record with
    // a system call (an lseek and a read per 80-byte transport record), several times the cost
    // of the parsing itself.
    MappedInput input;
    readstat_set_open_handler(parser, mapped_open);
    readstat_set_close_handler(parser, mapped_close);
    readstat_set_seek_handler(parser, mapped_seek);
    readstat_set_read_handler(parser, mapped_read);
    readstat_set_update_handler(parser, mapped_update);
    readstat_set_io_ctx(parser, &input);
    readstat_error_t rc = READSTAT_OK;
    switch (format) {
        case StatFormat::Xpt: rc = readstat_parse_xport(parser, path.c_str(), &ctx); break;
        case StatFormat::Sas7bdat: rc = readstat_parse_sas7bdat(parser, path.c_str(), &ctx); break;
        case StatFormat::Sav: rc = readstat_parse_sav(parser, path.c_str(), &ctx); break;
        case StatFormat::Dta: rc = readstat_parse_dta(parser, path.c_str(), &ctx); break;
    }
    readstat_parser_free(parser);
    if (work.cancelled()) return make_error("cancelled", path);
    if (input.open_error) return *input.open_error;
    if (input.changed)
        return make_error("the file changed while being read (truncated, rewritten or appended to); "
                          "read it again once it is complete",
                          path);
    const std::string kind = stat_format_name(format);
    if (ctx.too_many_rows)
        return make_error("the " + std::string(stat_format_name(format)) + " file declares more rows than it can hold (a damaged file?)", path);
    if (rc != READSTAT_OK) {
        std::string why = readstat_error_message(rc);
        if (!ctx.library_message.empty()) why += " — " + ctx.library_message;
        return make_error("cannot read this as a " + kind + " file (" + why +
                              "); expected an intact file of the format its extension names",
                          path);
    }
    if (ctx.vars.empty()) return make_error("the " + kind + " file holds no variables (expected at least one)", path);
    std::size_t rows = 0;
    for (const auto& v : ctx.vars) rows = std::max(rows, v.is_string ? v.texts.size() : v.numbers.size());
    for (const auto& v : ctx.vars)
        if ((v.is_string ? v.texts.size() : v.numbers.size()) != rows)
            return make_error("variable '" + v.name + "' has fewer values than the other variables (a damaged file?)", path);
    if (rows == 0) return make_error("the " + kind + " file holds no rows (expected at least one)", path);
    if (ctx.declared_rows > 0 && rows != static_cast<std::size_t>(ctx.declared_rows))
        return make_error("the " + kind + " file declares " + std::to_string(ctx.declared_rows) + " rows but holds " +
                              std::to_string(rows) + " (a truncated or damaged file?)",
                          path);

    std::vector<ColumnBuilder> builders;
    std::vector<std::string> labels, descriptions;
    std::vector<std::string> names;
    for (const auto& v : ctx.vars) names.push_back(v.name);
    std::vector<std::string> notes;
    names = unique_column_names(std::move(names), notes);
    for (std::size_t c = 0; c < ctx.vars.size(); ++c) {
        auto& v = ctx.vars[c];
        ColumnBuilder b(names[c], &opts.missing_markers);
        const LabelSet* set = nullptr;
        if (auto it = ctx.label_sets.find(v.label_set); !v.label_set.empty() && it != ctx.label_sets.end())
            if (!it->second.numbers.empty() || !it->second.texts.empty()) set = &it->second;
        std::map<double, const std::string*> by_number;
        std::map<std::string, const std::string*, std::less<>> by_text;
        std::string description;
        if (set) {
            for (const auto& [key, text] : set->numbers) by_number.emplace(key, &text);
            for (const auto& [key, text] : set->texts) by_text.emplace(key, &text);
            description = "codes: ";
            bool first = true;
            for (const auto& [key, text] : set->numbers) {
                description += (first ? "" : "; ") + number_to_text(key) + " = " + text;
                first = false;
            }
            for (const auto& [key, text] : set->texts) {
                description += (first ? "" : "; ") + key + " = " + text;
                first = false;
            }
        }
        for (std::size_t i = 0; i < rows; ++i) {
            if (v.is_string) {
                if (v.text_missing[i]) {
                    b.add_missing();
                    continue;
                }
                const std::string& s = v.texts[i];
                const auto it = by_text.find(s);
                if (it != by_text.end()) b.add_level(*it->second);
                else if (set) b.add_level(s);
                else b.add_text(s);
                continue;
            }
            const double x = v.numbers[i];
            if (std::isnan(x)) {
                b.add_missing();
            } else if (set) {
                const auto it = by_number.find(x);
                b.add_level(it != by_number.end() ? *it->second : number_to_text(x));
            } else if (v.temporal != Temporal::None) {
                b.add_level(iso_text(format, v.temporal, x));
            } else {
                b.add_number(x);
            }
        }
        std::vector<double>().swap(v.numbers);
        std::vector<std::string>().swap(v.texts);
        builders.push_back(std::move(b));
        labels.push_back(v.label);
        descriptions.push_back(std::move(description));
    }
    auto table = finish_table(builders, path, opts.count_column, opts.type_overrides, 1);
    if (!table) return table.error();
    for (auto& col : table->columns) {
        const auto at = std::find(names.begin(), names.end(), col.name) - names.begin();
        col.label = labels[static_cast<std::size_t>(at)];
        col.description = descriptions[static_cast<std::size_t>(at)];
    }
    if (warnings) {
        for (auto& n : notes) warnings->push_back(std::move(n));
        if (ctx.latin1_seen)
            warnings->push_back("some text in the file is not UTF-8; it was read as Latin-1");
    }
    return table;
}

}  // namespace foldline
