// Core headers first: they use `slots` as a name, which Qt defines as a keyword macro.
#include "core/io/csv_reader.h"
#include "core/io/odbc_connection.h"
#include "core/io/sql_pushdown.h"
#ifdef FOLDLINE_HAS_ODBC
#include "core/io/odbc_source.h"
#endif
#include "core/scan/candidates.h"
#include "core/scan/estimate_over.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"
#include "core/scan/slope_scan.h"
#include "core/common/sha256.h"
#include "core/io/project_file.h"
#include "core/report/memo_content.h"
#include "core/causal/verdict.h"
#include "ui/memo/memo_writer.h"

#include "ui/engine.h"

#include <QDate>
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

/// Up to this many points of a slope finding are drawn; more are thinned evenly.
constexpr std::size_t kMaxPoints = 4000;

FindingView to_view(const SlopeFinding& sf, const Table& t, const std::vector<const Column*>& strata) {
    FindingView f;
    f.slope = true;
    f.cls = sf.finding_class;
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
    f.stability = sf.stability_draws > 0 ? sf.stability : kNaN;
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
    // Points and per-stratum centres for drawing: a line of known slope needs one point it
    // passes through, and a least-squares line passes through the group's mean (x, y).
    const Column* xc = t.column(sf.x);
    const Column* yc = t.column(sf.y);
    std::size_t groups = sf.groups.size();
    std::vector<double> sx(groups, 0), sy(groups, 0), sn(groups, 0);
    double px = 0, py = 0, pn = 0;
    std::size_t usable = 0;
    // Joint code of the strata → index of the finding's group, built once from the level labels.
    std::vector<std::size_t> radix;
    std::size_t combos = 1;
    for (const Column* c : strata) {
        radix.push_back(combos);
        combos *= c->levels.size() + 1;
    }
    std::vector<int> group_at(combos, -1);
    for (std::size_t k = 0; k < combos && !strata.empty(); ++k) {
        std::vector<std::string> labels;
        for (std::size_t s = 0; s < strata.size(); ++s) {
            const std::size_t code = (k / radix[s]) % (strata[s]->levels.size() + 1);
            labels.push_back(code < strata[s]->levels.size() ? strata[s]->levels[code] : std::string("(missing)"));
        }
        for (std::size_t g = 0; g < groups; ++g)
            if (sf.groups[g].levels == labels) group_at[k] = int(g);
    }
    auto group_of = [&](std::size_t i) -> int {
        if (strata.empty()) return -1;
        std::size_t k = 0;
        for (std::size_t s = 0; s < strata.size(); ++s) k += radix[s] * strata[s]->code(i);
        return group_at[k];
    };
    if (xc && yc && xc->is_numeric() && yc->is_numeric()) {
        for (std::size_t i = 0; i < t.rows; ++i)
            if (!std::isnan(xc->values[i]) && !std::isnan(yc->values[i])) ++usable;
        const std::size_t stride = std::max<std::size_t>(1, usable / kMaxPoints + (usable % kMaxPoints ? 1 : 0));
        std::size_t k = 0;
        for (std::size_t i = 0; i < t.rows; ++i) {
            const double x = xc->values[i], y = yc->values[i];
            if (std::isnan(x) || std::isnan(y)) continue;
            const int g = group_of(i);
            const double w = t.weight(i);
            if (g >= 0) sx[std::size_t(g)] += w * x, sy[std::size_t(g)] += w * y, sn[std::size_t(g)] += w;
            px += w * x, py += w * y, pn += w;
            if (k++ % stride == 0) {
                f.points.push_back({x, y});
                f.point_stratum.push_back(g);
            }
        }
        f.points_note = stride > 1 ? QObject::tr("%L1 of %L2 points drawn (1 row in %3); the lines are fitted to every row")
                                         .arg(qulonglong(f.points.size())).arg(qulonglong(usable)).arg(stride)
                                   : QObject::tr("all %L1 points drawn").arg(qulonglong(usable));
    }
    if (pn > 0 && std::isfinite(f.crude.value)) f.pooled_intercept = py / pn - f.crude.value * px / pn;
    for (std::size_t g = 0; g < groups; ++g) {
        const SlopeGroup& sg = sf.groups[g];
        SlopeRow r;
        r.level = qs(sg.level);
        r.n = sg.n;
        r.slope = {sg.slope, sg.ci_low, sg.ci_high};
        if (sn[g] > 0 && std::isfinite(sg.slope)) r.intercept = sy[g] / sn[g] - sg.slope * sx[g] / sn[g];
        f.slope_rows.push_back(std::move(r));
    }
    return f;
}

SlopeQuestion slope_question(const QuestionSpec& q) {
    SlopeQuestion sq;
    sq.x = q.exposure.toStdString();
    sq.y = q.outcome.toStdString();
    for (const QString& c : q.covariates) sq.covariates.push_back(c.toStdString());
    sq.alpha = q.alpha;
    sq.bootstrap = q.bootstrap;
    sq.seed = q.seed;
    return sq;
}

