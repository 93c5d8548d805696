#include "core/report/mean_csv.h"

#include <cmath>
#include <vector>

#include "core/report/csv_export.h"

namespace foldline::report {
namespace {

void row(std::string& out, const std::vector<std::string>& fields) {
    for (std::size_t i = 0; i < fields.size(); ++i) {
        if (i) out += ',';
        out += fields[i];
    }
    out += "\r\n";
}

std::string label(const std::vector<std::string>& v) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i) s += (i ? " × " : "") + v[i];
    return s;
}

std::string num(double x) { return csv_number(x); }

}  // namespace

std::string mean_findings_csv(const ScanResult& r, const project::Project* project) {
    std::string out;
    row(out, {"finding", "kind", "class", "strata", "outcome", "log_outcome", "focal", "reference", "n",
              "mean_focal", "mean_reference", "crude_difference", "crude_ci_low", "crude_ci_high", "crude_welch_df",
              "crude_p", "ratio_of_means", "fixed_effects_difference", "fixed_effects_se", "fixed_effects_se_hc1",
              "fixed_effects_ci_hc1_low", "fixed_effects_ci_hc1_high", "standardised_difference",
              "standardised_ci_low", "standardised_ci_high", "interaction_f", "interaction_p", "cochran_q",
              "cochran_q_p", "within_part", "composition_part", "smd", "e_value", "e_value_ci", "p_reversal",
              "q_value", "informative_strata", "mean_gap_percent", "median_gap_percent", "strata_reaching_5_percent",
              "verdict", "decision", "note"});
    std::size_t n = 0;
    for (const auto& f : r.mean_findings) {
        std::string decision = "undecided", note;
        if (project)
            if (const auto* rv = project->review(project::mean_key(f.strata, f.outcome, f.focal, f.reference))) {
                decision = std::string(to_string(rv->decision));
                note = rv->note;
            }
        const auto& c = f.crude;
        const auto& fe = f.fixed_effects;
        const auto& pg = f.pay_gap;
        row(out, {std::to_string(++n), "mean", std::string(to_string(f.cls)), csv_field(label(f.strata)),
                  csv_field(f.outcome), f.log_outcome ? "true" : "false", csv_field(f.focal), csv_field(f.reference),
                  num(f.rows_used), num(c.focal.mean), num(c.reference.mean), num(c.difference.estimate),
                  num(c.difference.ci_low), num(c.difference.ci_high), num(c.difference.df), num(c.difference.p),
                  num(c.ratio), num(fe.estimate), num(fe.se), num(fe.se_hc1), num(fe.robust.ci_low),
                  num(fe.robust.ci_high), num(f.standardised.estimate), num(f.standardised.ci_low),
                  num(f.standardised.ci_high), num(f.interaction.f), num(f.interaction.p), num(f.cochran_q.q),
                  num(f.cochran_q.p), num(f.decomposition.within), num(f.decomposition.composition),
                  num(f.sensitivity.smd), num(f.sensitivity.e.e.estimate), num(f.sensitivity.e.e.ci_limit),
                  num(f.p_reversal), num(f.q_value), std::to_string(f.informative_strata),
                  pg.computed ? num(pg.mean_gap_percent) : "", pg.computed ? num(pg.median_gap_percent) : "",
                  pg.computed ? std::to_string(pg.flagged.size()) : "",
                  csv_field(f.verdict ? std::string(causal::to_string(f.verdict->verdict.answer)) : std::string()),
                  csv_field(decision), csv_field(note)});
    }
    return out;
}

std::string mean_strata_csv(const ScanResult& r) {
    std::string out;
    row(out, {"finding", "strata", "level", "n_focal", "mean_focal", "sd_focal", "n_reference", "mean_reference",
              "sd_reference", "difference", "difference_ci_low", "difference_ci_high", "share_focal",
              "share_reference", "informative", "reason", "median_focal", "median_reference", "mean_gap_percent",
              "median_gap_percent", "reaches_5_percent"});
    std::size_t n = 0;
    for (const auto& f : r.mean_findings) {
        ++n;
        for (std::size_t k = 0; k < f.strata_table.size(); ++k) {
            const auto& s = f.strata_table[k];
            const PayGapStratum* p = f.pay_gap.computed && k < f.pay_gap.strata.size() ? &f.pay_gap.strata[k] : nullptr;
            row(out, {std::to_string(n), csv_field(label(f.strata)), csv_field(s.level), num(s.focal.n),
                      num(s.focal.mean), num(s.focal.sd), num(s.reference.n), num(s.reference.mean), num(s.reference.sd),
                      num(s.difference.estimate), num(s.difference.ci_low), num(s.difference.ci_high),
                      num(s.share_focal), num(s.share_reference), s.informative ? "true" : "false",
                      csv_field(s.reason), p ? num(p->median_focal) : "", p ? num(p->median_reference) : "",
                      p ? num(p->mean_gap_percent) : "", p ? num(p->median_gap_percent) : "",
                      p ? (p->reaches_threshold ? "true" : "false") : ""});
        }
    }
    return out;
}

}  // namespace foldline::report
