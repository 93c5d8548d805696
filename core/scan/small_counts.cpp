#include "core/scan/small_counts.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>

namespace foldline {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string num(double x, const char* fmt = "%.3g") {
    char buf[64];
    std::snprintf(buf, sizeof buf, fmt, x);
    return buf;
}

std::string exact_not_run(const stats::ExactCommonOr& e, const SmallCountOptions& opt) {
    switch (e.status) {
        case stats::ExactStatus::NotWholeCounts: return "the counts are weighted (not whole numbers)";
        case stats::ExactStatus::NoInformation: return "no stratum lets the focal events vary";
        case stats::ExactStatus::TooLarge:
            return "its support (" + num(e.support, "%.0f") + " values) or convolution (" + num(e.work, "%.3g") +
                   " steps) is above the limits (" + num(opt.limits.max_support, "%.0f") + ", " +
                   num(opt.limits.max_convolution_work, "%.3g") + ")";
        case stats::ExactStatus::Computed: break;
    }
    return "";
}

}  // namespace

std::string_view to_string(AdjustedTestUsed u) { return u == AdjustedTestUsed::Exact ? "exact" : "cmh"; }

std::string_view to_string(HomogeneityUsed u) {
    switch (u) {
        case HomogeneityUsed::BreslowDay: return "breslow_day";
        case HomogeneityUsed::Zelen: return "zelen";
        case HomogeneityUsed::NotAssessable: return "not_assessable";
    }
    return "breslow_day";
}

MantelFleiss mantel_fleiss(const stats::Strata& strata, double min_distance) {
    MantelFleiss m;
    for (const auto& s : strata) {
        const double n1 = s.n_focal(), n0 = s.n_reference(), m1 = s.a + s.c, N = s.total();
        if (N <= 0) continue;
        m.expected += n1 * m1 / N;
        m.lower += std::max(0.0, m1 - n0);
        m.upper += std::min(n1, m1);
    }
    m.distance = std::min(m.expected - m.lower, m.upper - m.expected);
    m.satisfied = !strata.empty() && m.distance >= min_distance;
    return m;
}

BreslowDayValidity breslow_day_validity(const stats::Strata& strata, double psi, const SmallCountOptions& opt) {
    BreslowDayValidity v;
    const bool ok = psi > 0 && std::isfinite(psi);
    for (const auto& s : strata) {
        const double e = stats::common_or_fitted_a(s, psi);
        if (std::isnan(e)) continue;
        const double n1 = s.n_focal(), m1 = s.a + s.c, N = s.total();
        for (double cell : {e, n1 - e, m1 - e, N - n1 - m1 + e}) {
            ++v.fitted_cells;
            if (cell < opt.min_fitted) ++v.small_cells;
        }
    }
    v.small_share = v.fitted_cells ? double(v.small_cells) / double(v.fitted_cells) : 0.0;
    v.trusted = ok && v.fitted_cells > 0 && v.small_share <= opt.max_small_share;
    return v;
}

SmallCounts assess_small_counts(const stats::Strata& strata, double psi, double alpha, bool full,
                                bool need_homogeneity, const SmallCountOptions& opt) {
    SmallCounts sc;
    sc.mantel_fleiss = mantel_fleiss(strata, opt.min_distance);
    const auto& mf = sc.mantel_fleiss;
    const std::string mf_text = "Mantel-Fleiss distance " + num(mf.distance);
    if (mf.satisfied) {
        sc.adjusted_reason = mf_text + " >= " + num(opt.min_distance) + ": the CMH chi-square is used.";
    } else {
        sc.exact_run = true;
        sc.exact = stats::exact_common_odds_ratio(strata, alpha, opt.limits, full);
        if (sc.exact.status == stats::ExactStatus::Computed) {
            sc.adjusted_used = AdjustedTestUsed::Exact;
            sc.adjusted_reason = mf_text + " < " + num(opt.min_distance) +
                                 ": the CMH chi-square is not reliable; the exact conditional test decides (p " +
                                 num(sc.exact.p_two_sided, "%.4g") + ").";
        } else {
            sc.adjusted_reason = mf_text + " < " + num(opt.min_distance) + ", but the exact test was not run: " +
                                 exact_not_run(sc.exact, opt) + "; the CMH p stands, read it with caution.";
        }
        if (full) {
            sc.fisher.reserve(strata.size());
            for (const auto& s : strata) sc.fisher.push_back(stats::fisher_exact(s, alpha, opt.limits));
        }
    }

    sc.breslow_day = breslow_day_validity(strata, psi, opt);
    const auto& bd = sc.breslow_day;
    const std::string bd_text = "Breslow-Day fitted cells below " + num(opt.min_fitted) + ": " +
                                std::to_string(bd.small_cells) + " of " + std::to_string(bd.fitted_cells) + " (" +
                                num(100 * bd.small_share, "%.0f") + "%)";
    if (bd.trusted) {
        sc.homogeneity_reason = bd_text + ", at most " + num(100 * opt.max_small_share, "%.0f") +
                                "%: the Breslow-Day test is used.";
        return sc;
    }
    if (!need_homogeneity) {
        sc.homogeneity_used = HomogeneityUsed::NotAssessable;
        sc.homogeneity_reason = bd_text + ": Zelen's exact test was not needed.";
        return sc;
    }
    sc.zelen_run = true;
    sc.zelen = stats::zelen_exact(strata, opt.max_tables, opt.max_count_work);
    if (sc.zelen.status == stats::HomogeneityStatus::Computed) {
        sc.homogeneity_used = HomogeneityUsed::Zelen;
        sc.homogeneity_reason = bd_text + ": the Breslow-Day test is not reliable; Zelen's exact test decides (p " +
                                num(sc.zelen.p, "%.4g") + ").";
    } else {
        sc.homogeneity_used = HomogeneityUsed::NotAssessable;
        std::string why;
        switch (sc.zelen.status) {
            case stats::HomogeneityStatus::TooManyTables:
                why = num(sc.zelen.tables) + " tables share the observed total, above the limit of " + num(opt.max_tables);
                break;
            case stats::HomogeneityStatus::NotWholeCounts: why = "the counts are weighted (not whole numbers)"; break;
            case stats::HomogeneityStatus::TooLarge:
                why = "counting the tables that share the observed total would take over " + num(opt.max_count_work) +
                      " steps";
                break;
            default: why = "fewer than two strata in which the focal events can vary"; break;
        }
        sc.homogeneity_reason = bd_text + ": the Breslow-Day test is not reliable and Zelen's exact test was not run (" +
                                why + "): homogeneity is not assessable with these counts.";
    }
    return sc;
}

void use_small_counts(const SmallCounts& sc, double p_breslow_day, ClassInputs& in) {
    if (sc.adjusted_used == AdjustedTestUsed::Exact) {
        in.adjusted_p_exact = sc.exact.p_two_sided;
        in.adjusted_p_exact_greater = sc.exact.p_greater;
        in.adjusted_p_exact_less = sc.exact.p_less;
    }
    switch (sc.homogeneity_used) {
        case HomogeneityUsed::BreslowDay: in.p_homogeneity = p_breslow_day; break;
        case HomogeneityUsed::Zelen: in.p_homogeneity = sc.zelen.p; break;
        case HomogeneityUsed::NotAssessable: in.p_homogeneity = kNaN; break;
    }
}

}  // namespace foldline