Result<ScanOutcome> run_slope_scan(const Table& t, const QuestionSpec& q, const Work& work,
                                   const std::function<void(FindingView)>& on_provisional) {
    const SlopeQuestion sq = slope_question(q);
    CandidateOptions copts;
    copts.bins = q.bins;
    // A covariate adjusts the slopes; it does not also stratify them.
    for (const QString& c : q.candidates)
        if (!q.covariates.contains(c)) copts.columns.push_back(c.toStdString());
    std::vector<std::string> skip = {sq.x, sq.y};
    skip.insert(skip.end(), sq.covariates.begin(), sq.covariates.end());
    auto candidates = select_candidates(t, skip, copts, nullptr);
    if (!candidates) return candidates.error();
    std::vector<const Column*> cols;
    for (const Candidate& c : candidates->candidates) cols.push_back(c.column);
    auto findings = scan_slopes(t, sq, cols, q.pairs, work);
    ScanOutcome out;
    if (!findings) {
        if (work.cancelled()) {
            out.cancelled = true;
            return out;
        }
        return findings.error();
    }
    // The same result `foldline scan` builds for a slope question (app/cli slope_audit): the
    // scan's FDR step and ranking, so the workbench, its memo and the CLI agree finding by finding.
    auto result = std::make_shared<ScanResult>();
    result->slope_question = sq;
    result->excluded = candidates->excluded;
    for (const Candidate& c : candidates->candidates) {
        result->candidates.push_back(c.name);
        result->candidate_origin.push_back(c.origin);
    }
    result->rows = t.total_weight();
    result->alpha = sq.alpha;
    result->seed = sq.seed;
    result->slope_findings = std::move(*findings);
    apply_fdr(*result);
    rank_findings(*result);
    for (const SlopeFinding& f : result->slope_findings) {
        std::vector<const Column*> strata;
        for (const auto& name : f.strata)
            for (const Candidate& c : candidates->candidates)
                if (c.name == name) strata.push_back(c.column);
        FindingView v = to_view(f, t, strata);
        if (on_provisional) on_provisional(v);
        out.findings.push_back(std::move(v));
    }
    for (const Exclusion& e : candidates->excluded) out.excluded << qs(e.column) + QStringLiteral(": ") + qs(e.reason);
    out.result = std::move(result);
    return out;
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
    if (q.slope)
        for (const QString& c : q.covariates) skip.push_back(c.toStdString());
    CandidateOptions opts;
    opts.bins = q.bins;
    auto set = select_candidates(t, skip, opts, q.slope ? nullptr : t.column(q.exposure.toStdString()));
    if (!set) return out;
    for (const Column& c : t.columns) {
        const std::string& name = c.name;
        CandidateView v{qs(name), false, {}, {}};
        if (std::find(skip.begin(), skip.end(), name) != skip.end()) {
            v.reason = qs(name) == q.outcome    ? QObject::tr("the outcome")
                       : qs(name) == q.exposure ? QObject::tr("the compared groups")
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

QStringList check_question(const Table& t, const QuestionSpec& q) {
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
        if (q.alpha <= 0 || q.alpha >= 0.5) problems << QObject::tr("Alpha must lie between 0 and 0.5.");
        return problems;
    }
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
    if (q.slope) return run_slope_scan(t, q, work, on_provisional);
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
    out.result = std::make_shared<const ScanResult>(*result);
    for (const RateFinding& r : result->rate_findings) out.findings.push_back(to_view(r));
    for (const Exclusion& e : result->excluded) out.excluded << qs(e.column) + QStringLiteral(": ") + qs(e.reason);
    return out;
}

Result<FindingView> adjusted_over(const Table& t, const QuestionSpec& q, const QStringList& set) {
    if (set.isEmpty()) return make_error("the empty set needs no adjustment: the pooled figure applies");
    std::vector<std::string> names;
    for (const QString& s : set) names.push_back(s.toStdString());
    FindingView f;
    f.strata = set;
    f.slope = q.slope;
    Result<EstimateOver> e = make_error("not computed");
    if (q.slope) {
        f.adjusted_name = QObject::tr("within-stratum slope");
        e = within_slope_over(t, slope_question(q), names, q.bins);
    } else {
        f.adjusted_name = QObject::tr("standardised difference");
        auto question = resolve_question(t, core_spec(q));
        if (!question) return question.error();
        e = standardised_rd_over(t, encode_rows(t, *question), names, 0, q.alpha, q.bins);
    }
    if (!e) return e.error();
    if (!std::isfinite(e->estimate))
        return make_error(q.slope ? "no joint stratum has spread in the exposure" : "no joint stratum holds both groups");
    f.adjusted = {e->estimate, e->ci_low, e->ci_high};
    return f;
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
        }
    }
    report::MemoInput in;
    in.scan = &scan;
    in.data.path = request.data_path.toStdString();
    in.data.rows = request.rows;
    if (request.database) {
        in.data.database = request.database;
        in.data.rows = request.database->rows;
    } else if (request.project && !request.project->data.sha256.empty()) {
        in.data.sha256 = request.project->data.sha256;
    } else if (auto h = sha256_file(in.data.path)) {
        in.data.sha256 = *h;
    }
    in.project = &proj;
    in.table = request.table;
    in.date = (request.date.isEmpty() ? QDate::currentDate().toString(Qt::ISODate) : request.date).toStdString();
    // Rate verdicts as `foldline run` decides them; slope verdicts are decided inside build_memo.
    if (const causal::Diagram* d = proj.diagram())
        if (auto graph = causal::CausalGraph::build(*d))
            for (const RateFinding& f : scan.rate_findings) {
                auto v = causal::decide(*graph, scan.question.exposure, scan.question.outcome, f.strata);
                in.verdicts.push_back(v ? std::optional<causal::Verdict>(*v) : std::nullopt);
            }
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

}  // namespace foldline::ui
