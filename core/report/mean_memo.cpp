#include "core/report/mean_memo.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "core/report/mean_summary.h"

namespace foldline::report {
namespace {

std::string fmt(const char* f, double x) {
    if (!std::isfinite(x)) return "n/a";
    char buf[64];
    std::snprintf(buf, sizeof buf, f, x);
    return buf;
}

std::string joined(const std::vector<std::string>& v, const char* sep) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? sep : "") + v[i];
    return s;
}

std::string capitalised(std::string s) {
    if (!s.empty() && s[0] >= 'a' && s[0] <= 'z') s[0] = static_cast<char>(s[0] - 'a' + 'A');
    return s;
}

std::string value(double x) { return fmt("%.6g", x); }
std::string diff(double x) { return fmt("%+.5g", x); }
std::string ci(double lo, double hi) { return "(" + fmt("%.5g", lo) + " to " + fmt("%.5g", hi) + ")"; }
std::string pct(double x) { return fmt("%+.1f%%", 100 * x); }
std::string count(double x) { return fmt("%.0f", x); }

const project::FindingReview* review_of(const MeanFinding& f, const project::Project* p) {
    return p ? p->review(project::mean_key(f.strata, f.outcome, f.focal, f.reference)) : nullptr;
}

std::string scale_words(const MeanFinding& f) {
    return f.log_outcome ? "log " + f.outcome + " (differences are log ratios; percentages are exp(d) - 1)" : f.outcome;
}

std::string lead(const MeanFinding& f) {
    std::string s = "Pooled, " + f.focal + " averages " + value(f.crude.focal.mean) + " and " + f.reference + " " +
                    value(f.crude.reference.mean) + " (" + (f.log_outcome ? "log " : "") + f.outcome +
                    "): a difference of " + diff(f.crude.difference.estimate) + " " +
                    ci(f.crude.difference.ci_low, f.crude.difference.ci_high) + ". Within " + joined(f.strata, " × ") +
                    " the difference is " + diff(f.fixed_effects.estimate) + " " +
                    ci(f.fixed_effects.robust.ci_low, f.fixed_effects.robust.ci_high) +
                    " (fixed effects, HC1 interval); standardised to the pooled mix " + diff(f.standardised.estimate) +
                    ".";
    if (f.log_outcome)
        s += " As percentages: pooled " + pct(f.crude_percent.estimate) + ", within " +
             pct(f.fixed_effects_percent.estimate) + ".";
    return s;
}

/// The diagram's verdict on the finding with the estimate it points to (core/audit/verdicts.h);
/// without a diagram, which question each view answers.
std::string verdict_words(const MeanFinding& f) {
    if (f.verdict) {
        const FindingVerdict& v = *f.verdict;
        std::string s = "Under the causal diagram: " + v.verdict.reason;
        if (const auto& e = v.estimate) {
            const std::string what = e->view == AdjustedEstimate::View::Pooled ? "the pooled difference (Welch)"
                                     : "the fixed-effects difference within " + joined(e->over, " × ") + " (HC1)";
            s += " The figure to quote is " + what + ": " + diff(e->estimate) + " " + ci(e->ci_low, e->ci_high) + ".";
        } else if (!v.estimate_problem.empty()) {
            s += " No estimate over that set: " + v.estimate_problem + ".";
        }
        return s;
    }
    if (!f.verdict_problem.empty()) return "The diagram cannot judge this finding: " + f.verdict_problem + ".";
    return "Which view answers the question depends on how the columns cause each other: the pooled gap "
           "is the total difference between the groups; the within-strata gap holds the stratifier "
           "fixed, which is the right comparison for a confounder and the wrong one for a mediator "
           "(a step on the path from group to outcome, as a grade can be in a pay review).";
}

