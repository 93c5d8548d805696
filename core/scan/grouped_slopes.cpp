#include "core/scan/grouped_slopes.h"

#include <algorithm>

namespace foldline {
namespace {

BivariateMoments moments_of(const CentredSums& s, const GroupedMoments& m) {
    return BivariateMoments::from_centred_sums(s.n, s.sx, s.sy, s.sxx, s.sxy, s.syy, m.shift_x, m.shift_y,
                                               s.x_constant, s.y_constant);
}

}  // namespace

Result<std::vector<SlopeFinding>> slope_checks_from_groups(const GroupedMoments& m, const GroupedCounts& counts,
                                                           const GroupedScanInput& input, const SlopeQuestion& q) {
    std::vector<SlopeFinding> out;
    const BivariateMoments pooled = moments_of(m.pooled, m);
    for (std::size_t i = 0; i < input.cubes.stratifiers.size(); ++i) {
        const auto& st = input.cubes.stratifiers[i];
        if (st.name == q.x || st.name == q.y) continue;
        const auto it = std::find_if(m.values.begin(), m.values.end(), [&](const Column& c) { return c.name == st.name; });
        if (it == m.values.end()) return make_error("no moment sums for the stratifier '" + st.name + "'");
        const auto j = static_cast<std::size_t>(it - m.values.begin());
        if (m.sums[j].size() != it->size()) return make_error("moment sums of '" + st.name + "' do not match its values");
        auto codes = stratifier_codes(counts, input, i, *it);
        if (!codes) return codes.error();
        // Several values may share a level (a quantile bin): their moments merge exactly.
        std::vector<BivariateMoments> strata(st.levels.size() + 1);
        for (std::size_t r = 0; r < codes->size(); ++r) strata[(*codes)[r]].merge(moments_of(m.sums[j][r], m));
        out.push_back(slope_finding_from_moments(q, st.name, st.levels, strata, pooled, m.hc3, m.zero_one));
    }
    return out;
}

}  // namespace foldline
