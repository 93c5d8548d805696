#include "ui/mean_charts.h"

#include <QApplication>
#include <qcustomplot.h>

#include "ui/charts.h"
#include "ui/palette.h"

namespace foldline::ui::charts {

namespace {

/// One group's means as markers with error bars on rows `keys` (vertical key axis).
void add_group(QCustomPlot* plot, const QVector<double>& keys, const QVector<double>& values,
               const QVector<double>& lo, const QVector<double>& hi, QCPScatterStyle::ScatterShape shape,
               const QColor& c, const QString& name) {
    QCPGraph* g = plot->addGraph(plot->yAxis, plot->xAxis);
    g->setLineStyle(QCPGraph::lsNone);
    g->setScatterStyle(QCPScatterStyle(shape, QPen(c, 1.5), QBrush(c), 8));
    g->setName(name);
    g->setData(keys, values);
    auto* e = new QCPErrorBars(g->keyAxis(), g->valueAxis());
    e->setDataPlottable(g);
    e->setPen(QPen(c, 1.5));
    e->setWhiskerWidth(5);
    e->removeFromLegend();
    e->setData(lo, hi);
}

}  // namespace

void draw_group_means(QCustomPlot* plot, const FindingView& f) {
    reset_plot(plot);
    QSharedPointer<QCPAxisTickerText> ticker(new QCPAxisTickerText);
    const int n = int(f.rows.size());
    QVector<double> kf, vf, lf, hf, kr, vr, lr, hr;
    double lo = std::numeric_limits<double>::max(), hi = -lo;
    auto put = [&](double y, const GroupRow& r, const QString& label) {
        ticker->addTick(y, label);
        auto one = [&](const Estimate& m, double key, QVector<double>& k, QVector<double>& v, QVector<double>& l,
                       QVector<double>& h) {
            if (!std::isfinite(m.value)) return;
            k << key;
            v << m.value;
            l << (m.has_ci() ? m.value - m.lo : 0);
            h << (m.has_ci() ? m.hi - m.value : 0);
            lo = std::min(lo, m.has_ci() ? m.lo : m.value);
            hi = std::max(hi, m.has_ci() ? m.hi : m.value);
        };
        one(r.mean_focal, y + 0.15, kf, vf, lf, hf);
        one(r.mean_reference, y - 0.15, kr, vr, lr, hr);
    };
    for (int i = 0; i < n; ++i) {
        const GroupRow& r = f.rows[std::size_t(i)];
        put(n + 1 - i, r,
            r.informative ? r.level + QStringLiteral("  (n=%1)").arg(r.n_focal + r.n_reference, 0, 'f', 0)
                          : r.level + QObject::tr("  (left out)"));
    }
    put(0, f.pooled, QObject::tr("pooled (all strata)"));
    add_group(plot, kf, vf, lf, hf, QCPScatterStyle::ssCircle, colors::focal(), f.focal + QObject::tr(" (focal)"));
    add_group(plot, kr, vr, lr, hr, QCPScatterStyle::ssTriangle, colors::accent(QApplication::palette()),
              f.reference + QObject::tr(" (reference)"));
    plot->yAxis->setTicker(ticker);
    plot->yAxis->setRange(-0.8, n + 1.8);
    plot->yAxis->grid()->setVisible(false);
    if (lo > hi) lo = 0, hi = 1;
    const double pad = std::max(1e-9, (hi - lo) * 0.08);
    plot->xAxis->setRange(lo - pad, hi + pad);
    plot->xAxis->setLabel(QObject::tr("mean %1 with 95% interval").arg(f.outcome));
    plot->legend->setVisible(true);
    // Bottom left: beside the pooled row, clear of the strata's markers in most data.
    plot->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignLeft | Qt::AlignBottom);
    plot->plotLayout()->insertRow(0);
    auto* t = new QCPTextElement(plot, QObject::tr("Group means within each stratum of %1, pooled below").arg(f.strata_label()),
                                 QFont(QApplication::font().family(), QApplication::font().pointSize() + 1, QFont::Bold));
    t->setTextColor(QApplication::palette().color(QPalette::WindowText));
    plot->plotLayout()->addElement(0, 0, t);
}

}  // namespace foldline::ui::charts
