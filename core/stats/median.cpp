#include "core/stats/median.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

namespace foldline::stats {
namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

double weighted_median(std::vector<double> values, std::vector<double> weights) {
    std::vector<std::size_t> order;
    double total = 0;
    for (std::size_t i = 0; i < values.size(); ++i) {
        const double w = weights.empty() ? 1.0 : (i < weights.size() ? weights[i] : 0.0);
        if (std::isnan(values[i]) || !(w > 0)) continue;
        order.push_back(i);
        total += w;
    }
    if (order.empty()) return kNaN;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return values[a] < values[b]; });
    SortedMedians m({total});
    for (auto i : order) m.add(0, values[i], weights.empty() ? 1.0 : weights[i]);
    return m.medians()[0];
}

SortedMedians::SortedMedians(std::vector<double> totals)
    : half_(std::move(totals)), cum_(half_.size(), 0.0), median_(half_.size(), kNaN), pending_(half_.size(), kNaN) {
    for (auto& h : half_) h /= 2;
}

void SortedMedians::add(std::size_t cell, double value, double weight) {
    if (cell >= half_.size() || !(weight > 0) || !std::isnan(median_[cell])) return;
    if (!std::isnan(pending_[cell])) {
        median_[cell] = (pending_[cell] + value) / 2;
        return;
    }
    cum_[cell] += weight;
    if (cum_[cell] > half_[cell]) median_[cell] = value;
    else if (cum_[cell] == half_[cell]) pending_[cell] = value;
}

std::vector<double> SortedMedians::medians() const {
    std::vector<double> out = median_;
    for (std::size_t c = 0; c < out.size(); ++c)
        if (std::isnan(out[c]) && !std::isnan(pending_[c])) out[c] = pending_[c];
    return out;
}

}  // namespace foldline::stats
