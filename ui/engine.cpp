// Core headers first: they use `slots` as a name, which Qt defines as a keyword macro.
#include "core/io/csv_reader.h"
#include "core/io/table_reader.h"
#include "core/io/odbc_connection.h"
#include "core/io/sql_pushdown.h"
#ifdef FOLDLINE_HAS_ODBC
#include "core/io/odbc_source.h"
#endif
#include "core/audit/memo_input.h"
#include "core/audit/project_file.h"
#include "core/audit/run_audit.h"
#include "core/audit/verdicts.h"
#include "core/report/memo_content.h"
#include "core/report/slope_chart.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/causal/combined_exposure.h"
#include "core/table/combined_column.h"
#include "ui/findings_model.h"
#include "ui/mean_view.h"
#include "ui/memo/memo_writer.h"

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

/// The small-count assessment: the exact figures under the pooled table, and the reasons on the
/// class when an exact test decided or an asymptotic one could not be trusted.
void add_small_counts(const SmallCounts& sc, FindingView& f) {
    const auto& mf = sc.mantel_fleiss;
    f.more.push_back({QObject::tr("Mantel-Fleiss distance"), num(mf.distance, 3) + (mf.satisfied ? QString() : QObject::tr("  (below 5)")),
                      QString::fromStdString(sc.adjusted_reason)});
    if (sc.exact_run && sc.exact.status == stats::ExactStatus::Computed) {
        const auto& e = sc.exact;
        f.more.push_back({QObject::tr("Exact test p, conditional odds ratio"),
                          pval(e.p_two_sided) + QStringLiteral(", ") + num(e.estimate) +
                              QStringLiteral(" [%1, %2]").arg(num(e.ci.lo), num(e.ci.hi)),
                          QObject::tr("Exact conditional test of a common odds ratio of 1, its conditional maximum-likelihood "
                                      "estimate and exact 95% interval")});
    }
    if (sc.homogeneity_used != HomogeneityUsed::BreslowDay)
        f.more.push_back({QObject::tr("Homogeneity (small counts)"),
                          sc.homogeneity_used == HomogeneityUsed::Zelen ? QObject::tr("Zelen exact p %1").arg(pval(sc.zelen.p))
                                                                        : QObject::tr("not assessable"),
                          QString::fromStdString(sc.homogeneity_reason)});
    if (sc.flagged())
        f.small_counts = QString::fromStdString(sc.adjusted_reason + "\n" + sc.homogeneity_reason);
}

void set_family(const FindingHeader& h, FindingView& f) {
    f.family_lead = qs(h.family_lead());
    f.family_role = h.family.role;
    f.family_reason = qs(h.family.reason);
}

FindingView to_view(const RateFinding& r) {
    FindingView f;
    f.cls = r.cls;
    for (const auto& s : r.strata) f.strata << qs(s);
    f.focal = qs(r.focal);
    f.reference = qs(r.reference);
    f.effect_name = QObject::tr("risk difference");
    // "Adjusted" means Mantel-Haenszel on every screen, in the memo and in the CSV; the directly
    // standardised difference is the "Standardised gap".
    f.adjusted_name = QObject::tr("adjusted difference (Mantel-Haenszel)");
    f.crude = est(r.crude.rd, r.crude.rd_ci);
    f.adjusted = est(r.adjusted.mh_rd.greenland_robins.estimate, r.adjusted.mh_rd.greenland_robins.ci);
    f.standardised = est(r.adjusted.standardized.rd, r.adjusted.standardized.rd_ci);
    f.p_value = r.p_reversal;
    f.q_value = r.q_value;
    f.stability = r.stability.share;
    f.within = r.decomposition.within;
    f.composition = r.decomposition.composition;
    set_family(r, f);
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
        {QObject::tr("Standardised gap"), format_gap(f, f.standardised),
         QObject::tr("The difference directly standardised to the pooled stratum mix (both groups given the whole population's mix), Wald interval")},
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
    add_small_counts(r.small_counts, f);
    if (r.crude.below_four_fifths)
        f.more.push_back({QObject::tr("Four-fifths flag"), QObject::tr("pooled ratio below 0.8"),
                          QObject::tr("The lower selection rate is under four fifths of the higher (common practice in employment screening)")});
    return f;
}

