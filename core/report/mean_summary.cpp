#include "core/report/mean_summary.h"

#include <cmath>
#include <cstdio>
#include <string>

namespace foldline {
namespace {

std::string fmt(double x, const char* f) {
    if (!std::isfinite(x)) return "-";
    char buf[64];
    std::snprintf(buf, sizeof buf, f, x);
    return buf;
}

std::string qfmt(double q) { return std::isfinite(q) && q < 1e-300 ? "<1e-300" : fmt(q, "%.2g"); }

}  // namespace

void mean_summary(std::ostream& os, const ScanResult& r, std::size_t top) {
    if (!r.mean_scan) return;
    int counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.mean_findings) ++counts[rank(f.cls)];
    os << r.mean_findings.size() << " comparisons: " << counts[0] << " reversal, " << counts[1] << " explained, "
       << counts[2] << " masked, " << counts[3] << " heterogeneous, " << counts[4] << " stable"
       << " (FDR " << r.alpha << ")\n";
    if (!r.mean_findings.empty()) {
        const auto& f0 = r.mean_findings.front();
        os << "Pooled means: " << f0.focal << " " << fmt(f0.crude.focal.mean, "%.6g") << ", " << f0.reference << " "
           << fmt(f0.crude.reference.mean, "%.6g") << " (on the rows of the first finding)\n";
        if (f0.pay_gap.computed)
            os << "Pay gap (% of the " << f0.reference << " figure): mean " << fmt(f0.pay_gap.mean_gap_percent, "%.1f%%")
               << ", median " << fmt(f0.pay_gap.median_gap_percent, "%.1f%%") << "\n";
    }
    os << "\n";
    char line[512];
    std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %12s %9s\n", "class", "strata", "crude diff",
                  "within diff", "std diff", "q");
    os << line;
    std::size_t shown = 0, flips = 0, flagged = 0;
    for (const auto& f : r.mean_findings) {
        if (f.cls == FindingClass::Stable) {
            if (f.direction_flip) ++flips;
            continue;
        }
        ++flagged;
        if (shown >= top) continue;
        ++shown;
        std::string label = f.label();
        if (r.question.focal.size() > 1) label += " [" + f.focal + "]";
        std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %12s %9s\n", std::string(to_string(f.cls)).c_str(),
                      label.c_str(), fmt(f.crude.difference.estimate, "%+.5g").c_str(),
                      fmt(f.fixed_effects.estimate, "%+.5g").c_str(), fmt(f.standardised.estimate, "%+.5g").c_str(),
                      qfmt(f.q_value).c_str());
        os << line;
    }
    if (flagged == 0)
        os << (flips > 0 ? "(the gap changes sign in " + std::to_string(flips) + " comparison" +
                               (flips == 1 ? "" : "s") + ", none significant)\n"
                         : std::string("(no comparison changes under stratification)\n"));
    if (flagged > shown) os << "... " << flagged - shown << " more flagged (see the JSON)\n";
}

}  // namespace foldline
