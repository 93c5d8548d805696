#include "core/stats/fdr.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

namespace foldline::stats {

std::vector<double> benjamini_hochberg(const std::vector<double>& p) {
    std::vector<double> q(p.size(), std::numeric_limits<double>::quiet_NaN());
    std::vector<std::size_t> idx;
    for (std::size_t i = 0; i < p.size(); ++i)
        if (!std::isnan(p[i])) idx.push_back(i);
    const double m = static_cast<double>(idx.size());
    std::stable_sort(idx.begin(), idx.end(), [&](auto x, auto y) { return p[x] < p[y]; });
    double running = 1.0;
    for (std::size_t r = idx.size(); r-- > 0;) {
        running = std::min(running, p[idx[r]] * m / static_cast<double>(r + 1));
        q[idx[r]] = std::min(1.0, running);
    }
    return q;
}

}  // namespace foldline::stats