/// Up to this many points of a slope finding are drawn; more are thinned evenly.
constexpr std::size_t kMaxPoints = report::kMaxChartPoints;
using report::MemoScatter;
using report::MemoScatterLine;

/// The index into the finding's groups of the chart line `line` (lines are the groups with a
/// defined slope, in group order); -1 when none matches.
int line_group(const report::MemoScatter& chart, const SlopeFinding& sf, int line) {
    const std::string& label = chart.lines[std::size_t(line)].label;
    for (std::size_t g = 0; g < sf.groups.size(); ++g)
        if (sf.groups[g].level == label) return int(g);
    return -1;
}

FindingView to_view(const SlopeFinding& sf, const Table& t, int bins, std::size_t max_levels) {
    FindingView f;
    f.slope = true;
    f.cls = sf.cls;
    for (const auto& s : sf.strata) f.strata << qs(s);
    f.focal = qs(sf.x);
    f.reference = qs(sf.y);
    f.effect_name = sf.linear_probability ? QObject::tr("slope (difference in probability)") : QObject::tr("slope");
    f.adjusted_name = QObject::tr("within-stratum slope");
    const bool adj = sf.adjusted;
    f.crude = adj ? Estimate{sf.adjusted_pooled.slope, sf.adjusted_pooled.ci_low, sf.adjusted_pooled.ci_high}
                  : Estimate{sf.pooled.slope, sf.pooled.ci_low, sf.pooled.ci_high};
    f.adjusted = adj ? Estimate{sf.adjusted_within.slope, sf.adjusted_within.ci_low, sf.adjusted_within.ci_high}
                     : Estimate{sf.within.slope, sf.within.ci_low, sf.within.ci_high};
    f.p_value = sf.p_reversal;
    f.q_value = sf.q_value;
    f.stability = sf.stability.share;
    set_family(sf, f);
    f.more = {
        {QObject::tr("Pooled correlation r"),
         QStringLiteral("%1 [%2, %3]").arg(num(sf.pooled.r), num(sf.pooled.r_ci_low), num(sf.pooled.r_ci_high)),
         QObject::tr("Correlation of the two columns with every stratum pooled, with its 95% interval")},
        {QObject::tr("Pooled slope, robust SE (HC3)"), num(sf.pooled.se_robust, 4),
         QObject::tr("Standard error of the pooled slope that tolerates unequal spread (HC3)")},
        {QObject::tr("Equal-slopes test p"), pval(sf.equal_slopes.p),
         QObject::tr("F-test that every stratum has the same slope; small values mean the strata disagree")},
        {QObject::tr("Reversal p / q"), pval(sf.p_reversal) + QStringLiteral(" / ") + pval(sf.q_value),
         QObject::tr("Evidence that pooled and within slopes point opposite ways (intersection-union p) and its q-value")},
        {QObject::tr("Observations used"), QString::number(sf.n, 'f', 0), QObject::tr("Rows with x, y and the strata present (weighted)")},
    };
    // Points and lines as the memo draws them (core/report/slope_chart): one computation.
    const MemoScatter chart = report::slope_chart(t, sf, bins, max_levels, kMaxPoints);
    for (std::size_t i = 0; i < chart.x.size(); ++i) {
        f.points.push_back({chart.x[i], chart.y[i]});
        f.point_stratum.push_back(chart.group[i] >= 0 ? line_group(chart, sf, chart.group[i]) : -1);
    }
    f.points_note = QString::fromStdString(chart.note);
    if (chart.pooled) f.pooled_intercept = chart.pooled->intercept;
    for (const SlopeGroup& sg : sf.groups) {
        SlopeRow r;
        r.level = qs(sg.level);
        r.n = sg.n;
        r.slope = {sg.slope, sg.ci_low, sg.ci_high};
        for (const MemoScatterLine& l : chart.lines)
            if (l.label == sg.level) r.intercept = l.intercept;
        f.slope_rows.push_back(std::move(r));
    }
    return f;
}

}  // namespace

