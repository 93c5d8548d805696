#include "core/report/memo_content.h"

#include "core/report/mean_memo.h"
#include "core/report/slope_chart.h"
#include "core/stats/power.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>

namespace foldline::report {

namespace {

std::string fmt(const char* f, double x) {
    char buf[64];
    std::snprintf(buf, sizeof buf, f, x);
    return buf;
}

std::string joined(const std::vector<std::string>& v, const char* sep) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? sep : "") + v[i];
    return s;
}

std::string count(double x) {
    if (!std::isfinite(x)) return "n/a";
    const std::string digits = fmt("%.0f", std::abs(x));
    std::string s = x < 0 && digits != "0" ? "-" : "";
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > 0 && (digits.size() - i) % 3 == 0) s += ',';
        s += digits[i];
    }
    return s;
}

std::string interval(double lo, double hi, std::string (*f)(double)) {
    if (!std::isfinite(lo) || !std::isfinite(hi)) return "n/a";
    return f(lo) + " to " + f(hi);
}

std::string ratio(double x) { return fixed(x, 2); }

// Interval limits in percentage points without the unit (the estimate beside them carries it).
std::string bare_points(double x) { return std::isfinite(x) ? fmt("%+.1f", 100 * x) : "n/a"; }

std::string capitalised(std::string_view s) {
    std::string out(s);
    if (!out.empty() && out[0] >= 'a' && out[0] <= 'z') out[0] = static_cast<char>(out[0] - 'a' + 'A');
    return out;
}

std::string file_name(const std::string& path) {
    const auto name = std::filesystem::path(path).filename().string();
    return name.empty() ? path : name;
}

std::string outcome_words(const Question& q) { return q.outcome + " = " + q.positive; }

std::string strata_words(const RateFinding& f) { return joined(f.strata, " × "); }

std::string comparison_words(const RateFinding& f) { return f.focal + " vs " + f.reference; }

// A finding's decision as the memo prints it; a decision applied from the family's lead says so
// (the member keeps its own record, docs/project-file.md `applied_from`).
std::string decision_words(const project::FindingReview* rv) {
    if (!rv) return "undecided";
    std::string s(to_string(rv->decision));
    if (!rv->applied_from.empty()) s += " (from the lead " + rv->applied_from + ")";
    return s;
}

const project::FindingReview* review_of(const RateFinding& f, const project::Project* p) {
    return p ? p->review(project::rate_key(f.strata, f.focal, f.reference)) : nullptr;
}

std::string answer_words(const causal::Verdict& v, const RateFinding& f) {
    switch (v.answer) {
        case causal::Answer::Stratified:
            return "the stratified view (within " + strata_words(f) + ")";
        case causal::Answer::Pooled: return "the pooled view";
        case causal::Answer::Both: return "both views (they estimate the same effect)";
        case causal::Answer::OtherSet:
            return "neither view as shown; standardise over " +
                   (v.standardise_over ? joined(*v.standardise_over, ", ") : std::string("another set"));
        case causal::Answer::NotIdentifiable:
            return "no view: the effect is not identifiable from the observed columns";
    }
    return {};
}

// A stable finding's words. When the point estimates lie on opposite sides of zero but neither
// view is significant, saying "nothing changed" would hide the flip: say it, and how many rows a
// check of this size would need (core/stats/power.h).
std::string stable_words(const RateFinding& f, double alpha) {
    const double crude = f.crude.rd, within = f.adjusted.mh_rd.greenland_robins.estimate;
    if (!(std::isfinite(crude) && std::isfinite(within) && crude * within < 0)) return "Stratifying changes little.";
    std::string s = "The point estimates flip direction (pooled " + points(crude) + ", within strata " +
                    points(within) + "), but neither view is significant at the " + fixed(alpha, 2) +
                    " level, so the data cannot tell which direction holds.";
    const double p0 = f.crude.rate_reference, p1 = p0 + within;
    const double n = stats::rows_per_group_for_power(p1, p0, alpha, 0.8);
    if (std::isfinite(n))
        s += " To detect a gap of " + points(std::abs(within)).substr(1) + " at a reference rate of " + percent(p0) +
             " with 80% power (two-sided, level " + fixed(alpha, 2) + "), a comparison needs about " +
             count(std::ceil(n)) + " rows per group (Cohen's arcsine method, equal groups); this one has " +
             count(f.crude.n_focal) + " and " + count(f.crude.n_reference) + ".";
    return s;
}

std::string lead_sentence(const RateFinding& f, const Question& q, double alpha) {
    const auto& c = f.crude;
    const auto& a = f.adjusted;
    std::string s = "Pooled, the rate of " + outcome_words(q) + " is " + percent(c.rate_focal) + " for " + f.focal +
                    " against " + percent(c.rate_reference) + " for " + f.reference + " (difference " +
                    points(c.rd) + ", 95% CI " + interval(c.rd_ci.lo, c.rd_ci.hi, points) + "). ";
    s += "Within " + strata_words(f) + " (" + std::to_string(f.informative_strata) +
         " strata with both groups), the Mantel-Haenszel difference is " +
         points(a.mh_rd.greenland_robins.estimate) + " (" +
         interval(a.mh_rd.greenland_robins.ci.lo, a.mh_rd.greenland_robins.ci.hi, points) +
         ") and the odds ratio " + ratio(a.mh_or.estimate) + " (" + interval(a.mh_or.ci.lo, a.mh_or.ci.hi, ratio) +
         ").";
    switch (f.cls) {
        case FindingClass::Reversal: s += " The direction reverses once the strata are taken into account."; break;
        case FindingClass::Explained:
            s += " The stratified view leaves no clear difference.";
            if (a.mh_rd.greenland_robins.estimate * c.rd < 0)
                s += " Its point estimate even points the other way (" + points(a.mh_rd.greenland_robins.estimate) +
                     "), though not significantly: the pooled gap does not carry over to the strata.";
            break;
        case FindingClass::Masked:
            s += " A difference hidden in the pooled view appears within strata.";
            if (a.mh_rd.greenland_robins.estimate * c.rd < 0)
                s += " The pooled point estimate points the other way (" + points(c.rd) +
                     "), though not significantly: the direction flips between the two views.";
            break;
        case FindingClass::Heterogeneous:
            s += " The strata disagree in direction, so no single adjusted figure should be quoted.";
            break;
        case FindingClass::Stable: s += " " + stable_words(f, alpha); break;
    }
    return s;
}

