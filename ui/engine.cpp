// Core headers first: they use `slots` as a name, which Qt defines as a keyword macro.
#include "core/io/csv_reader.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"

#include "ui/engine.h"

#include <QObject>
#include <algorithm>

namespace foldline::ui {

namespace {

QString qs(const std::string& s) { return QString::fromStdString(s); }

Estimate est(double v, const stats::Interval& ci) { return {v, ci.lo, ci.hi}; }

foldline::QuestionSpec core_spec(const QuestionSpec& q) {
    foldline::QuestionSpec s;
    s.outcome = q.outcome.toStdString();
    if (!q.positive.isEmpty()) s.positive = q.positive.toStdString();
    s.exposure = q.exposure.toStdString();
    if (!q.focal.isEmpty()) s.focal = {q.focal.toStdString()};
    if (!q.reference.isEmpty()) s.reference = q.reference.toStdString();
    return s;
}

QString num(double v, int digits = 3) {
    return std::isfinite(v) ? QString::number(v, 'f', digits) : QStringLiteral("—");
}
QString pval(double p) { return std::isfinite(p) ? QString::number(p, 'g', 3) : QStringLiteral("—"); }

FindingView to_view(const RateFinding& r) {
    FindingView f;
    f.cls = r.cls;
    for (const auto& s : r.strata) f.strata << qs(s);
    f.focal = qs(r.focal);
    f.reference = qs(r.reference);
    f.effect_name = QObject::tr("risk difference");
    f.adjusted_name = QObject::tr("standardised difference");
    f.crude = est(r.crude.rd, r.crude.rd_ci);
    f.adjusted = est(r.adjusted.standardized.rd, r.adjusted.standardized.rd_ci);
    f.p_value = r.p_reversal;
    f.q_value = r.q_value;
    f.stability = r.stability;
    f.within = r.decomposition.within;
    f.composition = r.decomposition.composition;
    GroupRow& p = f.pooled;
    p.level = QObject::tr("all");
    p.pos_focal = r.crude.pos_focal;
    p.n_focal = r.crude.n_focal;
    p.pos_reference = r.crude.pos_reference;
    p.n_reference = r.crude.n_reference;
    p.rate_focal = est(r.crude.rate_focal, r.crude.rate_focal_ci);
    p.rate_reference = est(r.crude.rate_reference, r.crude.rate_reference_ci);
    p.rd = f.crude;
    p.selection_ratio = r.crude.selection_ratio;
    for (const StratumRow& s : r.strata_table) {
        GroupRow g;
        g.level = qs(s.level);
        g.pos_focal = s.pos_focal;
        g.n_focal = s.n_focal;
        g.pos_reference = s.pos_reference;
        g.n_reference = s.n_reference;
        g.rate_focal = est(s.rate_focal, s.rate_focal_ci);
        g.rate_reference = est(s.rate_reference, s.rate_reference_ci);
        g.rd = est(s.rd, s.rd_ci);
        g.selection_ratio = s.selection_ratio;
        g.informative = s.informative;
        g.reason = qs(s.reason);
        f.rows.push_back(std::move(g));
    }
    const auto& a = r.adjusted;
    auto ci = [](const stats::Estimate& e, int d = 3) {
        return num(e.estimate, d) + (std::isfinite(e.ci.lo) ? QStringLiteral(" [%1, %2]").arg(num(e.ci.lo, d), num(e.ci.hi, d)) : QString());
    };
    f.more = {
        {QObject::tr("Mantel-Haenszel difference"), ci(a.mh_rd.greenland_robins),
         QObject::tr("Weighted average of the stratum differences (Mantel-Haenszel weights), Greenland-Robins interval")},
        {QObject::tr("Mantel-Haenszel risk ratio"), ci(a.mh_rr),
         QObject::tr("Common ratio of the groups' rates across strata, Greenland-Robins interval")},
        {QObject::tr("Mantel-Haenszel odds ratio"), ci(a.mh_or),
         QObject::tr("Common odds ratio across strata, Robins-Breslow-Greenland interval")},
        {QObject::tr("Pooled odds ratio"), num(r.crude.odds_ratio),
         QObject::tr("Odds ratio with the strata pooled (0.5 added to every cell only when one is zero)")},
        {QObject::tr("CMH test p"), pval(r.cmh.p) + QObject::tr("  (corrected %1)").arg(pval(r.cmh.p_corrected)),
         QObject::tr("Cochran-Mantel-Haenszel test that the groups differ within strata, without and with continuity correction")},
        {QObject::tr("Breslow-Day p (Tarone)"), pval(r.breslow_day.p_tarone),
         QObject::tr("Test that the odds ratio is the same in every stratum; small values mean the strata disagree")},
        {QObject::tr("Reversal p / q"), pval(r.p_reversal) + QStringLiteral(" / ") + pval(r.q_value),
         QObject::tr("Evidence that pooled and adjusted gaps point opposite ways (intersection-union p) and its false-discovery-rate q-value")},
        {QObject::tr("E-value (estimate / CI)"), num(r.e_value.estimate, 2) + QStringLiteral(" / ") + num(r.e_value.ci_limit, 2),
         QObject::tr("How strong an unmeasured confounder would have to be, on the risk-ratio scale, to explain the adjusted ratio away")},
    };
    if (r.crude.below_four_fifths)
        f.more.push_back({QObject::tr("Four-fifths flag"), QObject::tr("pooled ratio below 0.8"),
                          QObject::tr("The lower selection rate is under four fifths of the higher (common practice in employment screening)")});
    return f;
}

}  // namespace

bool reader_available() { return true; }

Result<Table> load_table(const QString& path, const LoadOptions& opts, const Work& work) {
    CsvOptions o;
    o.count_column = opts.count_column.toStdString();
    if (!opts.missing_markers.isEmpty()) {
        o.missing_markers.clear();
        for (const QString& m : opts.missing_markers) o.missing_markers.push_back(m.toStdString());
    }
    for (const auto& [name, type] : opts.type_overrides) o.type_overrides[name] = type;
    return read_csv(path.toStdString(), o, nullptr, work);
}

std::vector<CandidateView> propose_candidates(const Table& t, const QuestionSpec& q) {
    std::vector<CandidateView> out;
    std::vector<std::string> skip;
    if (!q.outcome.isEmpty()) skip.push_back(q.outcome.toStdString());
    if (!q.exposure.isEmpty()) skip.push_back(q.exposure.toStdString());
    CandidateOptions opts;
    opts.bins = q.bins;
    auto set = select_candidates(t, skip, opts, t.column(q.exposure.toStdString()));
    if (!set) return out;
    for (const Column& c : t.columns) {
        const std::string& name = c.name;
        CandidateView v{qs(name), false, {}};
        if (std::find(skip.begin(), skip.end(), name) != skip.end()) {
            v.reason = qs(name) == q.outcome ? QObject::tr("the outcome") : QObject::tr("the compared groups");
        } else if (std::any_of(set->candidates.begin(), set->candidates.end(), [&](const Candidate& k) { return k.name == name; })) {
            v.usable = true;
        } else {
            for (const Exclusion& e : set->excluded)
                if (e.column == name) v.reason = qs(e.reason);
            if (v.reason.isEmpty()) v.reason = QObject::tr("not usable as strata");
        }
        out.push_back(std::move(v));
    }
    return out;
}

QStringList check_question(const Table& t, const QuestionSpec& q) {
    QStringList problems;
    if (q.outcome.isEmpty()) problems << QObject::tr("Choose the outcome column.");
    if (q.exposure.isEmpty()) problems << QObject::tr("Choose the column that holds the compared groups.");
    if (!problems.isEmpty()) return problems;
    if (q.outcome == q.exposure) return {QObject::tr("The outcome and the groups must be different columns.")};
    if (!q.focal.isEmpty() && q.focal == q.reference) return {QObject::tr("The focal and reference groups must differ.")};
    auto resolved = resolve_question(t, core_spec(q));
    if (!resolved) problems << qs(resolved.error().message);
    if (q.candidates.isEmpty()) problems << QObject::tr("Tick at least one candidate stratifier.");
    if (q.alpha <= 0 || q.alpha >= 0.5) problems << QObject::tr("Alpha must lie between 0 and 0.5.");
    return problems;
}

bool scan_available() { return true; }

Result<ScanOutcome> run_scan(const Table& t, const QuestionSpec& q, const Work& work,
                             const std::function<void(FindingView)>& on_provisional) {
    auto question = resolve_question(t, core_spec(q));
    if (!question) return question.error();
    CandidateOptions copts;
    copts.bins = q.bins;
    for (const QString& c : q.candidates) copts.columns.push_back(c.toStdString());
    auto candidates = select_candidates(t, {question->outcome, question->exposure}, copts,
                                        &t.columns[question->exposure_column]);
    if (!candidates) return candidates.error();
    RateScanOptions opts;
    opts.pairs = q.pairs;
    opts.alpha = q.alpha;
    opts.bootstrap = q.bootstrap;
    opts.seed = q.seed;
    auto result = rate_scan(t, *question, *candidates, opts, work, [&](const RateFinding& r) {
        if (on_provisional) on_provisional(to_view(r));
    });
    if (!result) return result.error();
    ScanOutcome out;
    out.cancelled = result->cancelled;
    for (const RateFinding& r : result->rate_findings) out.findings.push_back(to_view(r));
    for (const Exclusion& e : result->excluded) out.excluded << qs(e.column) + QStringLiteral(": ") + qs(e.reason);
    return out;
}

}  // namespace foldline::ui