MemoTable figures(const MeanFinding& f) {
    MemoTable t;
    t.header = {"Figure", "Estimate", "Interval", "p"};
    t.widths = {2.6, 1.2, 2.2, 0.9};
    t.numeric = {false, true, true, true};
    auto row = [&](const std::string& name, const stats::GapEstimate& e) {
        t.rows.push_back({name, diff(e.estimate), ci(e.ci_low, e.ci_high), p_text(e.p)});
    };
    row("Pooled difference (Welch)", f.crude.difference);
    row("Within strata, fixed effects (HC1)", f.fixed_effects.robust);
    row("Within strata, fixed effects (classical)", f.fixed_effects.classical);
    row("Standardised to the pooled mix", f.standardised);
    t.rows.push_back({"Ratio of pooled means", fmt("%.3f", f.crude.ratio), "", ""});
    t.rows.push_back({"Interaction F (group × stratum)", fmt("%.3g", f.interaction.f),
                      "df " + fmt("%.0f", f.interaction.df1) + ", " + fmt("%.0f", f.interaction.df2),
                      p_text(f.interaction.p)});
    t.rows.push_back({"Cochran's Q of stratum differences", fmt("%.3g", f.cochran_q.q), "df " + fmt("%.0f", f.cochran_q.df),
                      p_text(f.cochran_q.p)});
    return t;
}

MemoTable strata(const MeanFinding& f) {
    MemoTable t;
    const bool pay = f.pay_gap.computed;
    t.header = {"Stratum", "n " + f.focal, "Mean " + f.focal, "n " + f.reference, "Mean " + f.reference,
                "Difference (interval)"};
    t.widths = {1.8, 0.8, 1.1, 0.8, 1.1, 2.2};
    t.numeric = {false, true, true, true, true, true};
    if (pay) {
        t.header.push_back("Gap %");
        t.widths.push_back(0.8);
        t.numeric.push_back(true);
    }
    auto add = [&](const std::string& label, const stats::GroupMean& a, const stats::GroupMean& b,
                   const stats::GapEstimate& d, double gap, bool flag) {
        std::vector<std::string> r = {label, count(a.n), value(a.mean), count(b.n), value(b.mean),
                                      diff(d.estimate) + " " + ci(d.ci_low, d.ci_high)};
        if (pay) r.push_back(fmt("%.1f", gap) + (flag ? " *" : ""));
        t.rows.push_back(std::move(r));
    };
    add("All (pooled)", f.crude.focal, f.crude.reference, f.crude.difference, f.pay_gap.mean_gap_percent, false);
    for (std::size_t k = 0; k < f.strata_table.size(); ++k) {
        const auto& s = f.strata_table[k];
        const PayGapStratum* p = pay && k < f.pay_gap.strata.size() ? &f.pay_gap.strata[k] : nullptr;
        add(s.level + (s.informative ? "" : " (" + s.reason + ")"), s.focal, s.reference, s.difference,
            p ? p->mean_gap_percent : NAN, p && p->reaches_threshold);
    }
    return t;
}

std::string pay_sentence(const MeanFinding& f) {
    const auto& g = f.pay_gap;
    if (!g.computed) return {};
    std::string s = "Pay-reporting figures (on " + f.outcome + " itself): the mean gap is " +
                    fmt("%.1f%%", g.mean_gap_percent) + " and the median gap " + fmt("%.1f%%", g.median_gap_percent) +
                    " of the " + f.reference + " figure (medians " + value(g.median_focal) + " and " +
                    value(g.median_reference) + ", from the rows). ";
    if (g.flagged.empty())
        s += "No stratum's mean gap reaches " + fmt("%.0f%%", g.threshold_percent) + ".";
    else
        s += std::to_string(g.flagged.size()) + " stratum" + (g.flagged.size() == 1 ? "" : "s") + " (marked *) reach" +
             (g.flagged.size() == 1 ? "es" : "") + " a mean gap of " + fmt("%.0f%%", g.threshold_percent) + ": " +
             joined(g.flagged, ", ") +
             ". Under Directive (EU) 2023/970 (Article 10, from memory) such a gap, unless justified by objective, "
             "gender-neutral criteria, calls for a joint pay assessment; whether it applies is for counsel.";
    return s;
}

}  // namespace

bool included_in_memo(const MeanFinding& f, const project::Project* project) {
    const auto* r = review_of(f, project);
    if (project && project->memo.findings == "chosen") return r && r->in_memo && *r->in_memo;
    if (r && r->in_memo) return *r->in_memo;
    return f.cls != FindingClass::Stable;
}