MemoTable figures_table(const RateFinding& f, double alpha) {
    const auto& c = f.crude;
    const auto& a = f.adjusted;
    const std::string level = fmt("%.0f%% CI", 100 * (1 - alpha));
    MemoTable t;
    t.header = {"Measure", "Estimate", level};
    t.widths = {3, 1.4, 2.2};
    t.numeric = {false, true, true};
    t.rows = {
        {"Pooled rate, " + f.focal, percent(c.rate_focal), interval(c.rate_focal_ci.lo, c.rate_focal_ci.hi, percent)},
        {"Pooled rate, " + f.reference, percent(c.rate_reference),
         interval(c.rate_reference_ci.lo, c.rate_reference_ci.hi, percent)},
        {"Pooled difference", points(c.rd), interval(c.rd_ci.lo, c.rd_ci.hi, points)},
        {"Adjusted difference (Mantel-Haenszel)", points(a.mh_rd.greenland_robins.estimate),
         interval(a.mh_rd.greenland_robins.ci.lo, a.mh_rd.greenland_robins.ci.hi, points)},
        {"Standardised gap", points(a.standardized.rd),
         interval(a.standardized.rd_ci.lo, a.standardized.rd_ci.hi, points)},
        {"Pooled odds ratio", ratio(c.odds_ratio), ""},
        {"Mantel-Haenszel odds ratio", ratio(a.mh_or.estimate), interval(a.mh_or.ci.lo, a.mh_or.ci.hi, ratio)},
        {"Mantel-Haenszel risk ratio", ratio(a.mh_rr.estimate), interval(a.mh_rr.ci.lo, a.mh_rr.ci.hi, ratio)},
        {"CMH test p", p_text(f.cmh.p), ""},
        {"Breslow-Day (Tarone) p", p_text(f.breslow_day.p_tarone), ""},
        {"Reversal q-value", p_text(f.q_value), ""},
        {"Stability (bootstrap)", std::isfinite(f.stability.share) ? percent(f.stability.share) : "not run", ""},
    };
    return t;
}

MemoTable strata_table(const RateFinding& f) {
    MemoTable t;
    t.header = {"Stratum", f.focal, f.reference, "Difference (95% CI)", "Mix " + f.focal, "Mix " + f.reference};
    t.widths = {2.5, 1.9, 1.9, 2.5, 0.9, 0.9};
    t.numeric = {false, true, true, true, true, true};
    auto cell = [](double pos, double n, double rate) {
        return count(pos) + "/" + count(n) + " (" + percent(rate) + ")";
    };
    const auto& c = f.crude;
    t.rows.push_back({"All (pooled)", cell(c.pos_focal, c.n_focal, c.rate_focal),
                      cell(c.pos_reference, c.n_reference, c.rate_reference),
                      points(c.rd) + " (" + interval(c.rd_ci.lo, c.rd_ci.hi, bare_points) + ")", "100%", "100%"});
    for (const auto& s : f.strata_table) {
        t.rows.push_back({s.level, cell(s.pos_focal, s.n_focal, s.rate_focal),
                          cell(s.pos_reference, s.n_reference, s.rate_reference),
                          s.informative ? points(s.rd) + " (" + interval(s.rd_ci.lo, s.rd_ci.hi, bare_points) + ")"
                                        : "n/a (" + s.reason + ")",
                          percent(s.share_focal), percent(s.share_reference)});
    }
    return t;
}

MemoChart chart_of(const RateFinding& f, const Question& q) {
    MemoChart ch;
    ch.title = "Rate of " + outcome_words(q) + ": pooled and by " + strata_words(f);
    ch.value_label = "rate of " + outcome_words(q);
    ch.mix_title = "How each group is spread over " + strata_words(f);
    ch.focal = f.focal;
    ch.reference = f.reference;
    const auto& c = f.crude;
    ch.points.push_back({"All (pooled)", c.rate_focal, c.rate_focal_ci.lo, c.rate_focal_ci.hi, c.rate_reference,
                         c.rate_reference_ci.lo, c.rate_reference_ci.hi, 1, 1, true});
    for (const auto& s : f.strata_table)
        ch.points.push_back({s.level, s.rate_focal, s.rate_focal_ci.lo, s.rate_focal_ci.hi, s.rate_reference,
                             s.rate_reference_ci.lo, s.rate_reference_ci.hi, s.share_focal, s.share_reference,
                             false});
    return ch;
}

MemoDiagram diagram_of(const causal::Diagram& d, const std::string& name, const causal::Verdict* v,
                       const std::vector<causal::NamedRole>& fallback_roles, const std::vector<std::string>& stratifier) {
    MemoDiagram md;
    md.name = name;
    const double n = static_cast<double>(d.nodes.size());
    for (std::size_t i = 0; i < d.nodes.size(); ++i) {
        const auto& node = d.nodes[i];
        MemoDiagramNode mn;
        mn.name = node.name;
        mn.observed = node.observed;
        if (node.x && node.y) {
            mn.x = *node.x;
            mn.y = *node.y;
        } else {
            const double angle = 2 * M_PI * static_cast<double>(i) / std::max(1.0, n);
            mn.x = 200 + 160 * std::cos(angle);
            mn.y = 160 + 120 * std::sin(angle);
        }
        if (node.name == d.exposure) mn.role = causal::Role::Exposure;
        else if (node.name == d.outcome) mn.role = causal::Role::Outcome;
        else mn.role = causal::Role::Unrelated;
        for (const auto& r : v ? v->roles : fallback_roles)
            if (r.name == node.name) mn.role = r.role;
        for (const auto& s : stratifier)
            if (s == node.name) mn.in_stratifier = true;
        md.nodes.push_back(std::move(mn));
    }
    for (const auto& e : d.edges) {
        const int a = d.find_node(e.from), b = d.find_node(e.to);
        if (a >= 0 && b >= 0) md.edges.emplace_back(a, b);
    }
    return md;
}

std::string slope(double x) { return std::isfinite(x) ? fmt("%+.4g", x) : "n/a"; }

std::string slope_interval(double lo, double hi) {
    if (!std::isfinite(lo) || !std::isfinite(hi)) return "n/a";
    return slope(lo) + " to " + slope(hi);
}

std::string slope_strata_words(const SlopeFinding& f) { return joined(f.strata, " × "); }

std::string slope_lead(const SlopeFinding& f) {
    std::string s = "Pooled, " + f.y + " changes by " + slope(f.pooled.slope) + " per unit of " + f.x + " (95% CI " +
                    slope_interval(f.pooled.ci_low, f.pooled.ci_high) + ", p " + p_text(f.pooled.p) + "); within " +
                    slope_strata_words(f) + " (" + std::to_string(f.within.strata) + " strata), by " +
                    slope(f.within.slope) + " (" + slope_interval(f.within.ci_low, f.within.ci_high) + ", p " +
                    p_text(f.within.p) + ").";
    switch (f.cls) {
        case FindingClass::Reversal: s += " The trend reverses within the strata."; break;
        case FindingClass::Explained:
            s += " Within the strata no clear trend is left.";
            if (f.pooled.slope * f.within.slope < 0) s += " The within slope even points the other way, though not significantly.";
            break;
        case FindingClass::Masked:
            s += " A trend hidden in the pooled data appears within the strata.";
            if (f.pooled.slope * f.within.slope < 0) s += " The pooled slope points the other way, though not significantly.";
            break;
        case FindingClass::Heterogeneous:
            s += " The strata's trends point in opposite directions, so no single within slope should be quoted.";
            break;
        case FindingClass::Stable:
            // Slopes of opposite signs are a flip even when neither is significant: never "little".
            s += f.pooled.slope * f.within.slope < 0
                     ? " The point estimates flip direction, but neither slope is significant, so the data cannot "
                       "tell which direction holds."
                     : " Stratifying changes little.";
            break;
    }
    if (f.linear_probability) s += " The outcome is 0/1: slopes are differences in probability per unit.";
    if (f.adjusted) s += " Slopes are adjusted for " + joined(f.covariates, ", ") + ".";
    return s;
}