bool reader_available() { return true; }

Result<Table> load_table(const QString& path, const LoadOptions& opts, const Work& work, QStringList* notices) {
    ReadOptions o;
    o.sheet = opts.sheet.toStdString();
    o.decimal = opts.decimal;
    o.count_column = opts.count_column.toStdString();
    if (!opts.missing_markers.isEmpty()) {
        o.missing_markers.clear();
        for (const QString& m : opts.missing_markers) o.missing_markers.push_back(m.toStdString());
    }
    for (const auto& [name, type] : opts.type_overrides) o.type_overrides[name] = type;
    ReadReport report;
    auto table = read_table(path.toStdString(), o, &report, work);
    if (table && notices) {
        for (const auto& w : report.warnings) *notices << QString::fromStdString(w);
        for (const auto& n : report.numbers)
            *notices << QStringLiteral("Column \u201C%1\u201D %2")
                            .arg(QString::fromStdString(n.column), QString::fromStdString(n.describe()));
    }
    return table;
}

QStringList combined_group_parts(const Table& t, const QuestionSpec& q) {
    QStringList out;
    if (q.slope || q.exposure.isEmpty()) return out;
    for (const auto& p : combined_parts(t, q.exposure.toStdString())) out << qs(p);
    return out;
}

Result<Column> combined_groups_column(const Table& t, const QuestionSpec& q) {
    const QStringList parts = combined_group_parts(t, q);
    if (parts.isEmpty()) return make_error("\"" + q.exposure.toStdString() + "\" does not combine columns of the data");
    std::vector<std::string> names;
    for (const QString& p : parts) names.push_back(p.toStdString());
    return combine_columns(t, names, q.exposure.toStdString());
}

std::vector<CandidateView> propose_candidates(const Table& t, const QuestionSpec& q, const Column* combined) {
    std::vector<CandidateView> out;
    std::vector<std::string> skip;
    if (!q.outcome.isEmpty()) skip.push_back(q.outcome.toStdString());
    if (!q.exposure.isEmpty()) skip.push_back(q.exposure.toStdString());
    // Groups formed by several columns: the parts never stratify (as core/audit's scan rules).
    const QStringList parts = combined_group_parts(t, q);
    for (const QString& p : parts) skip.push_back(p.toStdString());
    std::optional<Column> own;
    if (!parts.isEmpty() && !combined)
        if (auto c = combined_groups_column(t, q)) own = std::move(*c), combined = &*own;
    if (q.slope)
        for (const QString& c : q.covariates) skip.push_back(c.toStdString());
    CandidateOptions opts;  // a mean question, like rates, compares the groups of `exposure`
    opts.bins = q.bins;
    opts.max_levels = static_cast<std::size_t>(q.max_levels);
    const Column* groups = q.slope ? nullptr : parts.isEmpty() ? t.column(q.exposure.toStdString()) : combined;
    auto set = select_candidates(t, skip, opts, groups);
    if (!set) return out;
    for (const Column& c : t.columns) {
        const std::string& name = c.name;
        CandidateView v{qs(name), false, {}, {}};
        if (std::find(skip.begin(), skip.end(), name) != skip.end()) {
            v.reason = qs(name) == q.outcome    ? QObject::tr("the outcome")
                       : qs(name) == q.exposure ? QObject::tr("the compared groups")
                       : parts.contains(qs(name)) ? QObject::tr("part of the compared groups %1").arg(q.exposure)
                                                : QObject::tr("a covariate: the slopes are adjusted for it");
        } else if (auto it = std::find_if(set->candidates.begin(), set->candidates.end(),
                                          [&](const Candidate& k) { return k.name == name; });
                   it != set->candidates.end()) {
            v.usable = true;
            v.origin = qs(it->origin);
        } else {
            for (const Exclusion& e : set->excluded)
                if (e.column == name) v.reason = qs(e.reason);
            if (v.reason.isEmpty()) v.reason = QObject::tr("not usable as strata");
        }
        out.push_back(std::move(v));
    }
    return out;
}

