// libFuzzer target: every figure of one comparison (core/scan/rate_scan.h analyse_strata) on a
// small random 2 x 2 x K table. The bytes give K (1..8) and the cells; a flag byte scales the
// cells up to near 2^53 or makes them fractional (pre-counted weights). Every figure must be
// finite or NaN (undefined), except the MH odds ratio, which stratified.h documents as 0 or
// +inf when one of its sums is 0; a comparison with an undefined crude or adjusted test is
// never a reversal.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <vector>

#include "core/scan/rate_scan.h"

using namespace foldline;

namespace {
void finite_or_nan(double x) {
    if (std::isinf(x)) std::abort();
}
}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size < 2) return 0;
    const std::size_t k = 1 + data[0] % 8;
    const std::uint8_t flags = data[1];
    if (size < 2 + 4 * k) return 0;
    const double scale = (flags & 1) ? 35184372088832.0 /* 2^45 */ : (flags & 2) ? 0.25 : 1.0;
    stats::Strata s(k);
    std::vector<std::vector<std::string>> labels(k);
    for (std::size_t i = 0; i < k; ++i) {
        const std::uint8_t* c = data + 2 + 4 * i;
        s[i] = {c[0] * scale, c[1] * scale, c[2] * scale, c[3] * scale};
        labels[i] = {"s" + std::to_string(i)};
    }
    const RateFinding f = analyse_strata(s, labels, {"stratum"}, 0.05);
    finite_or_nan(f.crude.rd);
    finite_or_nan(f.crude.z);
    finite_or_nan(f.crude.p);
    finite_or_nan(f.crude.rate_focal);
    finite_or_nan(f.crude.rate_reference);
    finite_or_nan(f.adjusted.mh_rr.se);
    finite_or_nan(f.adjusted.mh_rd.greenland_robins.estimate);
    finite_or_nan(f.adjusted.mh_rd.greenland_robins.se);
    finite_or_nan(f.adjusted.mh_rd.se_sato);
    finite_or_nan(f.adjusted.standardized.rd);
    finite_or_nan(f.cmh.z);
    finite_or_nan(f.cmh.statistic);
    finite_or_nan(f.cmh.p);
    finite_or_nan(f.breslow_day.statistic);
    finite_or_nan(f.breslow_day.p);
    finite_or_nan(f.decomposition.within);
    finite_or_nan(f.decomposition.composition);
    finite_or_nan(f.p_reversal);
    finite_or_nan(f.change);
    if (f.p_reversal < 0 || f.p_reversal > 1) std::abort();
    for (const auto& row : f.strata_table) {
        finite_or_nan(row.rd);
        finite_or_nan(row.share);
    }
    if (f.reversal() && (std::isnan(f.crude.z) || std::isnan(f.cmh.z) || std::isnan(f.crude.rd)))
        std::abort();
    if (f.reversal() && std::isnan(f.adjusted.mh_or.estimate)) std::abort();
    return 0;
}