MemoTable slope_figures(const SlopeFinding& f, double alpha) {
    MemoTable t;
    t.header = {"Measure", "Estimate", fmt("%.0f%% CI", 100 * (1 - alpha))};
    t.widths = {3, 1.4, 2.2};
    t.numeric = {false, true, true};
    t.rows = {
        {"Pooled slope", slope(f.pooled.slope), slope_interval(f.pooled.ci_low, f.pooled.ci_high)},
        {"Within slope (one intercept per stratum)", slope(f.within.slope),
         slope_interval(f.within.ci_low, f.within.ci_high)},
        {"Precision-weighted mean of stratum slopes", slope(f.within.precision_weighted.slope),
         slope_interval(f.within.precision_weighted.ci_low, f.within.precision_weighted.ci_high)},
        {"Pooled correlation r", fixed(f.pooled.r, 3), std::isfinite(f.pooled.r_ci_low)
                                                           ? fixed(f.pooled.r_ci_low, 3) + " to " + fixed(f.pooled.r_ci_high, 3)
                                                           : "n/a"},
    };
    if (f.adjusted) {
        t.rows.push_back({"Adjusted pooled slope", slope(f.adjusted_pooled.slope),
                          slope_interval(f.adjusted_pooled.ci_low, f.adjusted_pooled.ci_high)});
        t.rows.push_back({"Adjusted within slope", slope(f.adjusted_within.slope),
                          slope_interval(f.adjusted_within.ci_low, f.adjusted_within.ci_high)});
    }
    t.rows.push_back({"Equal slopes F-test p", p_text(f.equal_slopes.p), ""});
    t.rows.push_back({"Reversal q-value", p_text(f.q_value), ""});
    t.rows.push_back({"Stability (bootstrap)", f.stability.draws > 0 ? percent(f.stability.share) : "not run", ""});
    return t;
}

MemoTable slope_strata(const SlopeFinding& f) {
    MemoTable t;
    t.header = {"Stratum", "n", "Slope", "95% CI", "r", "Note"};
    t.widths = {2.6, 1.0, 1.3, 2.4, 0.8, 1.8};
    t.numeric = {false, true, true, true, true, false};
    t.rows.push_back({"All (pooled)", count(f.pooled.n), slope(f.pooled.slope),
                      slope_interval(f.pooled.ci_low, f.pooled.ci_high), fixed(f.pooled.r, 2), ""});
    for (const auto& g : f.groups)
        t.rows.push_back({g.level, count(g.n), slope(g.slope), slope_interval(g.ci_low, g.ci_high), fixed(g.r, 2),
                          g.informative ? "" : g.reason});
    return t;
}

/// " The estimate to quote, the ... over a, b: +6.3 pp (95% CI +4.3 pp to +8.2 pp)." — the
/// estimate an OtherSet verdict points to (computed once, core/audit/verdicts); a sentence saying
/// why when it could not be computed.
template <typename Format>
std::string estimate_sentence(const FindingVerdict& v, const char* what, Format format, double alpha) {
    const std::string over = v.verdict.standardise_over ? joined(*v.verdict.standardise_over, ", ") : std::string();
    if (!v.estimate_problem.empty())
        return " The " + std::string(what) + " over " + over + " could not be computed: " + v.estimate_problem + ".";
    if (!v.estimate)
        return " The " + std::string(what) + " over " + over + " is undefined (no stratum of that set informs it).";
    const auto& e = *v.estimate;
    return " The estimate to quote, the " + std::string(what) + " over " + over + ": " + format(e.estimate) + " (" +
           fmt("%.0f%% CI ", 100 * (1 - alpha)) + format(e.ci_low) + " to " + format(e.ci_high) + ").";
}

std::string decomposition_sentence(const RateFinding& f) {
    const auto& d = f.decomposition;
    if (!std::isfinite(d.crude_gap)) return "The pooled gap cannot be decomposed (a group has no rows).";
    return "Of the pooled gap of " + points(d.crude_gap) + ", " + points(d.within) +
           " comes from differences within the strata and " + points(d.composition) +
           " from the groups' different mix over " + strata_words(f) +
           " (Kitagawa-Das Gupta decomposition; the two parts add up exactly).";
}

std::string e_value_sentence(const RateFinding& f) {
    const auto& e = f.e_value;
    const double rr = f.adjusted.mh_rr.estimate;
    if (!std::isfinite(e.estimate)) return "No E-value: the adjusted risk ratio is undefined.";
    std::string s = "E-value " + fixed(e.estimate, 2) + " for the adjusted risk ratio of " + ratio(rr) +
                    ": an unmeasured confounder would need a risk-ratio association of at least " +
                    fixed(e.estimate, 2) + " with both " + f.focal + "/" + f.reference +
                    " membership and the outcome, beyond the strata, to explain it away";
    if (std::isfinite(e.ci_limit) && e.ci_limit <= 1.0)
        s += "; its confidence interval already includes no effect (E-value of the limit 1).";
    else if (std::isfinite(e.ci_limit))
        s += "; to move the confidence limit nearer 1 to no effect, at least " + fixed(e.ci_limit, 2) + ".";
    else
        s += ".";
    return s + " (VanderWeele & Ding 2017.)";
}

}  // namespace

std::string percent(double x) { return std::isfinite(x) ? fmt("%.1f%%", 100 * x) : "n/a"; }

std::string points(double x) {
    if (!std::isfinite(x)) return "n/a";
    std::string s = fmt("%+.1f pp", 100 * x);
    if (s == "-0.0 pp") s = "+0.0 pp";
    return s;
}

std::string fixed(double x, int digits) {
    if (!std::isfinite(x)) return "n/a";
    char f[16];
    std::snprintf(f, sizeof f, "%%.%df", digits);
    return fmt(f, x);
}

std::string p_text(double p) {
    if (!std::isfinite(p)) return "n/a";
    if (p < 0.0001) return "< 0.0001";
    if (p < 0.001) return fmt("%.4f", p);
    if (p < 0.1) return fmt("%.3f", p);
    return fmt("%.2f", p);
}