QStringList check_question(const Table& t, const QuestionSpec& q, const Column* combined) {
    QStringList problems;
    if (q.slope) {
        const Column* x = t.column(q.exposure.toStdString());
        const Column* y = t.column(q.outcome.toStdString());
        if (!y) problems << QObject::tr("Choose the numeric outcome (y).");
        else if (!y->is_numeric()) problems << QObject::tr("The outcome \"%1\" is not numeric; a trend needs numbers.").arg(q.outcome);
        if (!x) problems << QObject::tr("Choose the numeric exposure (x).");
        else if (!x->is_numeric()) problems << QObject::tr("The exposure \"%1\" is not numeric; a trend needs numbers.").arg(q.exposure);
        if (x && x == y) problems << QObject::tr("The outcome and the exposure must be different columns.");
        if (q.candidates.isEmpty()) problems << QObject::tr("Tick at least one candidate stratifier.");
        for (const auto& p : project::settings_problems(audit_spec(q, {}).scan)) problems << qs(p);
        return problems;
    }
    if (q.mean) {
        const Column* y = t.column(q.outcome.toStdString());
        if (y && !y->is_numeric())
            problems << QObject::tr("The outcome \"%1\" is not numeric; a mean gap needs numbers.").arg(q.outcome);
    }
    if (!problems.isEmpty()) return problems;
    if (!q.rows.trimmed().isEmpty()) {
        auto f = filter::parse(q.rows.toStdString());
        Status fits = f ? filter::check(*f, t) : Status(f.error());
        if (!fits) problems << QObject::tr("Rows to include: %1").arg(qs(fits.error().message));
    }
    if (q.outcome.isEmpty()) problems << QObject::tr("Choose the outcome column.");
    if (q.exposure.isEmpty()) problems << QObject::tr("Choose the column that holds the compared groups.");
    if (!problems.isEmpty()) return problems;
    if (q.outcome == q.exposure) return {QObject::tr("The outcome and the groups must be different columns.")};
    if (!q.focal.isEmpty() && q.focal == q.reference) return {QObject::tr("The focal and reference groups must differ.")};
    if (const QStringList parts = combined_group_parts(t, q); !parts.isEmpty()) {
        // The groups are the combinations: resolve the question on the outcome beside them.
        if (parts.contains(q.outcome)) return {QObject::tr("The outcome cannot also be part of the compared groups.")};
        std::optional<Column> own;
        if (!combined) {
            auto c = combined_groups_column(t, q);
            if (!c) return {qs(c.error().message)};
            own = std::move(*c);
            combined = &*own;
        }
        Table groups;
        groups.rows = t.rows;
        groups.weights = t.weights;
        if (const Column* oc = t.column(q.outcome.toStdString())) groups.columns.push_back(*oc);
        groups.columns.push_back(*combined);
        groups.columns.back().name = q.exposure.toStdString();
        auto resolved = q.mean ? resolve_groups(groups, core_spec(q)) : resolve_question(groups, core_spec(q));
        if (!resolved) problems << qs(resolved.error().message);
    } else {
        auto resolved = q.mean ? resolve_groups(t, core_spec(q)) : resolve_question(t, core_spec(q));
        if (!resolved) problems << qs(resolved.error().message);
    }
    if (q.candidates.isEmpty()) problems << QObject::tr("Tick at least one candidate stratifier.");
    for (const auto& p : project::settings_problems(audit_spec(q, {}).scan)) problems << qs(p);
    return problems;
}

