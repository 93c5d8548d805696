#include "core/stats/decomposition.h"

#include <limits>

namespace foldline::stats {

Decomposition kitagawa(const std::vector<double>& mix1, const std::vector<double>& rate1,
                       const std::vector<double>& mix2, const std::vector<double>& rate2) {
    constexpr double nan = std::numeric_limits<double>::quiet_NaN();
    const std::size_t k = mix1.size();
    if (k == 0 || rate1.size() != k || mix2.size() != k || rate2.size() != k) return {nan, nan, nan};
    double crude1 = 0, crude2 = 0, within = 0, comp = 0;
    for (std::size_t z = 0; z < k; ++z) {
        crude1 += mix1[z] * rate1[z];
        crude2 += mix2[z] * rate2[z];
        within += (mix1[z] + mix2[z]) / 2 * (rate1[z] - rate2[z]);
        comp += (rate1[z] + rate2[z]) / 2 * (mix1[z] - mix2[z]);
    }
    return {crude1 - crude2, within, comp};
}

Decomposition decompose_crude_rd(const Strata& strata) {
    constexpr double nan = std::numeric_limits<double>::quiet_NaN();
    double n1 = 0, n0 = 0;
    for (const auto& s : strata) {
        n1 += s.n_focal();
        n0 += s.n_reference();
    }
    if (!(n1 > 0) || !(n0 > 0)) return {nan, nan, nan};
    std::vector<double> c1, r1, c0, r0;
    for (const auto& s : strata) {
        const double f = s.n_focal(), r = s.n_reference();
        if (f <= 0 && r <= 0) continue;
        double rf = f > 0 ? s.a / f : s.c / r;
        double rr = r > 0 ? s.c / r : rf;
        c1.push_back(f / n1);
        r1.push_back(rf);
        c0.push_back(r / n0);
        r0.push_back(rr);
    }
    return kitagawa(c1, r1, c0, r0);
}

}  // namespace foldline::stats
