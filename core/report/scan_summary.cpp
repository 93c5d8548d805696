#include "core/report/scan_summary.h"

#include <cmath>
#include <cstdio>
#include <sstream>

namespace foldline {
namespace {

std::string fmt(double x, const char* f = "%.3f") {
    if (!std::isfinite(x)) return "-";
    char buf[64];
    std::snprintf(buf, sizeof buf, f, x);
    return buf;
}

// q-values that underflowed print as a bound, not as a misleading 0.
std::string qfmt(double q) { return std::isfinite(q) && q < 1e-300 ? "<1e-300" : fmt(q, "%.2g"); }

std::string pct(double x) { return std::isfinite(x) ? fmt(100 * x, "%.1f%%") : "-"; }

std::string plural(std::size_t n, const char* one, const char* many) {
    return std::to_string(n) + " " + (n == 1 ? one : many);
}

// The slope figures a summary shows and the class is drawn from: adjusted when covariates were given.
double shown_pooled(const SlopeFinding& f) { return f.adjusted ? f.adjusted_pooled.slope : f.pooled.slope; }
double shown_within(const SlopeFinding& f) { return f.adjusted ? f.adjusted_within.slope : f.within.slope; }

bool opposite_signs(double a, double b) { return std::isfinite(a) && std::isfinite(b) && a * b < 0; }

void rate_part(std::ostream& os, const ScanResult& r, std::size_t top) {
    const auto& q = r.question;
    int counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.rate_findings) ++counts[rank(f.cls)];
    char line[512];
    os << r.rate_findings.size() << " comparisons: " << counts[0] << " reversal, " << counts[1] << " explained, "
       << counts[2] << " masked, " << counts[3] << " heterogeneous, " << counts[4] << " stable"
       << " (FDR " << r.alpha << ")\n";
    if (!r.rate_findings.empty()) {
        const auto& f0 = r.rate_findings.front();
        os << "Pooled rates: " << f0.focal << " " << pct(f0.crude.rate_focal) << ", " << f0.reference << " "
           << pct(f0.crude.rate_reference) << " (on the rows of the first finding)\n";
    }
    os << "\n";
    std::snprintf(line, sizeof line, "%-14s %-40s %9s %9s %9s %21s %9s %6s\n", "class", "strata", "crude RD",
                  "MH RD", "std RD", "MH OR (CI)", "q", "stab.");
    os << line;
    std::size_t shown = 0, flips = 0;
    for (const auto& f : r.rate_findings) {
        if (f.cls == FindingClass::Stable) {
            if (f.direction_flip) ++flips;
            continue;
        }
        if (shown >= top) continue;
        ++shown;
        std::string label = f.label();
        if (q.focal.size() > 1) label += " [" + f.focal + "]";
        if (label.size() > 40) label = label.substr(0, 37) + "...";
        const auto& a = f.adjusted;
        const std::string orci = fmt(a.mh_or.estimate, "%.2f") + " (" + fmt(a.mh_or.ci.lo, "%.2f") + "-" +
                                 fmt(a.mh_or.ci.hi, "%.2f") + ")";
        std::snprintf(line, sizeof line, "%-14s %-40s %9s %9s %9s %21s %9s %6s\n",
                      std::string(to_string(f.cls)).c_str(), label.c_str(), fmt(f.crude.rd, "%+.4f").c_str(),
                      fmt(a.mh_rd.greenland_robins.estimate, "%+.4f").c_str(),
                      fmt(a.standardized.rd, "%+.4f").c_str(), orci.c_str(), qfmt(f.q_value).c_str(),
                      fmt(f.stability.share, "%.2f").c_str());
        os << line;
    }
    const std::size_t flagged = r.rate_findings.size() - static_cast<std::size_t>(counts[4]);
    if (flagged == 0) {
        if (flips > 0)
            os << "(direction flips in " << plural(flips, "comparison", "comparisons") << ", none significant)\n";
        else
            os << "(no comparison changes under stratification)\n";
    }
    if (flagged > shown) os << "... " << flagged - shown << " more flagged (see the JSON)\n";
}

void slope_part(std::ostream& os, const ScanResult& r, std::size_t top) {
    int sc[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.slope_findings) ++sc[rank(f.cls)];
    const auto& cov = r.slope_question.covariates;
    std::string adjusted;
    for (std::size_t i = 0; i < cov.size(); ++i) adjusted += (i ? ", " : "") + cov[i];
    os << "\nSlope of " << r.slope_question.y << " on " << r.slope_question.x
       << (adjusted.empty() ? "" : " adjusted for " + adjusted) << ": " << r.slope_findings.size()
       << " checks: " << sc[0] << " reversal, " << sc[1] << " explained, " << sc[2] << " masked, " << sc[3]
       << " heterogeneous, " << sc[4] << " stable\n";
    char line[512];
    std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %9s %6s\n", "class", "strata", "pooled", "within", "q",
                  "stab.");
    os << line;
    std::size_t n = 0, flips = 0;
    for (const auto& f : r.slope_findings) {
        if (f.cls == FindingClass::Stable) {
            if (opposite_signs(shown_pooled(f), shown_within(f))) ++flips;
            continue;
        }
        if (n >= top) continue;
        ++n;
        std::string label;
        for (std::size_t i = 0; i < f.strata.size(); ++i) label += (i ? " \u00d7 " : "") + f.strata[i];
        std::snprintf(line, sizeof line, "%-14s %-40s %12s %12s %9s %6s\n",
                      std::string(to_string(f.cls)).c_str(), label.c_str(),
                      fmt(shown_pooled(f), "%+.4g").c_str(), fmt(shown_within(f), "%+.4g").c_str(),
                      qfmt(f.q_value).c_str(), f.stability.draws > 0 ? fmt(f.stability.share, "%.2f").c_str() : "-");
        os << line;
    }
    const std::size_t flagged = r.slope_findings.size() - static_cast<std::size_t>(sc[4]);
    if (flagged == 0) {
        if (flips > 0)
            os << "(slope direction flips in " << plural(flips, "check", "checks") << ", none significant)\n";
        else
            os << "(no slope changes under stratification)\n";
    }
    if (flagged > n) os << "... " << flagged - n << " more flagged (see the JSON)\n";
}

}  // namespace