bool scan_available() { return true; }

project::AuditSpec audit_spec(const QuestionSpec& q, const project::AuditSpec& base) {
    project::AuditSpec spec = base;
    auto& qs = spec.question;
    qs = project::QuestionSettings{};
    qs.kind = q.slope  ? project::QuestionKind::Slope
              : q.mean ? project::QuestionKind::Mean
                       : project::QuestionKind::Rate;
    qs.outcome = q.outcome.toStdString();
    qs.exposure = q.exposure.toStdString();
    // The filter in its normal form (the text as typed when it does not read: check_question says why).
    if (auto f = filter::parse(q.rows.toStdString())) qs.rows = filter::canonical_text(*f);
    else qs.rows = q.rows.trimmed().toStdString();
    if (!q.slope) {
        if (!q.positive.isEmpty() && !q.mean) qs.positive = q.positive.toStdString();
        qs.log_outcome = q.mean && q.log_outcome;
        qs.pay_gap = q.mean && q.pay_gap;
        if (!q.focal.isEmpty()) qs.focal = {q.focal.toStdString()};
        if (!q.reference.isEmpty()) qs.reference = q.reference.toStdString();
    } else {
        for (const QString& c : q.covariates) qs.covariates.push_back(c.toStdString());
    }
    spec.scan.strata.clear();
    // A covariate adjusts the slopes; it does not also stratify them.
    if (!q.all_candidates)
        for (const QString& c : q.candidates)
            if (!(q.slope && q.covariates.contains(c))) spec.scan.strata.push_back(c.toStdString());
    spec.scan.pairs = q.pairs;
    spec.scan.bins = q.bins;
    spec.scan.max_levels = q.max_levels;
    spec.scan.alpha = q.alpha;
    // The workbench has one resample count: the rate bootstrap, or the slope stability draws.
    if (q.slope) spec.scan.slope_bootstrap = q.bootstrap;
    else spec.scan.bootstrap = q.bootstrap;
    spec.scan.seed = q.seed;
    spec.scan.find_groups = q.slope && q.find_groups;
    return spec;
}

QuestionSpec question_spec(const project::AuditSpec& spec) {
    QuestionSpec q;
    const auto& p = spec.question;
    q.slope = p.kind == project::QuestionKind::Slope;
    q.mean = p.kind == project::QuestionKind::Mean;
    q.log_outcome = p.log_outcome;
    q.pay_gap = p.pay_gap;
    q.outcome = qs(p.outcome);
    q.positive = p.positive ? qs(*p.positive) : QString();
    q.exposure = qs(p.exposure);
    q.focal = p.focal.empty() ? QString() : qs(p.focal.front());
    q.reference = p.reference ? qs(*p.reference) : QString();
    for (const auto& c : spec.scan.strata) q.candidates << qs(c);
    q.all_candidates = spec.scan.strata.empty();
    if (q.slope)
        for (const auto& c : p.covariates) q.covariates << qs(c);
    q.pairs = spec.scan.pairs;
    q.bins = spec.scan.bins;
    q.max_levels = spec.scan.max_levels;
    q.alpha = spec.scan.alpha;
    q.bootstrap = q.slope ? spec.scan.slope_bootstrap : spec.scan.bootstrap;
    q.seed = spec.scan.seed;
    q.find_groups = spec.scan.find_groups;
    q.rows = qs(p.rows);
    return q;
}