/// Rows of the exact tests a finding's small counts called for (core/scan/small_counts.h).
void add_small_count_rows(const RateFinding& f, MemoTable& t) {
    const auto& sc = f.small_counts;
    auto bound = [](double x) { return std::isfinite(x) ? ratio(x) : std::string("unbounded"); };
    if (sc.adjusted_used == AdjustedTestUsed::Exact)  // the exact MLE and interval may be 0 or unbounded
        t.rows.push_back({"Exact conditional test p (odds ratio)",
                          p_text(sc.exact.p_two_sided) + " (" + bound(sc.exact.estimate) + ")",
                          bound(sc.exact.ci.lo) + " to " + bound(sc.exact.ci.hi)});
    if (sc.homogeneity_used == HomogeneityUsed::Zelen)
        t.rows.push_back({"Homogeneity, Zelen exact p", p_text(sc.zelen.p), ""});
    else if (sc.homogeneity_used == HomogeneityUsed::NotAssessable)
        t.rows.push_back({"Homogeneity", "not assessable", ""});
}

/// Which tests decided the class and why, when counts are small; empty otherwise.
std::string small_counts_sentence(const RateFinding& f) {
    const auto& sc = f.small_counts;
    return sc.flagged() ? " Small counts: " + sc.adjusted_reason + " " + sc.homogeneity_reason : std::string();
}

namespace {
bool included(const project::FindingReview* r, FindingClass cls, const project::Project* project) {
    if (project && project->memo.findings == "chosen") return r && r->in_memo && *r->in_memo;
    if (r && r->in_memo) return *r->in_memo;
    return cls != FindingClass::Stable;
}
}  // namespace

bool included_in_memo(const RateFinding& f, const project::Project* project) {
    return included(review_of(f, project), f.cls, project);
}

bool included_in_memo(const SlopeFinding& f, const project::Project* project) {
    const auto* r = project ? project->review(project::slope_key(f.strata, f.x, f.y)) : nullptr;
    return included(r, f.cls, project);
}

std::string diagram_checks_paragraph(const causal::DiagramChecks& c) {
    if (c.checks.empty()) return {};
    const auto untestable = std::count_if(c.checks.begin(), c.checks.end(),
                                          [](const auto& k) { return k.form == causal::ClaimForm::Untestable; });
    char level[32];
    std::snprintf(level, sizeof level, "%g", c.alpha);
    std::string s = "The diagram against the data: ";
    if (c.contradicted == 0) {
        s += c.tested == 0 ? std::string("none of its claims could be tested.")
                           : "none of its " + std::to_string(c.tested) + " tested claims is contradicted (q < " +
                                 level + ").";
    } else {
        s += std::to_string(c.contradicted) + " of its " + std::to_string(c.tested) +
             " tested claims are contradicted (q < " + level + "), so the verdict may rest on a diagram that "
             "misses an arrow or a common cause.";
        int shown = 0;
        for (const auto& k : c.checks)
            if (k.contradicted && shown++ < 3) s += " " + k.sentence;
        if (c.contradicted > 3) s += " (" + std::to_string(c.contradicted - 3) + " more in the JSON.)";
    }
    if (untestable > 0)
        s += " " + std::to_string(untestable) + (untestable == 1 ? " claim rests" : " claims rest") +
             " on unobserved variables and cannot be checked.";
    return s;
}

namespace {

// The rate family leads page 1 answers: those the reviewer upheld, else those marked for follow
// up, else the flagged leads in rank order (at most `cap`).
std::vector<const RateFinding*> answered_leads(const ScanResult& r, const project::Project* p, std::size_t cap) {
    std::vector<const RateFinding*> out;
    for (const Decision want : {Decision::Upheld, Decision::FollowUp}) {
        for (const auto& f : r.rate_findings)
            if (f.family.role == FamilyRole::Lead && f.cls != FindingClass::Stable)
                if (const auto* rv = review_of(f, p); rv && rv->decision == want) out.push_back(&f);
        if (!out.empty()) break;
    }
    if (out.empty())
        for (const auto& f : r.rate_findings)
            if (f.family.role == FamilyRole::Lead && f.cls != FindingClass::Stable) out.push_back(&f);
    if (out.size() > cap) out.resize(cap);
    return out;
}

std::vector<const RateFinding*> related_to(const ScanResult& r, const RateFinding& lead) {
    std::vector<const RateFinding*> out;
    for (const auto& f : r.rate_findings)
        if (&f != &lead && f.comparison == lead.comparison && f.family.role != FamilyRole::Lead &&
            f.family_lead() == lead.label())
            out.push_back(&f);
    return out;
}

std::vector<const SlopeFinding*> related_to(const ScanResult& r, const SlopeFinding& lead) {
    std::vector<const SlopeFinding*> out;
    for (const auto& f : r.slope_findings)
        if (&f != &lead && f.family.role != FamilyRole::Lead && f.family_lead() == lead.label()) out.push_back(&f);
    return out;
}

// Two or three plain sentences a reader who is not a statistician can act on.
// Why no view is named: no diagram at all, or a draft the reviewer never confirmed (it claims
// nothing, but the reader should know it exists).
std::string no_diagram_sentence(bool draft) {
    return draft ? "The causal diagram drawn for this audit is an unconfirmed draft, so the memo does not say which "
                   "view answers the question."
                 : "No causal diagram was given, so the memo does not say which view answers the question.";
}

std::string no_diagram_verdict(bool draft, const char* views) {
    return std::string(draft ? "The causal diagram is an unconfirmed draft" : "No causal diagram was given") +
           ": whether " + views +
           " answers the question depends on how the columns cause each other, which the data alone cannot say.";
}

std::string answer_paragraph(const RateFinding& f, const Question& q, const project::Project* p,
                             std::size_t related, double alpha, bool draft_diagram) {
    const auto& c = f.crude;
    const double within = f.adjusted.mh_rd.greenland_robins.estimate;
    std::string s = capitalised(strata_words(f)) + ": taken together, " + f.focal + "'s rate of " + outcome_words(q) +
                    " is " + percent(c.rate_focal) + " against " + percent(c.rate_reference) + " for " + f.reference +
                    " (" + points(c.rd) + "); compared within each level of " + strata_words(f) + ", the gap is " +
                    points(within) + ".";
    switch (f.cls) {
        case FindingClass::Reversal:
            s += " The direction reverses: the pooled gap comes mostly from how the two groups are spread over " +
                 strata_words(f) + " (" + points(f.decomposition.composition) + " of " + points(c.rd) +
                 "), not from differences inside its levels.";
            break;
        case FindingClass::Explained:
            s += " Within the strata no clear gap remains: the pooled gap comes from the groups' different mix over " +
                 strata_words(f) + ".";
            if (within * c.rd < 0) s += " The within-strata gap even points the other way, though not clearly.";
            break;
        case FindingClass::Masked:
            s += " A gap that the pooled figure hides appears within the strata.";
            if (within * c.rd < 0) s += " The pooled gap points the other way, though not clearly: the direction flips.";
            break;
        case FindingClass::Heterogeneous:
            s += " The strata disagree in direction, so no single figure should be quoted for all of them.";
            break;
        case FindingClass::Stable: s += " " + stable_words(f, alpha); break;
    }
    if (f.verdict) s += " Under the causal diagram, the view that answers the question is " + answer_words(f.verdict->verdict, f) + ".";
    else if (!f.verdict_problem.empty()) s += " The diagram cannot say which view answers the question: " + f.verdict_problem + ".";
    else s += " " + no_diagram_sentence(draft_diagram);
    const auto* rv = review_of(f, p);
    s += " Reviewer's decision: " + decision_words(rv) + ".";
    if (related > 0)
        s += " " + std::to_string(related) + " related finding" + (related == 1 ? " repeats" : "s repeat") +
             " this story (listed in its section).";
    return s;
}

MemoTable related_table() {
    MemoTable t;
    t.header = {"Related finding", "Role", "Class", "Pooled", "Adjusted", "q", "Why it is in this family"};
    t.widths = {1.7, 0.7, 1.1, 0.8, 0.8, 0.9, 3.3};
    t.numeric = {false, false, false, true, true, true, false};
    return t;
}

}  // namespace

