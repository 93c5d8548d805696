#include "core/scan/pay_gap.h"

#include <cmath>
#include <limits>

namespace foldline {
namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

double gap_percent(double focal, double reference) {
    if (std::isnan(focal) || std::isnan(reference) || reference == 0) return kNaN;
    return (reference - focal) * 100.0 / reference;
}

PayGap pay_gap(const stats::MeanCells& cells, const std::vector<std::string>& levels,
               const std::vector<double>& median_focal, const std::vector<double>& median_reference,
               double pooled_median_focal, double pooled_median_reference, double threshold_percent) {
    PayGap g;
    g.computed = true;
    g.threshold_percent = threshold_percent;
    stats::MeanMoments f, r;
    for (const auto& c : cells) {
        f.merge(c.focal);
        r.merge(c.reference);
    }
    g.mean_focal = f.mean();
    g.mean_reference = r.mean();
    g.mean_gap_percent = gap_percent(g.mean_focal, g.mean_reference);
    g.median_focal = pooled_median_focal;
    g.median_reference = pooled_median_reference;
    g.median_gap_percent = gap_percent(pooled_median_focal, pooled_median_reference);
    auto at = [](const std::vector<double>& v, std::size_t k) { return k < v.size() ? v[k] : kNaN; };
    for (std::size_t k = 0; k < cells.size(); ++k) {
        const auto& c = cells[k];
        if (c.focal.empty() && c.reference.empty()) continue;
        PayGapStratum s;
        s.level = k < levels.size() ? levels[k] : std::string();
        s.mean_focal = c.focal.mean();
        s.mean_reference = c.reference.mean();
        s.mean_gap_percent = gap_percent(s.mean_focal, s.mean_reference);
        s.median_focal = c.focal.empty() ? kNaN : at(median_focal, k);
        s.median_reference = c.reference.empty() ? kNaN : at(median_reference, k);
        s.median_gap_percent = gap_percent(s.median_focal, s.median_reference);
        s.informative = c.informative();
        s.reaches_threshold = s.informative && std::fabs(s.mean_gap_percent) >= threshold_percent;
        if (s.reaches_threshold) g.flagged.push_back(s.level);
        g.strata.push_back(std::move(s));
    }
    return g;
}

}  // namespace foldline