Result<ScanOutcome> run_scan(std::shared_ptr<const Table> source, const project::AuditSpec& spec, const Work& work,
                             const std::function<void(FindingView)>& on_provisional) {
    // The rows filter first: every view of the scan (trend charts, verdicts, memo) reads the
    // rows the scan read.
    std::shared_ptr<const Table> scanned = source;
    if (!spec.question.rows.empty()) {
        auto kept = audit::filter_rows(*source, spec);
        if (!kept) return kept.error();
        scanned = std::make_shared<const Table>(std::move(*kept));
    }
    // Groups formed by several columns: the combined column is added here, so the views of the
    // scan (verdicts, the diagram's checks, the memo) read the column the scan compared.
    if (!scanned->column(spec.question.exposure) && !audit::combined_groups(*scanned, spec).empty()) {
        Table with = *scanned;
        if (auto st = audit::add_combined_groups(with, spec); !st) return usage_error(st.error());
        scanned = std::make_shared<const Table>(std::move(with));
    }
    const Table& t = *scanned;
    audit::RunOptions options;
    options.threads = 0;
    options.work = work;
    options.on_rate_finding = [&](const RateFinding& r) {
        if (on_provisional) on_provisional(to_view(r));
    };
    auto result = audit::scan_table(t, spec, options);
    if (!result) return result.error();
    ScanOutcome out;
    out.table = scanned;
    out.cancelled = result->cancelled;
    const int bins = spec.scan.bins;
    const auto max_levels = static_cast<std::size_t>(spec.scan.max_levels);
    for (const RateFinding& r : result->rate_findings) out.findings.push_back(to_view(r));
    for (const SlopeFinding& f : result->slope_findings) {
        FindingView v = to_view(f, t, bins, max_levels);
        // A slope scan has no provisional findings: each arrives once it is final.
        if (on_provisional && result->rate_findings.empty()) on_provisional(v);
        out.findings.push_back(std::move(v));
    }
    for (const MeanFinding& f : result->mean_findings) {
        FindingView v = mean_view(f);
        if (on_provisional && result->rate_findings.empty()) on_provisional(v);
        out.findings.push_back(std::move(v));
    }
    for (const Exclusion& e : result->excluded) out.excluded << qs(e.column) + QStringLiteral(": ") + qs(e.reason);
    out.result = std::make_shared<const ScanResult>(std::move(*result));
    return out;
}

DiagramVerdict judge(const causal::Diagram& diagram, const QString& exposure, const QString& outcome,
                     const QStringList& strata, const ScanResult* scan, const Table* table,
                     const project::AuditSpec& spec) {
    DiagramVerdict v;
    std::vector<std::string> names;
    for (const QString& s : strata) names.push_back(s.toStdString());
    // A diagram drawn with the parts of combined groups is read with them as one node, as
    // `foldline run` reads it (core/causal/combined_exposure.h).
    std::vector<std::string> parts;
    if (table && table->combined == exposure.toStdString()) parts = audit::combined_groups(*table, spec);
    const causal::Diagram judged = parts.empty() ? diagram : causal::combine_exposure(diagram, parts, exposure.toStdString());
    auto r = audit::judge(judged, exposure.toStdString(), outcome.toStdString(), names, scan, table,
                          audit::estimate_settings(spec));
    if (!r) {
        v.problem = qs(r.error().message);
        return v;
    }
    const causal::Verdict& cv = r->verdict;
    v.computed = true;
    v.answer = cv.answer;
    const QString s = strata.join(QStringLiteral(" × "));
    switch (cv.answer) {
        case causal::Answer::Stratified: v.recommended = QObject::tr("the table within strata of %1").arg(s); break;
        case causal::Answer::Pooled: v.recommended = QObject::tr("the pooled table"); break;
        case causal::Answer::Both: v.recommended = QObject::tr("either table — both estimate the same effect"); break;
        case causal::Answer::OtherSet: {
            if (cv.standardise_over)
                for (const auto& n : *cv.standardise_over) v.standardise_over << qs(n);
            v.recommended = QObject::tr("a table standardised over %1").arg(v.standardise_over.join(QStringLiteral(" × ")));
            break;
        }
        case causal::Answer::NotIdentifiable: v.recommended = QObject::tr("neither — not identifiable by adjustment"); break;
    }
    v.reason = qs(cv.reason);
    for (const auto& nr : cv.roles) v.roles.insert(qs(nr.name), nr.role);
    for (const auto& set : cv.valid_sets) {
        QStringList l;
        for (const auto& n : set) l << qs(n);
        v.valid_sets << l;
    }
    if (cv.direct_effect.applies) v.direct_effect = qs(cv.direct_effect.reason);
    if (const auto& e = r->estimate) {
        // Slopes and mean gaps are in the outcome's own units; rate gaps in percentage points.
        const bool slope = e->measure == "slope" || e->measure == "mean_difference";
        const bool mean = e->measure == "mean_difference";
        const QString what = e->view == AdjustedEstimate::View::Pooled
                                 ? (mean    ? QObject::tr("pooled difference (Welch)")
                                    : slope ? QObject::tr("pooled slope") : QObject::tr("pooled difference"))
                                 : (mean    ? QObject::tr("fixed-effects difference (HC1 interval)")
                                    : slope ? QObject::tr("within-stratum slope") : QObject::tr("standardised gap"));
        QStringList over;
        for (const auto& n : e->over) over << qs(n);
        const Estimate value{e->estimate, e->ci_low, e->ci_high};
        const QString est = slope ? format_estimate(value) : format_points(value);
        v.adjusted = over.isEmpty() ? QObject::tr("%1: %2").arg(what, est)
                                    : QObject::tr("%1 over %2: %3").arg(what, over.join(QStringLiteral(" × ")), est);
    } else if (!r->estimate_problem.empty()) {
        v.adjusted = QObject::tr("not computed: %1").arg(qs(r->estimate_problem));
    }
    return v;
}