void fill_mean_memo(MemoContent& m, const MemoInput& in) {
    if (!in.scan || !in.scan->mean_scan) return;
    const ScanResult& r = *in.scan;
    const Question& q = r.question;
    const project::Project* p = in.project;
    m.question = "Is the mean of " + std::string(r.log_outcome ? "log " : "") + q.outcome + " different for " +
                 joined(q.focal, ", ") + " than for " + q.reference + " (column " + q.exposure +
                 "), and does the answer change when the comparison is made within levels of another column?";
    for (auto& fact : m.facts)
        if (fact.first == "Question") fact.second = m.question;
    if (std::none_of(m.facts.begin(), m.facts.end(), [](const auto& f) { return f.first == "Question"; }))
        m.facts.push_back({"Question", m.question});

    int counts[5] = {0, 0, 0, 0, 0};
    for (const auto& f : r.mean_findings) ++counts[rank(f.cls)];
    const std::size_t flagged = r.mean_findings.size() - static_cast<std::size_t>(counts[4]);
    m.summary = "The scan compared the mean of " + q.outcome + " within " + std::to_string(r.candidates.size()) +
                " candidate column" + (r.candidates.size() == 1 ? "" : "s") + (r.candidates.size() > 1 ? " and their pairs" : "") +
                ": " + std::to_string(r.mean_findings.size()) + " comparisons, " + std::to_string(counts[0]) +
                " reversal, " + std::to_string(counts[1]) + " explained, " + std::to_string(counts[2]) + " masked, " +
                std::to_string(counts[3]) + " heterogeneous.";
    if (flagged > 0 && !r.mean_findings.empty()) {
        const auto& top = r.mean_findings.front();
        m.summary += " The strongest, within " + joined(top.strata, " × ") + ": pooled difference " +
                     diff(top.crude.difference.estimate) + ", within strata " + diff(top.fixed_effects.estimate) + ".";
    }
    m.summary += " The pooled gap and the within-strata gap answer different questions: when a stratifier (a job "
                 "grade, say) lies on the path from the group to the outcome, the pooled gap is the total "
                 "difference and the within-strata gap the part not carried by that path.";

    m.findings = {};
    m.findings.header = {"#", "Class", "Strata", "Comparison", "Pooled", "Within", "q", "Stability", "Decision"};
    m.findings.widths = {0.45, 1.4, 1.8, 1.45, 1.0, 1.0, 0.8, 0.85, 0.95};
    m.findings.numeric = {true, false, false, false, true, true, true, true, false};
    std::vector<std::size_t> chosen;
    std::size_t listed = 0;
    for (std::size_t i = 0; i < r.mean_findings.size(); ++i) {
        const auto& f = r.mean_findings[i];
        if (included_in_memo(f, p)) chosen.push_back(i);
        if (flagged > 0 && f.cls == FindingClass::Stable) continue;
        ++listed;
        const auto* rv = review_of(f, p);
        m.findings.rows.push_back({std::to_string(i + 1), std::string(to_string(f.cls)), joined(f.strata, " × "),
                                   f.focal + " vs " + f.reference, diff(f.crude.difference.estimate),
                                   diff(f.fixed_effects.estimate), fmt("%.2g", f.q_value),
                                   f.stability.computed() ? fmt("%.0f%%", 100 * f.stability.share) : "-",
                                   rv ? std::string(to_string(rv->decision)) : "undecided"});
    }
    const std::size_t with_section = std::min(chosen.size(), in.max_sections);
    m.findings_note = "Listed: " + std::to_string(listed) + " of " + std::to_string(r.mean_findings.size()) +
                      " comparisons (" + (flagged > 0 ? "those not stable" : "none is flagged, so all") +
                      "); differences of mean " + q.outcome + ", focal minus reference; within = fixed effects; q is the "
                      "reversal test's false-discovery q-value, whatever the class. " +
                      std::to_string(with_section) + " finding" + (with_section == 1 ? " has" : "s have") +
                      " a section below.";

    m.sections.clear();
    for (std::size_t k = 0; k < with_section; ++k) {
        const auto& f = r.mean_findings[chosen[k]];
        MemoSection sec;
        sec.finding_class = std::string(to_string(f.cls));
        sec.heading = std::to_string(k + 1) + ". " + capitalised(std::string(to_string(f.cls))) + ": " +
                      joined(f.strata, " × ") + " (" + f.focal + " vs " + f.reference + ", mean " + scale_words(f) + ")";
        sec.lead = lead(f);
        sec.figures = figures(f);
        sec.strata = strata(f);
        sec.verdict = verdict_words(f);
        sec.decomposition = "Of the pooled difference " + diff(f.decomposition.crude_gap) + ", " +
                            diff(f.decomposition.within) + " is the within-strata part and " +
                            diff(f.decomposition.composition) +
                            " the composition part (different mixes of the groups over the strata; symmetric "
                            "Kitagawa split).";
        const auto& s = f.sensitivity;
        sec.e_value = "E-value: " + fmt("%.2f", s.e.e.estimate) + " (interval limit " + fmt("%.2f", s.e.e.ci_limit) +
                      ") for the within-strata difference as a standardised mean difference of " + fmt("%.3f", s.smd) +
                      " (VanderWeele & Ding 2017 conversion RR = exp(0.91 d), an approximation).";
        if (f.pay_gap.computed) sec.e_value += " " + pay_sentence(f);
        const auto* rv = review_of(f, p);
        sec.decision = "Reviewer's decision: " + std::string(rv ? to_string(rv->decision) : "undecided") + ".";
        if (rv) sec.note = rv->note;
        m.sections.push_back(std::move(sec));
    }

    std::vector<std::string> notes = {
        "Means carry Student t intervals; the pooled and per-stratum differences Welch's interval and test "
        "(Welch-Satterthwaite degrees of freedom).",
        "Within strata: the group coefficient of least squares of " + q.outcome +
            " on the group and one indicator per informative stratum (fixed effects), with the classical and the "
            "HC1 heteroskedasticity-robust standard error, all computed from per-cell counts, means and sums of "
            "squares; strata where one group is absent are listed and left out. Standardised: the per-stratum "
            "differences weighted by the pooled mix of the informative strata. Homogeneity: the F test of the "
            "group × stratum interaction and Cochran's Q.",
        "A reversal needs the Welch pooled difference and the HC1 within-strata difference significant on opposite "
        "sides (intersection-union test); its p-values are corrected with Benjamini-Hochberg over all " +
            std::to_string(r.mean_findings.size()) + " comparisons at a false discovery rate of " + fmt("%.2f", r.alpha) +
            ". " +
            (r.bootstrap > 0
                 ? "Stability: the share of " + std::to_string(r.bootstrap) + " resamples (seed " + std::to_string(r.seed) +
                       ") in which a flagged finding keeps its class; each resample redraws both groups' observations "
                       "over the strata (multinomial) and each cell's mean and sum of squares from their normal-theory "
                       "distributions, so with skewed values it approximates the row bootstrap."
                 : std::string("Stability under resampling was not computed (no resamples were asked for).")) +
            " Covariate adjustment and the Oaxaca-Blinder decomposition are not available yet.",
        std::string(r.log_outcome ? "The outcome was analysed as its natural logarithm; percentages are exp(d) - 1. "
                                  : "") +
            "Decomposition: Kitagawa (1955) in the symmetric form of Das Gupta (1993). E-value: VanderWeele & Ding "
            "(2017), RR = exp(0.91 d) for a standardised mean difference d.",
        "Candidate columns: " + (r.candidates.empty() ? std::string("none") : joined(r.candidates, ", ")) + ".",
        "Data: SHA-256 " + (in.data.sha256.empty() ? std::string("not computed") : in.data.sha256) +
            ". The audit re-runs from its project file with `foldline run PROJECT`.",
    };
    if (!r.mean_findings.empty() && r.mean_findings.front().pay_gap.computed)
        notes.push_back("Pay-reporting conventions (Directive (EU) 2023/970, from memory: Article 3 defines the gap as "
                        "a percentage of the reference group's average pay, Article 9 asks for mean and median gaps, "
                        "Article 10 a joint pay assessment at 5% in a category of workers): medians come from the rows "
                        "of each cell (they are not mergeable sums).");
    if (r.cancelled) notes.push_back("The scan was stopped early: the findings are incomplete.");
    m.method_notes = std::move(notes);
    m.caution = std::string(kMemoCaution) + " " + kPayReviewCaution;
}

}  // namespace foldline::report
