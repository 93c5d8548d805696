#include "core/io/decimal_mark.h"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <limits>

namespace foldline {

std::string_view to_string(DecimalMark m) {
    switch (m) {
        case DecimalMark::Auto: return "auto";
        case DecimalMark::Point: return ".";
        case DecimalMark::Comma: return ",";
    }
    return "auto";
}

std::optional<DecimalMark> parse_decimal_mark(std::string_view t) {
    if (t == "auto") return DecimalMark::Auto;
    if (t == "." || t == "point") return DecimalMark::Point;
    if (t == "," || t == "comma") return DecimalMark::Comma;
    return std::nullopt;
}

std::string NumberReading::describe() const {
    switch (kind) {
        case DecimalComma: return "read with a decimal comma (e.g. '" + example + "')";
        case ThousandsComma: return "read with a decimal point and comma thousands (e.g. '" + example + "')";
        case PointKept:
            return "read with a decimal point (e.g. '" + example +
                   "'); other columns have decimal commas, so if '.' groups thousands here, read the file with "
                   "a decimal comma";
        case NotRead:
            return "left as text: '" + example +
                   "' is written as a number, but not with the decimal mark asked for; change the decimal-mark "
                   "setting to read the column as numbers";
        case Ambiguous:
            return "left as text: '" + example +
                   "' reads as a number with a decimal comma or with comma thousands; say which with the "
                   "decimal-mark setting";
    }
    return {};
}

namespace {

struct Shape {
    bool ok = false;
    bool has_decimal = false;
    std::size_t decimals = 0;  ///< digits after the decimal mark
    bool grouped = false;      ///< a thousands separator was used
};

// The number's shape with `decimal` as decimal mark; the value in `out` when ok.
Shape shape_of(std::string_view t, char decimal, double& out) {
    Shape s;
    const char group = decimal == ',' ? '.' : ',';
    while (!t.empty() && t.front() == ' ') t.remove_prefix(1);
    while (!t.empty() && t.back() == ' ') t.remove_suffix(1);
    std::string clean;
    std::size_t i = 0;
    if (i < t.size() && (t[i] == '-' || t[i] == '+')) {
        if (t[i] == '-') clean.push_back('-');
        ++i;
    }
    // Integer part: plain digits, or 1–3 digits then groups of three after separators.
    std::size_t first = 0;
    while (i < t.size() && std::isdigit(static_cast<unsigned char>(t[i]))) {
        clean.push_back(t[i++]);
        ++first;
    }
    if (first == 0) return s;
    char sep_used = 0;
    while (i < t.size() && (t[i] == group || t[i] == ' ')) {
        if (first > 3 && !s.grouped) return s;
        if (sep_used && t[i] != sep_used) return s;
        sep_used = t[i];
        ++i;
        std::size_t k = 0;
        while (k < 3 && i < t.size() && std::isdigit(static_cast<unsigned char>(t[i]))) clean.push_back(t[i++]), ++k;
        if (k != 3) return s;
        s.grouped = true;
    }
    if (i < t.size() && t[i] == decimal) {
        ++i;
        clean.push_back('.');
        s.has_decimal = true;
        while (i < t.size() && std::isdigit(static_cast<unsigned char>(t[i]))) clean.push_back(t[i++]), ++s.decimals;
        if (s.decimals == 0) return s;
    }
    if (i < t.size() && (t[i] == 'e' || t[i] == 'E')) {
        clean.push_back('e');
        ++i;
        if (i < t.size() && (t[i] == '-' || t[i] == '+')) clean.push_back(t[i++]);
        std::size_t k = 0;
        while (i < t.size() && std::isdigit(static_cast<unsigned char>(t[i]))) clean.push_back(t[i++]), ++k;
        if (k == 0) return s;
    }
    if (i != t.size()) return s;
    const auto r = std::from_chars(clean.data(), clean.data() + clean.size(), out);
    if (r.ec != std::errc() || r.ptr != clean.data() + clean.size() || !std::isfinite(out)) return s;
    s.ok = true;
    return s;
}

void make_numeric(Column& c, const std::vector<double>& level_values) {
    std::vector<double> values(c.size());
    const auto missing = c.missing_code();
    for (std::size_t i = 0; i < values.size(); ++i) {
        const auto code = c.code(i);
        values[i] = code == missing ? std::numeric_limits<double>::quiet_NaN() : level_values[code];
    }
    Column n = Column::numeric(c.name, std::move(values));
    n.label = std::move(c.label);
    n.description = std::move(c.description);
    c = std::move(n);
}

}  // namespace

bool parse_grouped_number(std::string_view text, char decimal, double& out) { return shape_of(text, decimal, out).ok; }

std::vector<NumberReading> decide_decimal_marks(Table& table, DecimalMark mark,
                                                const std::vector<std::string>& keep_categorical) {
    std::vector<NumberReading> out;
    // Every level a number written with one of the two marks: a column the mark asked for leaves
    // as text is reported, not passed over in silence.
    auto written_as_number = [](const Column& c, char decimal) {
        double v = 0;
        return std::all_of(c.levels.begin(), c.levels.end(),
                           [&](const std::string& t) { return shape_of(t, decimal, v).ok; });
    };
    for (auto& c : table.columns) {
        if (!c.is_categorical() || c.levels.empty()) continue;
        if (std::find(keep_categorical.begin(), keep_categorical.end(), c.name) != keep_categorical.end()) continue;
        if (mark == DecimalMark::Point) {
            if (written_as_number(c, ',') || written_as_number(c, '.')) {
                std::string example = c.levels.front();
                for (const auto& t : c.levels)
                    if (t.find(',') != std::string::npos) {
                        example = t;
                        break;
                    }
                out.push_back({c.name, NumberReading::NotRead, example});
            }
            continue;
        }
        std::vector<double> as_comma(c.levels.size()), as_point(c.levels.size());
        bool comma_ok = true, point_ok = true;
        std::string comma_proof, point_proof, example;
        for (std::size_t l = 0; l < c.levels.size() && (comma_ok || point_ok); ++l) {
            const std::string& t = c.levels[l];
            const Shape sc = shape_of(t, ',', as_comma[l]);
            const Shape sp = mark == DecimalMark::Auto ? shape_of(t, '.', as_point[l]) : Shape{};
            comma_ok = comma_ok && sc.ok;
            point_ok = point_ok && sp.ok;
            // A comma with other than three digits after it, or both marks, can only be a decimal comma.
            if (sc.ok && sc.has_decimal && (sc.decimals != 3 || sc.grouped) && comma_proof.empty()) comma_proof = t;
            if (sp.ok && sp.grouped && (sp.has_decimal || t.find(',') != t.rfind(',')) && point_proof.empty())
                point_proof = t;
            if (example.empty() && t.find(',') != std::string::npos) example = t;
        }
        if (mark == DecimalMark::Comma) {
            if (!comma_ok) {
                if (written_as_number(c, '.')) {
                    std::string shown = c.levels.front();
                    double v = 0;
                    for (const auto& t : c.levels)
                        if (!shape_of(t, ',', v).ok) {
                            shown = t;
                            break;
                        }
                    out.push_back({c.name, NumberReading::NotRead, shown});
                }
                continue;
            }
            NumberReading r{c.name, NumberReading::DecimalComma, example.empty() ? c.levels.front() : example};
            make_numeric(c, as_comma);
            out.push_back(std::move(r));
            continue;
        }
        if (example.empty())
            for (const auto& t : c.levels)
                if (t.find_first_of(". ") != std::string::npos) {
                    example = t;
                    break;
                }
        if (example.empty()) example = c.levels.front();
        const bool comma = comma_ok && (!point_ok || (!comma_proof.empty() && point_proof.empty()));
        const bool point = !comma && point_ok && (!comma_ok || (!point_proof.empty() && comma_proof.empty()));
        if (comma) {
            out.push_back({c.name, NumberReading::DecimalComma, comma_proof.empty() ? example : comma_proof});
            make_numeric(c, as_comma);
        } else if (point) {
            out.push_back({c.name, NumberReading::ThousandsComma, point_proof.empty() ? example : point_proof});
            make_numeric(c, as_point);
        } else if (comma_ok && point_ok) {
            out.push_back({c.name, NumberReading::Ambiguous, example});
        }
    }
    const bool any_comma = std::any_of(out.begin(), out.end(), [](const NumberReading& r) {
        return r.kind == NumberReading::DecimalComma;
    });
    if (mark == DecimalMark::Auto && any_comma) {
        for (const auto& c : table.columns) {
            if (!c.is_numeric()) continue;
            if (std::any_of(out.begin(), out.end(), [&](const NumberReading& r) { return r.column == c.name; })) continue;
            bool all_three = true;
            double example = 0;
            bool fractional = false;
            for (double v : c.values) {
                if (std::isnan(v)) continue;
                const double k = v * 1000;
                if (std::fabs(k - std::round(k)) > 1e-6 * std::max(1.0, std::fabs(k))) {
                    all_three = false;
                    break;
                }
                if (!fractional && v != std::floor(v)) {
                    fractional = true;
                    example = v;
                }
            }
            if (all_three && fractional) {
                char buf[64];
                std::snprintf(buf, sizeof buf, "%.3f", example);
                out.push_back({c.name, NumberReading::PointKept, buf});
            }
        }
    }
    return out;
}

}  // namespace foldline