namespace {

/// The memo's content, built by core/report exactly as `foldline memo` builds it.
report::MemoContent memo_content(const MemoRequest& request) {
    const ScanResult& scan = *request.scan;
    project::Project proj;
    if (request.project) {
        proj = *request.project;
    } else {
        proj.memo.title = request.title.toStdString();
        if (request.diagram) proj.diagrams.push_back({"as drawn", *request.diagram});
        for (const FindingView& f : request.reviewed) {
            if (f.decision == Decision::Undecided && f.note.isEmpty()) continue;
            std::vector<std::string> strata;
            for (const QString& s : f.strata) strata.push_back(s.toStdString());
            const std::string a = f.focal.toStdString(), b = f.reference.toStdString();
            project::FindingReview& r =
                proj.review_for(f.slope ? project::slope_key(strata, a, b) : project::rate_key(strata, a, b));
            r.decision = f.decision;
            r.note = f.note.toStdString();
            r.applied_from = f.applied_from.toStdString();
        }
    }
    DataInfo data;
    data.path = request.data_path.toStdString();
    data.rows = request.rows;
    if (request.database) {
        data.database = request.database;
        data.rows = request.database->rows;
    } else if (request.project) {
        // The file's digest as the workbench computed it on a worker (MainWindow::data_digest);
        // the memo never hashes on the calling (GUI) thread.
        data.sha256 = request.project->data.sha256;
    }
    // The verdicts of the diagram as drawn now, attached by core/audit as `foldline run` does.
    ScanResult judged = scan;
    if (const causal::Diagram* d = proj.diagram())
        audit::attach_verdicts(judged, request.table, *d, audit::estimate_settings(proj));
    if (request.diagram_checks) judged.diagram_checks = request.diagram_checks;
    const std::string date =
        (request.date.isEmpty() ? QString::fromStdString(audit::today()) : request.date).toStdString();
    report::MemoInput in = audit::memo_input(judged, data, &proj, request.table, date, request.data_change.toStdString());
    in.draft_diagram = request.draft_diagram && !proj.diagram();
    return report::build_memo(in);
}

}  // namespace

