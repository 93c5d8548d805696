#include "core/report/mean_summary.h"
#include "ui/mean_view.h"

#include <QObject>

#include "ui/findings_model.h"

namespace foldline::ui {

namespace {

QString qs(const std::string& s) { return QString::fromStdString(s); }

Estimate gap(const stats::GapEstimate& e) { return {e.estimate, e.ci_low, e.ci_high}; }
Estimate group_mean(const stats::GroupMean& g) { return {g.mean, g.ci_low, g.ci_high}; }

QString number(double v, int digits = 3) {
    return std::isfinite(v) ? QString::number(v, 'f', digits) : QStringLiteral("—");
}
QString pval(double p) { return std::isfinite(p) ? QString::number(p, 'g', 3) : QStringLiteral("—"); }
QString percent(double v) {
    return std::isfinite(v) ? QStringLiteral("%1%").arg(v, 0, 'f', 1) : QStringLiteral("—");
}

}  // namespace

QString pay_review_caution() { return QString::fromUtf8(kPayReviewCaution); }

FindingView mean_view(const MeanFinding& m) {
    FindingView f;
    f.mean = true;
    f.cls = m.cls;
    for (const auto& s : m.strata) f.strata << qs(s);
    f.outcome = qs(m.outcome);
    f.focal = qs(m.focal);
    f.reference = qs(m.reference);
    f.effect_name = m.log_outcome ? QObject::tr("difference in mean log %1").arg(f.outcome)
                                  : QObject::tr("difference in mean %1").arg(f.outcome);
    f.adjusted_name = QObject::tr("fixed effects within strata (HC1)");
    f.crude = gap(m.crude.difference);
    f.adjusted = gap(m.fixed_effects.robust);
    f.adjusted.value = m.fixed_effects.estimate;
    f.standardised = gap(m.standardised);
    f.p_value = m.p_reversal;
    f.q_value = m.q_value;
    f.stability = m.stability.share;
    f.within = m.decomposition.within;
    f.composition = m.decomposition.composition;
    GroupRow& p = f.pooled;
    p.level = QObject::tr("all");
    p.n_focal = m.crude.focal.n;
    p.n_reference = m.crude.reference.n;
    p.mean_focal = group_mean(m.crude.focal);
    p.mean_reference = group_mean(m.crude.reference);
    p.sd_focal = m.crude.focal.sd;
    p.sd_reference = m.crude.reference.sd;
    p.rd = f.crude;
    p.selection_ratio = m.crude.ratio;
    for (const MeanStratumRow& s : m.strata_table) {
        GroupRow g;
        g.level = qs(s.level);
        g.n_focal = s.focal.n;
        g.n_reference = s.reference.n;
        g.mean_focal = group_mean(s.focal);
        g.mean_reference = group_mean(s.reference);
        g.sd_focal = s.focal.sd;
        g.sd_reference = s.reference.sd;
        g.rd = gap(s.difference);
        g.informative = s.informative;
        g.reason = qs(s.reason);
        f.rows.push_back(std::move(g));
    }
    const auto& fe = m.fixed_effects;
    f.more = {
        {QObject::tr("Standardised gap"), format_estimate(f.standardised),
         QObject::tr("The difference directly standardised to the pooled mix of the informative strata, normal interval")},
        {QObject::tr("Fixed effects, classical interval"),
         format_estimate({fe.estimate, fe.classical.ci_low, fe.classical.ci_high}),
         QObject::tr("The within-strata difference with its classical (equal-variance) standard error")},
        {QObject::tr("Ratio of pooled means"), number(m.crude.ratio),
         QObject::tr("Focal group's pooled mean divided by the reference group's")},
        {QObject::tr("Interaction F test p"), pval(m.interaction.p),
         QObject::tr("F test of the group × stratum interaction; small values mean the strata disagree")},
        {QObject::tr("Cochran's Q p"), pval(m.cochran_q.p),
         QObject::tr("Cochran's Q of the per-stratum differences; small values mean the strata disagree")},
        {QObject::tr("Reversal p / q"), pval(m.p_reversal) + QStringLiteral(" / ") + pval(m.q_value),
         QObject::tr("Evidence that the pooled (Welch) and within-strata (fixed-effects) gaps point opposite ways "
                     "(intersection-union p) and its false-discovery-rate q-value")},
        {QObject::tr("E-value (estimate / CI)"),
         number(m.sensitivity.e.e.estimate, 2) + QStringLiteral(" / ") + number(m.sensitivity.e.e.ci_limit, 2),
         QObject::tr("For the within-strata difference as a standardised mean difference (VanderWeele & Ding's "
                     "conversion RR = exp(0.91 d), an approximation)")},
    };
    if (m.log_outcome)
        f.more.push_back({QObject::tr("As percentages (pooled / within)"),
                          percent(100 * m.crude_percent.estimate) + QStringLiteral(" / ") +
                              percent(100 * m.fixed_effects_percent.estimate),
                          QObject::tr("exp(d) − 1 of the differences of log outcome")});
    if (m.pay_gap.computed) {
        const auto& g = m.pay_gap;
        f.more.push_back({QObject::tr("Mean / median pay gap"),
                          percent(g.mean_gap_percent) + QStringLiteral(" / ") + percent(g.median_gap_percent),
                          QObject::tr("The gap as a percentage of the reference group's mean and median (medians "
                                      "from the rows)")});
        QStringList flagged;
        for (const auto& l : g.flagged) flagged << qs(l);
        f.more.push_back({QObject::tr("Strata whose gap reaches %1%").arg(g.threshold_percent, 0, 'f', 0),
                          flagged.isEmpty() ? QObject::tr("none") : flagged.join(QStringLiteral(", ")),
                          QObject::tr("Categories of workers whose mean gap reaches the threshold; a reason to look "
                                      "closer, for counsel to judge")});
    }
    return f;
}

}  // namespace foldline::ui
