#include "core/report/slope_summary.h"

#include <cmath>
#include <cstdio>

namespace foldline {
namespace {

std::string fmt(double v, const char* spec = "%.4g") {
    if (!std::isfinite(v)) return "n/a";
    char buf[64];
    std::snprintf(buf, sizeof buf, spec, v);
    return buf;
}

std::string join(const std::vector<std::string>& v, const char* sep) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? sep : "") + v[i];
    return s;
}

}  // namespace

std::string slope_summary_text(const SlopeScanResult& r, std::size_t max_stable) {
    const auto& q = r.question;
    std::string out = "Slope of " + q.y + " on " + q.x;
    if (!q.covariates.empty()) out += ", adjusted for " + join(q.covariates, ", ");
    out += "\n";
    if (r.findings.empty()) {
        out += "no checks\n";
    } else {
        const SlopeFinding& any = r.findings.front();
        out += "pooled slope " + fmt(any.pooled.slope) + " [" + fmt(any.pooled.ci_low) + ", " +
               fmt(any.pooled.ci_high) + "], r " + fmt(any.pooled.r, "%.3f") + ", n " +
               fmt(any.pooled.n, "%.0f") + "\n";
        if (any.linear_probability)
            out += "the outcome is 0/1: slopes are linear-probability slopes\n";
        std::size_t stable = 0, shown_stable = 0;
        for (const auto& f : r.findings) {
            if (f.cls == FindingClass::Stable && shown_stable >= max_stable) {
                ++stable;
                continue;
            }
            if (f.cls == FindingClass::Stable) ++shown_stable;
            const double w = f.adjusted ? f.adjusted_within.slope : f.within.slope;
            const double lo = f.adjusted ? f.adjusted_within.ci_low : f.within.ci_low;
            const double hi = f.adjusted ? f.adjusted_within.ci_high : f.within.ci_high;
            out += "  " + std::string(to_string(f.cls)) + "  by " + join(f.strata, " × ") +
                   ": within slope " + fmt(w) + " [" + fmt(lo) + ", " + fmt(hi) + "], q " +
                   fmt(f.q_value, "%.3g");
            if (f.stability.draws > 0) out += ", stability " + fmt(f.stability.share, "%.2f");
            if (!f.uninformative.empty())
                out += ", " + std::to_string(f.uninformative.size()) + " uninformative strata";
            out += "\n";
        }
        if (stable > 0) out += "  ... and " + std::to_string(stable) + " more stable\n";
    }
    if (r.latent) out += "hidden groups: " + r.latent->note + "\n";
    out += "A statistical screen, not a legal or clinical determination.\n";
    return out;
}

}  // namespace foldline