Status export_memo(const MemoRequest& request, const QString& path) {
    if (!request.scan) return make_error("the memo needs a finished scan", path.toStdString());
    return write_memo_pdf(memo_content(request), path.toStdString());
}

QImage memo_preview(const MemoRequest& request, int width_px) {
    if (!request.scan || width_px <= 0) return {};
    return memo_page_image(memo_content(request), 1, width_px);
}

bool database_available() {
#ifdef FOLDLINE_HAS_ODBC
    return true;
#else
    return false;
#endif
}

namespace {

bool has_password(const QString& connection) { return connection_has_password(connection.toStdString()); }

}  // namespace

QStringList check_database_request(const DatabaseRequest& r) {
    QStringList problems;
    QString conn = r.connection.trimmed();
    if (conn.startsWith(QLatin1String("odbc:"), Qt::CaseInsensitive)) conn = conn.mid(5);
    if (conn.isEmpty()) problems << QObject::tr("Give a connection string, for example DSN=warehouse; or Driver=...;Server=...;Database=...;Uid=...;");
    if (has_password(conn))
        problems << QObject::tr("Leave the password out of the connection string: type it into the password field or name an environment variable that holds it (neither is ever saved).");
    if (r.table.trimmed().isEmpty() == r.query.trimmed().isEmpty())
        problems << QObject::tr("Give either a table or a query, not both.");
    sql::SqlSource src{r.table.trimmed().toStdString(), r.query.trimmed().toStdString()};
    if (!src.table.empty() != !src.query.empty()) {
        if (auto f = sql::from_clause(src); !f) problems << QString::fromStdString(f.error().message);
    }
    if (r.password.isEmpty() && !r.password_env.trimmed().isEmpty() &&
        qEnvironmentVariableIsEmpty(r.password_env.trimmed().toLocal8Bit().constData()))
        problems << QObject::tr("The environment variable %1 is not set.").arg(r.password_env.trimmed());
    return problems;
}

QString masked_connection(const QString& connection) {
#ifdef FOLDLINE_HAS_ODBC
    return QString::fromStdString(redact_connection_string(connection.toStdString()));
#else
    return connection;
#endif
}

Result<Table> load_database(const DatabaseRequest& r, const Work& work, DatabaseRecord* record) {
#ifdef FOLDLINE_HAS_ODBC
    if (const QStringList problems = check_database_request(r); !problems.isEmpty())
        return make_error(problems.join(QLatin1Char(' ')).toStdString());
    QString conn = r.connection.trimmed();
    if (conn.startsWith(QLatin1String("odbc:"), Qt::CaseInsensitive)) conn = conn.mid(5);
    QString password = r.password;
    if (password.isEmpty() && !r.password_env.trimmed().isEmpty())
        password = qEnvironmentVariable(r.password_env.trimmed().toLocal8Bit().constData());
    OdbcOptions o;
    o.connection = connection_with_password(conn.toStdString(), password.toStdString());
    o.source.table = r.table.trimmed().toStdString();
    o.source.query = r.query.trimmed().toStdString();
    o.all_columns = true;
    auto cells = read_odbc_cells(o, work);
    std::fill(o.connection.begin(), o.connection.end(), '\0');  // the password leaves memory with the call
    if (!cells) return cells.error();
    if (record) {
        record->connection = redact_connection_string(conn.toStdString());
        record->driver = cells->driver;
        record->database = cells->database;
        record->table = o.source.table;
        record->query = o.source.query;
        record->rows = cells->source_rows;
        record->queried_at = cells->queried_at;
    }
    return std::move(cells->table);
#else
    (void)r, (void)work, (void)record;
    return make_error("this build has no database support (install unixodbc-dev and rebuild)");
#endif
}

QString hidden_group_note(const ScanResult* r) {
    return r && r->latent ? qs(r->latent->note) : QString();
}

}  // namespace foldline::ui
