#include "core/report/slope_chart.h"

#include <algorithm>
#include <cmath>
#include <optional>
#include <cstdio>
#include <limits>
#include <map>

#include "core/scan/joint_strata.h"

namespace foldline::report {

namespace {

std::string joined(const std::vector<std::string>& parts, const char* sep) {
    std::string s;
    for (std::size_t i = 0; i < parts.size(); ++i) s += (i ? sep : "") + parts[i];
    return s;
}

std::string thousands(std::size_t n) {
    std::string digits = std::to_string(n), out;
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > 0 && (digits.size() - i) % 3 == 0) out += ',';
        out += digits[i];
    }
    return out;
}

struct Sums {
    double w = 0, sx = 0, sy = 0;
    double lo = std::numeric_limits<double>::infinity(), hi = -std::numeric_limits<double>::infinity();
    void add(double x, double y, double weight) {
        w += weight, sx += weight * x, sy += weight * y;
        lo = std::min(lo, x), hi = std::max(hi, x);
    }
    std::optional<MemoScatterLine> line(const std::string& label, double slope) const {
        if (w <= 0 || !std::isfinite(slope)) return std::nullopt;
        return MemoScatterLine{label, slope, sy / w - slope * sx / w, lo, hi};
    }
};

}  // namespace

MemoScatter slope_chart(const Table& table, const SlopeFinding& f, int bins, std::size_t max_levels,
                        std::size_t max_points) {
    MemoScatter c;
    c.title = f.y + " on " + f.x + " by " + joined(f.strata, " × ");
    c.x_label = f.x;
    c.y_label = f.y;
    const Column* xc = table.column(f.x);
    const Column* yc = table.column(f.y);
    if (!xc || !yc || !xc->is_numeric() || !yc->is_numeric()) return c;

    // Row → index of the finding's group, through the joint strata's labels.
    std::vector<int> group_of_level;
    std::optional<Column> joint;
    if (auto j = joint_stratifier(table, f.strata, bins, max_levels)) {
        joint = std::move(*j);
        std::map<std::string, int> index;
        for (std::size_t g = 0; g < f.groups.size(); ++g) index[joined(f.groups[g].levels, " | ")] = int(g);
        for (const auto& level : joint->levels) {
            auto it = index.find(level);
            group_of_level.push_back(it == index.end() ? -1 : it->second);
        }
    }
    auto group_of = [&](std::size_t i) -> int {
        if (!joint) return -1;
        const std::size_t code = joint->code(i);
        return code < group_of_level.size() ? group_of_level[code] : -1;
    };

    std::size_t usable = 0;
    for (std::size_t i = 0; i < table.rows; ++i)
        if (!std::isnan(xc->values[i]) && !std::isnan(yc->values[i]) && table.weight(i) > 0) ++usable;
    if (usable == 0) return c;
    const std::size_t stride = max_points == 0 ? 0 : (usable + max_points - 1) / max_points;
    std::vector<Sums> sums(f.groups.size());
    Sums all;
    std::size_t k = 0;
    std::vector<int> point_group;
    for (std::size_t i = 0; i < table.rows; ++i) {
        const double x = xc->values[i], y = yc->values[i], w = table.weight(i);
        if (std::isnan(x) || std::isnan(y) || !(w > 0)) continue;
        const int g = group_of(i);
        if (g >= 0) sums[std::size_t(g)].add(x, y, w);
        all.add(x, y, w);
        if (stride > 0 && k++ % stride == 0) {
            c.x.push_back(x);
            c.y.push_back(y);
            point_group.push_back(g);
        }
    }
    // Lines in table order; a point's group becomes the index of its line.
    std::vector<int> line_of(f.groups.size(), -1);
    for (std::size_t g = 0; g < f.groups.size(); ++g)
        if (auto line = sums[g].line(f.groups[g].level, f.groups[g].slope)) {
            line_of[g] = int(c.lines.size());
            c.lines.push_back(std::move(*line));
        }
    for (int g : point_group) c.group.push_back(g >= 0 ? line_of[std::size_t(g)] : -1);
    c.pooled = all.line("All (pooled)", f.pooled.slope);
    c.note = stride > 1 ? thousands(c.x.size()) + " of " + thousands(usable) + " rows drawn (1 in " +
                              std::to_string(stride) + "); the lines use every row"
             : stride == 1 ? "All " + thousands(usable) + " rows drawn"
                           : "Lines only";
    return c;
}

}  // namespace foldline::report