MemoContent build_memo(const MemoInput& in) {
    MemoContent m;
    if (!in.scan) return m;
    const ScanResult& r = *in.scan;
    const Question& q = r.question;
    const project::Project* p = in.project;

    // A database source is named by its database and table (or query), never by a path.
    const DatabaseRecord* db = in.data.database ? &*in.data.database : nullptr;
    const std::string source =
        db ? "database " + (db->database.empty() ? std::string("(unnamed)") : db->database) + ", " +
                 (db->table.empty() ? std::string("a query") : "table " + db->table)
           : file_name(in.data.path);
    m.title = p && !p->memo.title.empty() ? p->memo.title : "Audit of " + source;
    m.analyst = p ? p->memo.analyst : std::string();
    m.date = in.date;
    m.page_size = p ? p->memo.page_size : project::PageSize::A4;
    m.facts.push_back({"Data source", source});
    m.facts.push_back({"Rows", count(in.data.rows)});
    if (!r.rows_filter.empty()) {
        m.facts.push_back({"Rows to include", r.rows_filter});
        if (r.rows_kept >= 0) m.facts.push_back({"Rows kept", count(r.rows_kept)});
    }
    if (db) {
        if (!db->query.empty()) m.facts.push_back({"Query", db->query});
        m.facts.push_back({"Driver", db->driver.empty() ? "not reported" : db->driver});
        m.facts.push_back({"Queried at", db->queried_at.empty() ? "not recorded" : db->queried_at});
    } else {
        m.facts.push_back({"SHA-256", in.data.sha256.empty() ? "not computed" : in.data.sha256});
    }
    if (!m.analyst.empty()) m.facts.push_back({"Analyst", m.analyst});
    if (!m.date.empty()) m.facts.push_back({"Date", m.date});
    m.data_warning = in.data_change;
    if (r.mean_scan) {
        fill_mean_memo(m, in);  // core/report/mean_memo.h
        return m;
    }

    m.question = "Is the rate of " + outcome_words(q) + " different for " + joined(q.focal, ", ") + " than for " +
                 q.reference + " (column " + q.exposure + "), and does the answer change when the comparison is " +
                 "made within levels of another column?";
    const SlopeQuestion& sq = r.slope_question;
    const bool rates = !q.outcome.empty();
    const bool slopes = !sq.x.empty();
    const std::string trend_question = "does " + sq.y + " rise or fall with " + sq.x +
                                       ", and does the trend change when it is measured within levels of another "
                                       "column?";
    if (!rates && slopes) m.question = capitalised(trend_question);
    else if (slopes) m.question += " Also: " + trend_question;
    m.facts.push_back({"Question", m.question});

    const bool full = (in.detail.empty() ? (p ? p->memo.detail : std::string("families")) : in.detail) == "full";
    const auto answered = answered_leads(r, p, 4);
    for (const RateFinding* f : answered)
        m.answer.push_back(answer_paragraph(*f, q, p, related_to(r, *f).size(), r.alpha, in.draft_diagram));

    // Counts by class.
    int counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.rate_findings) ++counts[rank(f.cls)];
    const std::size_t flagged = r.rate_findings.size() - static_cast<std::size_t>(counts[4]);

    // Summary.
    std::string s;
    if (rates) {
    s = "Foldline compared the rate of " + outcome_words(q) + " between " +
                    joined(q.focal, ", ") + " and " + q.reference + " on " + count(in.data.rows) +
                    " rows, pooled and within each of " + std::to_string(r.candidates.size()) + " candidate columns" +
                    (r.candidates.size() > 1 && !r.rate_findings.empty() &&
                             r.rate_findings.size() > r.candidates.size() * q.focal.size()
                         ? " and their pairs"
                         : "") +
                    ": " + std::to_string(r.rate_findings.size()) + " comparisons. ";
    if (flagged == 0) {
        s += "None changes its answer under stratification beyond what chance explains at a false discovery rate "
             "of " + fixed(r.alpha, 2) + ".";
    } else {
        s += std::to_string(counts[0]) + " " + (counts[0] == 1 ? "is a reversal" : "are reversals") + ", " +
             std::to_string(counts[1]) + " explained, " + std::to_string(counts[2]) + " masked and " +
             std::to_string(counts[3]) + " heterogeneous (false discovery rate " + fixed(r.alpha, 2) + "). ";
        // The finding page 1 speaks for: upheld, then follow up, then the top-ranked.
        const RateFinding& top = answered.empty() ? r.rate_findings.front() : *answered.front();
        s += (&top == &r.rate_findings.front() ? std::string("The strongest")
                                               : std::string("The finding the reviewer's decisions point to")) +
             ", by " + strata_words(top) + ": pooled, " + top.focal + " " +
             percent(top.crude.rate_focal) + " against " + top.reference + " " + percent(top.crude.rate_reference) +
             " (" + points(top.crude.rd) + "); within " + strata_words(top) + ", " +
             points(top.adjusted.mh_rd.greenland_robins.estimate) + " (Mantel-Haenszel).";
        if (top.verdict) {
            const auto* diag_name = p && !p->diagrams.empty() ? &p->diagrams.front().name : nullptr;
            if (p && !p->active_diagram.empty()) diag_name = &p->active_diagram;
            s += " Under the causal diagram" + (diag_name && !diag_name->empty() ? " \"" + *diag_name + "\"" : "") +
                 ", the view that answers the question is " + answer_words(top.verdict->verdict, top) + ".";
        } else if (const causal::Diagram* d = p ? p->diagram() : nullptr; d && !d->nodes.empty()) {
            // The verdict code's own sentence (core/causal/missing_columns for absent columns).
            s += " The causal diagram cannot judge the strongest finding: " +
                 (top.verdict_problem.empty() ? std::string("no verdict was computed") : top.verdict_problem) + ".";
        } else {
            s += " " + no_diagram_sentence(in.draft_diagram);
        }
    }
    }
    int slope_counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.slope_findings) ++slope_counts[rank(f.cls)];
    const std::size_t slope_flagged = r.slope_findings.size() - static_cast<std::size_t>(slope_counts[4]);
    if (slopes) {
        s += (s.empty() ? "" : " ") + std::string("Foldline measured the trend of ") + sq.y + " on " + sq.x + " on " +
             count(in.data.rows) + " rows, pooled and within candidate columns: " +
             std::to_string(r.slope_findings.size()) + " checks, " + std::to_string(slope_counts[0]) + " reversal, " +
             std::to_string(slope_counts[1]) + " explained, " + std::to_string(slope_counts[2]) + " masked, " +
             std::to_string(slope_counts[3]) + " heterogeneous.";
        if (slope_flagged > 0) {
            const SlopeFinding& top = r.slope_findings.front();
            s += " The strongest, by " + slope_strata_words(top) + ": pooled slope " + slope(top.pooled.slope) +
                 ", within " + slope(top.within.slope) + ".";
        }
    }
    // The hidden-group hint, when the audit asked for it: labelled as a hint, never a finding.
    if (r.latent) s += (s.empty() ? "" : " ") + std::string("Hidden-group hint (not a finding): ") + r.latent->note;
    m.summary = s;

    // Findings table: every flagged finding, or all of them when none is flagged.
    m.findings.header = {"#", "Class", "Strata", "Comparison", "Pooled", "Adjusted", "q", "Stability", "Decision"};
    m.findings.widths = {0.45, 1.55, 2.0, 1.3, 1.0, 1.0, 1.05, 0.95, 1.0};
    m.findings.numeric = {true, false, false, false, true, true, true, true, false};
    std::vector<std::size_t> section_of;
    std::size_t listed = 0;
    for (std::size_t i = 0; i < r.rate_findings.size(); ++i) {
        const auto& f = r.rate_findings[i];
        if (flagged > 0 && f.cls == FindingClass::Stable && !included_in_memo(f, p)) continue;
        ++listed;
        const auto* rv = review_of(f, p);
        m.findings.rows.push_back({std::to_string(i + 1), std::string(to_string(f.cls)), strata_words(f),
                                   comparison_words(f), points(f.crude.rd),
                                   points(f.adjusted.mh_rd.greenland_robins.estimate), p_text(f.q_value),
                                   std::isfinite(f.stability.share) ? percent(f.stability.share) : "-",
                                   decision_words(rv)});
        if (included_in_memo(f, p) && (full || f.family.role == FamilyRole::Lead)) section_of.push_back(i);
    }
    std::vector<std::size_t> slope_section_of;
    for (std::size_t i = 0; i < r.slope_findings.size(); ++i) {
        const auto& f = r.slope_findings[i];
        if (slope_flagged > 0 && f.cls == FindingClass::Stable && !included_in_memo(f, p)) continue;
        if (slope_flagged == 0 && flagged > 0) continue;
        ++listed;
        const auto* rv = p ? p->review(project::slope_key(f.strata, f.x, f.y)) : nullptr;
        m.findings.rows.push_back({"s" + std::to_string(i + 1), std::string(to_string(f.cls)),
                                   slope_strata_words(f), f.y + " on " + f.x, slope(f.pooled.slope),
                                   slope(f.within.slope), p_text(f.q_value),
                                   f.stability.draws > 0 ? percent(f.stability.share) : "-",
                                   decision_words(rv)});
        if (included_in_memo(f, p) && (full || f.family.role == FamilyRole::Lead)) slope_section_of.push_back(i);
    }
    const std::size_t with_section = std::min(section_of.size(), in.max_sections);
    const std::size_t slope_with_section =
        std::min(slope_section_of.size(), in.max_sections > with_section ? in.max_sections - with_section : 0);
    const std::size_t total_findings = r.rate_findings.size() + r.slope_findings.size();
    const std::size_t total_chosen = section_of.size() + slope_section_of.size();
    const std::size_t total_sections = with_section + slope_with_section;
    m.findings_note = "Listed: " + std::to_string(listed) + " of " + std::to_string(total_findings) +
                      " checks (" + (flagged + slope_flagged > 0 ? "those not stable" : "none is flagged, so all") +
                      "); # is the rank in the scan (s: a slope check); q is the reversal test's false-discovery "
                      "q-value, whatever the class." +
                      (rates ? " Rate differences in percentage points, " + q.focal.front() +
                                   (q.focal.size() > 1 ? " etc." : "") + " minus " + q.reference + "."
                             : std::string()) +
                      (slopes ? " Slopes in units of " + sq.y + " per unit of " + sq.x + "; adjusted = within strata."
                              : std::string()) +
                      " " + std::to_string(total_sections) + " finding" + (total_sections == 1 ? " has" : "s have") +
                      " a section below" +
                      (full ? std::string() : std::string(" (one per family: a family's related findings are listed "
                                                          "in its lead's section)")) +
                      (total_chosen > total_sections
                           ? "; " + std::to_string(total_chosen - total_sections) +
                                 " more chosen findings are in the table only (see the JSON or CSV export)."
                           : ".");

    // Sections.
    const causal::Diagram* diagram = p ? p->diagram() : nullptr;
    std::string diagram_name;
    if (p && diagram)
        for (const auto& d : p->diagrams)
            if (&d.diagram == diagram) diagram_name = d.name;
    // Roles for the question, used where a finding has no verdict of its own.
    std::vector<causal::NamedRole> question_roles;
    std::optional<causal::CausalGraph> graph;
    if (diagram) {
        if (auto cg = causal::CausalGraph::build(*diagram)) {
            graph = std::move(*cg);
            if (auto rep = causal::analyse_adjustment(*graph, q.exposure, q.outcome)) question_roles = rep->roles;
        }
    }
    // Numeric columns of a set the diagram names are cut as the scan cut its candidates.
    const int bins = p ? p->scan.bins : 4;
    const std::size_t max_levels = p ? static_cast<std::size_t>(p->scan.max_levels) : 50;
    for (std::size_t k = 0; k < with_section; ++k) {
        const std::size_t i = section_of[k];
        const auto& f = r.rate_findings[i];
        MemoSection sec;
        sec.finding_class = std::string(to_string(f.cls));
        sec.heading = std::to_string(k + 1) + ". " + capitalised(to_string(f.cls)) + ": " + strata_words(f) + " (" +
                      comparison_words(f) + ")";
        sec.lead = lead_sentence(f, q, r.alpha) + small_counts_sentence(f);
        sec.figures = figures_table(f, r.alpha);
        add_small_count_rows(f, sec.figures);
        sec.strata = strata_table(f);
        sec.chart = chart_of(f, q);
        const causal::Verdict* v = f.verdict ? &f.verdict->verdict : nullptr;
        if (diagram) sec.diagram = diagram_of(*diagram, diagram_name, v, question_roles, f.strata);
        if (v) {
            sec.verdict = "Which view answers the question: " + answer_words(*v, f) + ". " + v->reason;
            if (v->answer == causal::Answer::OtherSet && v->standardise_over)
                sec.verdict += estimate_sentence(*f.verdict, "difference standardised", points, r.alpha);
        } else if (diagram) {
            const std::string why = f.verdict_problem.empty() ? "no verdict was computed" : f.verdict_problem;
            sec.verdict = "The diagram cannot judge this finding: " + why + ".";
        } else {
            sec.verdict = no_diagram_verdict(in.draft_diagram, "the pooled or the stratified view");
        }
        // The diagram's claims are the memo's, not the finding's: stated once, in the first section.
        if (r.diagram_checks && k == 0) sec.diagram_checks = diagram_checks_paragraph(*r.diagram_checks);
        sec.compact = !full && std::find(answered.begin(), answered.end(), &f) == answered.end();
        sec.decomposition = decomposition_sentence(f);
        sec.e_value = e_value_sentence(f);
        const auto* rv = review_of(f, p);
        sec.decision = "Reviewer's decision: " + decision_words(rv) + ".";
        if (rv) sec.note = rv->note;
        if (!full) {
            for (const RateFinding* g : related_to(r, f)) {
                if (sec.related.header.empty()) sec.related = related_table();
                sec.related.rows.push_back({strata_words(*g), std::string(to_string(g->family.role)),
                                            std::string(to_string(g->cls)), points(g->crude.rd),
                                            points(g->adjusted.mh_rd.greenland_robins.estimate), p_text(g->q_value),
                                            g->family.reason});
            }
        }
        m.sections.push_back(std::move(sec));
    }

    if (std::any_of(m.sections.begin(), m.sections.end(), [](const MemoSection& s) { return s.compact; }))
        m.findings_note += " Sections of leads the answer above does not speak for give the figures and tables only; "
                           "their charts and diagram are in the memo with one section per finding (memo detail "
                           "\"full\").";

    for (std::size_t k = 0; k < slope_with_section; ++k) {
        const auto& f = r.slope_findings[slope_section_of[k]];
        MemoSection sec;
        sec.finding_class = std::string(to_string(f.cls));
        sec.heading = std::to_string(with_section + k + 1) + ". " + capitalised(to_string(f.cls)) +
                      ": " + slope_strata_words(f) + " (" + f.y + " on " + f.x + ")";
        sec.lead = slope_lead(f);
        sec.figures = slope_figures(f, r.alpha);
        sec.strata = slope_strata(f);
        if (in.table) sec.scatter = slope_chart(*in.table, f, bins, max_levels);
        const causal::Verdict* v = f.verdict ? &f.verdict->verdict : nullptr;
        const std::string& why = f.verdict_problem;
        if (diagram) {
            std::vector<causal::NamedRole> roles;
            if (graph)
                if (auto rep = causal::analyse_adjustment(*graph, f.x, f.y)) roles = rep->roles;
            sec.diagram = diagram_of(*diagram, diagram_name, v, roles, f.strata);
        }
        if (v) {
            const std::string answer = v->answer == causal::Answer::Stratified
                                           ? "the within-strata slope (by " + slope_strata_words(f) + ")"
                                       : v->answer == causal::Answer::Pooled ? "the pooled slope"
                                       : v->answer == causal::Answer::Both   ? "both slopes (they estimate the same effect)"
                                                                             : "neither slope as shown";
            sec.verdict = "Which view answers the question: " + answer + ". " + v->reason;
            if (v->answer == causal::Answer::OtherSet && v->standardise_over)
                sec.verdict += estimate_sentence(*f.verdict, "within slope", slope, sq.alpha);
        } else if (diagram) {
            sec.verdict = "The diagram cannot judge this finding: " + (why.empty() ? "the diagram is not valid" : why) + ".";
        } else {
            sec.verdict = no_diagram_verdict(in.draft_diagram, "the pooled or the within-strata trend");
        }
        if (r.diagram_checks && with_section + k == 0) sec.diagram_checks = diagram_checks_paragraph(*r.diagram_checks);
        const auto* rv = p ? p->review(project::slope_key(f.strata, f.x, f.y)) : nullptr;
        sec.decision = "Reviewer's decision: " + decision_words(rv) + ".";
        if (rv) sec.note = rv->note;
        if (!full) {
            for (const SlopeFinding* g : related_to(r, f)) {
                if (sec.related.header.empty()) sec.related = related_table();
                sec.related.rows.push_back({slope_strata_words(*g), std::string(to_string(g->family.role)),
                                            std::string(to_string(g->cls)), slope(g->pooled.slope),
                                            slope(g->within.slope), p_text(g->q_value), g->family.reason});
            }
        }
        m.sections.push_back(std::move(sec));
    }

    // Appendix: every check, so every figure of a per-finding memo stays findable. Compact: one
    // line a check where it fits, units in the header, the comparison named once when it is one.
    bool one_comparison = r.slope_findings.empty();
    for (const auto& f : r.rate_findings)
        if (comparison_words(f) != comparison_words(r.rate_findings.front())) one_comparison = false;
    auto family_words = [](const auto& f) {
        return f.family.role == FamilyRole::Lead ? std::string("lead")
                                                 : std::string(to_string(f.family.role)) + " of " + f.family_lead();
    };
    auto bare_interval = [](double lo, double hi, std::string (*f)(double)) {
        return "[" + f(lo) + ", " + f(hi) + "]";
    };
    const std::string level = fmt("%.0f%%", 100 * (1 - r.alpha));
    const bool rate_units = rates && !slopes;
    m.appendix.header = {"#", "Class", "Strata", "Comparison",
                         std::string(rate_units ? "Pooled, pp" : "Pooled") + " [" + level + " CI]",
                         std::string(rate_units ? "Adjusted, pp" : "Adjusted") + " [" + level + " CI]",
                         "MH odds ratio [" + level + " CI]", "q", "Family"};
    m.appendix.widths = {0.45, 1.45, 2.1, 1.0, 1.85, 1.85, 1.65, 0.95, 1.6};
    m.appendix.numeric = {true, false, false, false, true, true, true, true, false};
    const auto rate_number = rate_units ? bare_points : points;
    for (std::size_t i = 0; i < r.rate_findings.size(); ++i) {
        const auto& f = r.rate_findings[i];
        const auto& gr = f.adjusted.mh_rd.greenland_robins;
        m.appendix.rows.push_back(
            {std::to_string(i + 1), std::string(to_string(f.cls)), strata_words(f), comparison_words(f),
             rate_number(f.crude.rd) + " " + bare_interval(f.crude.rd_ci.lo, f.crude.rd_ci.hi, rate_number),
             rate_number(gr.estimate) + " " + bare_interval(gr.ci.lo, gr.ci.hi, rate_number),
             ratio(f.adjusted.mh_or.estimate) + " " +
                 bare_interval(f.adjusted.mh_or.ci.lo, f.adjusted.mh_or.ci.hi, ratio),
             p_text(f.q_value), family_words(f)});
    }
    for (std::size_t i = 0; i < r.slope_findings.size(); ++i) {
        const auto& f = r.slope_findings[i];
        m.appendix.rows.push_back({"s" + std::to_string(i + 1), std::string(to_string(f.cls)), slope_strata_words(f),
                                   f.y + " on " + f.x,
                                   slope(f.pooled.slope) + " " + bare_interval(f.pooled.ci_low, f.pooled.ci_high, slope),
                                   slope(f.within.slope) + " " + bare_interval(f.within.ci_low, f.within.ci_high, slope),
                                   "-", p_text(f.q_value), family_words(f)});
    }
    if (one_comparison && !r.rate_findings.empty()) {
        const std::size_t c = 3;
        m.appendix.header.erase(m.appendix.header.begin() + c);
        m.appendix.widths.erase(m.appendix.widths.begin() + c);
        m.appendix.numeric.erase(m.appendix.numeric.begin() + c);
        for (auto& row : m.appendix.rows) row.erase(row.begin() + c);
    }
    m.appendix_note =
        "Every check of the scan in rank order (families kept together)" +
        (one_comparison && !r.rate_findings.empty() ? ", each comparing " + comparison_words(r.rate_findings.front())
                                                    : std::string()) +
        ". Pooled and adjusted: rate differences in percentage points (adjusted: Mantel-Haenszel) or slopes (pooled "
        "and within strata). Per-stratum counts of every check are in the JSON and CSV export. A member adds nothing beyond its "
        "lead (its adjusted estimate lies inside the lead's interval and a test of further stratifying does not "
        "reject after Benjamini-Hochberg); a proxy carries nearly the same information as its lead (nested levels, "
        "or Cramér's V of at least 0.7, a common-practice threshold).";

    // Method notes: enough to reproduce; the rate estimators only when rates were compared.
    std::vector<std::string> rate_notes = {
        "Rates carry Wilson score intervals (Wilson 1927); differences of two rates, Newcombe's hybrid score "
        "interval (Newcombe 1998, method 10).",
        "Adjusted figures: \"Adjusted\" always means Mantel-Haenszel: the odds ratio with the Robins-Breslow-Greenland "
        "interval, the risk ratio and risk difference with Greenland-Robins intervals (Sato's standard error reported "
        "in the exports). The \"Standardised gap\" is the difference directly standardised to the pooled stratum mix "
        "(the back-door adjustment over the strata); a diagram's verdict quotes it. Rate gaps are in percentage points.",
        "Tests: Cochran-Mantel-Haenszel (uncorrected), Breslow-Day homogeneity with Tarone's correction. A "
        "reversal needs the pooled and the adjusted effect significant on opposite sides (intersection-union "
        "test); its p-values are corrected with Benjamini-Hochberg over all " +
            std::to_string(r.rate_findings.size()) + " comparisons at a false discovery rate of " +
            fixed(r.alpha, 2) + "; intervals are " + fmt("%.0f%%", 100 * (1 - r.alpha)) + ".",
        "Small counts: where the Mantel-Fleiss criterion fails (distance of the expected focal events from their "
        "bounds below 5) the class uses the exact conditional test of a common odds ratio of 1; where more than "
        "20% of the Breslow-Day fitted cells are below 5 (common practice) Zelen's exact test of homogeneity "
        "decides, or homogeneity is not assessable with these counts.",
        r.bootstrap > 0 ? "Stability: share of " + std::to_string(r.bootstrap) +
                              " multinomial bootstrap resamples of each flagged finding's count table that keep its "
                              "class; seed " + std::to_string(r.seed) + "."
                        : "Stability: not computed (bootstrap off).",
    };
    m.method_notes = rates ? rate_notes : std::vector<std::string>{};
    if (slopes)
        m.method_notes.push_back(
            "Trends: ordinary least squares slope of " + sq.y + " on " + sq.x +
            ", pooled and with one intercept per stratum (fixed effects); Student t intervals; the F-test of equal "
            "slopes; a reversal needs both slopes significant on opposite sides (intersection-union test); its "
            "p-values are corrected with Benjamini-Hochberg over all " +
            std::to_string(r.rate_findings.size() + r.slope_findings.size()) +
            " checks at a false discovery rate of " + fixed(r.alpha, 2) + "." +
            (sq.covariates.empty() ? std::string()
                                   : " Pooled and within slopes are adjusted for " + joined(sq.covariates, ", ") +
                                         " (multiple regression); the stratum slopes are not.") +
            (sq.bootstrap > 0 ? " Stability from " + std::to_string(sq.bootstrap) + " resamples, seed " +
                                    std::to_string(sq.seed) + "."
                              : ""));
    const std::vector<std::string> common_notes = {
        "Candidate columns: " + (r.candidates.empty() ? std::string("none") : joined(r.candidates, ", ")) + "." +
            (r.excluded.empty() ? std::string()
                                : " Left out: " + [&] {
                                      std::string e;
                                      for (std::size_t i = 0; i < r.excluded.size(); ++i)
                                          e += (i ? "; " : "") + r.excluded[i].column + " (" +
                                               r.excluded[i].reason + ")";
                                      return e;
                                  }() + "."),
        std::string(rates ? "Decomposition of the pooled gap: Kitagawa (1955) in the symmetric form of Das Gupta "
                            "(1993). E-values: VanderWeele & Ding (2017). "
                          : "") +
            "Which view answers the question: the adjustment criterion on the reviewer's causal diagram (Pearl's "
            "back-door criterion, generalised by Shpitser, VanderWeele & Robins 2010).",
        db ? "Data: " + source + ", counted inside the database (" + (db->driver.empty() ? "ODBC" : db->driver) +
                 ") at " + (db->queried_at.empty() ? std::string("an unrecorded time") : db->queried_at) +
                 "; only per-stratum counts and sums left the engine."
           : "Data: " + source + ", SHA-256 " + (in.data.sha256.empty() ? std::string("not computed") : in.data.sha256) +
                 ". The audit re-runs from its project file with `foldline run PROJECT`.",
    };
    m.method_notes.insert(m.method_notes.end(), common_notes.begin(), common_notes.end());
    if (r.cancelled) m.method_notes.push_back("The scan was stopped early: the findings are incomplete.");
    m.caution = kMemoCaution;
    return m;
}

}  // namespace foldline::report