std::string scan_summary_text(const ScanResult& r, const std::string& path, std::size_t top) {
    std::ostringstream os;
    const auto& q = r.question;
    os << "Scan of " << path << ": " << fmt(r.rows, "%.0f") << " rows";
    if (!r.rows_filter.empty()) os << " where " << r.rows_filter;
    os << "\n";
    if (!q.outcome.empty()) {
        os << "Outcome " << q.outcome << " = " << q.positive << "; exposure " << q.exposure << ": ";
        for (std::size_t i = 0; i < q.focal.size(); ++i) os << (i ? ", " : "") << q.focal[i];
        os << " against " << q.reference << "\n";
    }
    os << "Stratifiers (" << r.candidates.size() << "):";
    for (std::size_t i = 0; i < r.candidates.size(); ++i) os << (i ? ", " : " ") << r.candidates[i];
    os << "\n";
    if (!r.excluded.empty()) {
        os << "Left out:";
        for (std::size_t i = 0; i < r.excluded.size(); ++i)
            os << (i ? ";" : "") << " " << r.excluded[i].column << " (" << r.excluded[i].reason << ")";
        os << "\n";
    }
    if (!q.outcome.empty()) rate_part(os, r, top);
    if (!r.slope_findings.empty()) slope_part(os, r, top);
    if (r.latent) os << "\nHidden-group hint (not a finding): " << r.latent->note << "\n";
    if (r.cancelled) os << "Stopped early: the findings above are incomplete.\n";
    os << "\nA statistical screen, not a legal, lending or clinical determination: defer to local law, "
          "counsel and licensed practice.\n";
    return os.str();
}

}  // namespace foldline
