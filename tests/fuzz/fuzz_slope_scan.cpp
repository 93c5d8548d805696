// libFuzzer target: the slope scan (core/scan/slope_scan.h) on a small random numeric table.
// Byte 0 chooses the shape of the values (small integers with many ties, a huge common offset,
// tiny or large magnitudes), pre-counted weights, a covariate, bootstrap stability and the
// hidden-group hint; byte 1 the row count (2..64); then 6 bytes per row: x, y, covariate, two
// stratifier codes and a weight. A byte of 255 in x, y or the covariate is a missing cell.
// Every figure of every finding must be finite or NaN (undefined), every p- and q-value in
// [0, 1] or NaN, and a finding whose pooled or within slope is undefined is never a reversal.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <string>
#include <vector>

#include "core/audit/run_audit.h"
#include "core/scan/slope_scan.h"

using namespace foldline;

namespace {

void finite_or_nan(double x) {
    if (std::isinf(x)) std::abort();
}

void probability_or_nan(double p) {
    if (!std::isnan(p) && (p < 0 || p > 1)) std::abort();
}

void check_estimate(const SlopeEstimate& e) {
    for (double v : {e.slope, e.se, e.ci_low, e.ci_high, e.df, e.p}) finite_or_nan(v);
    probability_or_nan(e.p);
}

void check_finding(const SlopeFinding& f) {
    const PooledSlope& p = f.pooled;
    for (double v : {p.slope, p.ci_low, p.ci_high, p.se, p.p, p.df, p.se_robust, p.r, p.r_ci_low,
                     p.r_ci_high, p.n})
        finite_or_nan(v);
    probability_or_nan(p.p);
    if (!std::isnan(p.r) && (p.r < -1 || p.r > 1)) std::abort();
    const WithinSlope& w = f.within;
    for (double v : {w.slope, w.ci_low, w.ci_high, w.se, w.p, w.df, w.precision_weighted.slope,
                     w.precision_weighted.se, w.precision_weighted.ci_low,
                     w.precision_weighted.ci_high})
        finite_or_nan(v);
    probability_or_nan(w.p);
    check_estimate(f.adjusted_pooled);
    check_estimate(f.adjusted_within);
    for (double v : {f.equal_slopes.f, f.equal_slopes.df1, f.equal_slopes.df2, f.equal_slopes.p})
        finite_or_nan(v);
    probability_or_nan(f.equal_slopes.p);
    finite_or_nan(f.p_reversal);
    probability_or_nan(f.p_reversal);
    probability_or_nan(f.q_value);
    if (f.stability.share < 0 || f.stability.share > 1) std::abort();
    for (const SlopeGroup& g : f.groups) {
        for (double v : {g.n, g.rows, g.slope, g.se, g.ci_low, g.ci_high, g.p, g.r}) finite_or_nan(v);
        probability_or_nan(g.p);
    }
    if (f.reversal || f.cls == FindingClass::Reversal) {
        const double pooled = f.adjusted ? f.adjusted_pooled.slope : f.pooled.slope;
        const double within = f.adjusted ? f.adjusted_within.slope : f.within.slope;
        if (std::isnan(pooled) || std::isnan(within) || std::isnan(f.p_reversal)) std::abort();
        if ((pooled > 0) == (within > 0)) std::abort();  // a reversal has opposite signs
    }
}

double value(std::uint8_t b, std::uint8_t shape) {
    if (b == 255) return std::numeric_limits<double>::quiet_NaN();
    switch (shape % 5) {
        case 0: return b % 8;                              // many ties, often constant
        case 1: return 1e9 + (b % 16);                     // huge common offset
        case 2: return (b - 127) * 1e-9;                   // tiny values
        case 3: return (b - 127) * 1e12;                   // large values
        default: return static_cast<double>(b) - 127.0;   // plain spread
    }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size < 2) return 0;
    const std::uint8_t flags = data[0];
    const std::size_t rows = 2 + data[1] % 63;
    if (size < 2 + 6 * rows) return 0;
    const bool weighted = flags & 8, covariate = flags & 16;

    std::vector<double> x(rows), y(rows), c(rows), w;
    std::vector<std::uint32_t> s1(rows), s2(rows);
    for (std::size_t i = 0; i < rows; ++i) {
        const std::uint8_t* r = data + 2 + 6 * i;
        x[i] = value(r[0], flags);
        y[i] = (flags & 64) ? (r[1] == 255 ? std::nan("") : r[1] % 2) : value(r[1], flags);
        c[i] = value(r[2], flags >> 3);
        s1[i] = r[3] % 4;  // 3 == missing (levels.size())
        s2[i] = r[4] % 3;  // 2 == missing
        if (weighted) w.push_back(r[5] % 4 == 0 ? 0.0 : (r[5] % 4 == 1 ? 0.5 : r[5] / 3.0));
    }
    Table t;
    t.rows = rows;
    t.columns.push_back(Column::numeric("x", x));
    t.columns.push_back(Column::numeric("y", y));
    t.columns.push_back(Column::numeric("c", c));
    t.columns.push_back(Column::categorical("s1", {"a", "b", "c"}, s1));
    t.columns.push_back(Column::categorical("s2", {"u", "v"}, s2));
    t.weights = w;
    if (weighted) t.weight_column = "n";

    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    if (covariate) q.covariates = {"c"};
    q.bootstrap = (flags & 32) ? 8 : 0;
    q.seed = flags;

    const Column* a = t.column("s1");
    const Column* b = t.column("s2");
    for (const std::vector<const Column*>& strata :
         {std::vector<const Column*>{a}, std::vector<const Column*>{a, b}}) {
        auto f = check_slope(t, q, strata);
        if (!f.ok()) {
            if (f.error().message.empty()) std::abort();
            continue;
        }
        if (!std::isnan(f->q_value)) std::abort();  // documented: NaN until apply_fdr
        check_finding(*f);
    }

    // The whole slope question through the audit service, as `foldline scan` runs it.
    project::AuditSpec spec;
    spec.question.kind = project::QuestionKind::Slope;
    spec.question.outcome = q.y;
    spec.question.exposure = q.x;
    spec.question.covariates = q.covariates;
    spec.scan.slope_bootstrap = q.bootstrap;
    spec.scan.seed = q.seed;
    spec.scan.find_groups = (flags & 128) != 0;
    auto scan = audit::scan_table(t, spec);
    if (!scan.ok()) {
        if (scan.error().message.empty()) std::abort();
        return 0;
    }
    for (const SlopeFinding& f : scan->slope_findings) check_finding(f);
    if (scan->latent) {
        for (double b2 : scan->latent->bic) finite_or_nan(b2);
        for (const LatentComponent& k : scan->latent->components)
            for (double v : {k.weight, k.n, k.mean_x, k.mean_y, k.sd_x, k.sd_y, k.correlation, k.slope})
                finite_or_nan(v);
    }
    return 0;
}
