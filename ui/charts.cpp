#include "ui/charts.h"

#include "core/common/atomic_file.h"

#include <string_view>

#include <QApplication>
#include <QFile>
#include <QFileInfo>
#include <QPalette>
#include <QSvgGenerator>
#include <QTemporaryDir>
#include <qcustomplot.h>

#include "ui/palette.h"

namespace foldline::ui::charts {

namespace {

void reset(QCustomPlot* plot) {
    plot->clearPlottables();
    plot->clearItems();
    plot->clearGraphs();
    plot->plotLayout()->clear();
    auto* rect = new QCPAxisRect(plot);
    plot->plotLayout()->addElement(0, 0, rect);
    plot->xAxis = rect->axis(QCPAxis::atBottom);
    plot->yAxis = rect->axis(QCPAxis::atLeft);
    plot->xAxis2 = rect->axis(QCPAxis::atTop);
    plot->yAxis2 = rect->axis(QCPAxis::atRight);
    plot->legend = new QCPLegend;
    rect->insetLayout()->addElement(plot->legend, Qt::AlignRight | Qt::AlignTop);
    plot->legend->setLayer(QStringLiteral("legend"));
    plot->legend->setVisible(false);
    apply_theme(plot);
}

void theme_axis(QCPAxis* a, const QPalette& p) {
    const QColor fg = p.color(QPalette::WindowText);
    a->setBasePen(QPen(fg));
    a->setTickPen(QPen(fg));
    a->setSubTickPen(QPen(fg));
    a->setTickLabelColor(fg);
    a->setLabelColor(fg);
    QColor grid = colors::muted(p);
    grid.setAlpha(90);
    a->grid()->setPen(QPen(grid, 1, Qt::DotLine));
    a->grid()->setZeroLinePen(Qt::NoPen);
}

void title(QCustomPlot* plot, const QString& text, const QString& note = {}) {
    plot->plotLayout()->insertRow(0);
    auto* t = new QCPTextElement(plot, text, QFont(QApplication::font().family(), QApplication::font().pointSize() + 1, QFont::Bold));
    t->setTextColor(QApplication::palette().color(QPalette::WindowText));
    plot->plotLayout()->addElement(0, 0, t);
    if (!note.isEmpty()) {
        plot->plotLayout()->insertRow(1);
        auto* n = new QCPTextElement(plot, note, QApplication::font());
        n->setTextColor(colors::muted(QApplication::palette()));
        plot->plotLayout()->addElement(1, 0, n);
    }
}

QCPGraph* marker_series(QCustomPlot* plot, QCPAxis* x, QCPAxis* y, QCPScatterStyle::ScatterShape shape,
                        const QColor& c, double size, const QString& name) {
    QCPGraph* g = plot->addGraph(y, x);  // key axis vertical: one row per estimate
    g->setLineStyle(QCPGraph::lsNone);
    g->setScatterStyle(QCPScatterStyle(shape, QPen(c, 1.5), QBrush(c), size));
    g->setName(name);
    return g;
}

QCPErrorBars* error_bars(QCustomPlot* plot, QCPGraph* g, const QColor& c) {
    auto* e = new QCPErrorBars(g->keyAxis(), g->valueAxis());
    e->setDataPlottable(g);
    e->setPen(QPen(c, 1.5));
    e->setWhiskerWidth(6);
    e->removeFromLegend();
    (void)plot;
    return e;
}

}  // namespace

void reset_plot(QCustomPlot* plot) { reset(plot); }

void apply_theme(QCustomPlot* plot) {
    const QPalette p = QApplication::palette();
    plot->setBackground(p.color(QPalette::Base));
    for (QCPAxisRect* r : plot->axisRects()) {
        r->setBackground(p.color(QPalette::Base));
        for (QCPAxis* a : r->axes()) theme_axis(a, p);
    }
    if (plot->legend) {
        plot->legend->setBrush(p.color(QPalette::Base));
        plot->legend->setBorderPen(QPen(colors::muted(p)));
        plot->legend->setTextColor(p.color(QPalette::WindowText));
    }
}

void draw_forest(QCustomPlot* plot, const FindingView& f) {
    reset(plot);
    const QPalette pal = QApplication::palette();
    const QColor fg = pal.color(QPalette::WindowText);
    QSharedPointer<QCPAxisTickerText> ticker(new QCPAxisTickerText);
    // Rows from top: strata in order, a gap, then adjusted and pooled.
    const int n = int(f.rows.size());
    // Rate gaps are drawn in percentage points, as every table and the memo write them.
    const double u = f.slope || f.mean ? 1.0 : 100.0;
    const QColor stratum_colour = colors::accent(pal);  // the blue that reads on light and dark
    auto strata = marker_series(plot, plot->xAxis, plot->yAxis, QCPScatterStyle::ssCircle, stratum_colour, 7,
                                QObject::tr("stratum (95% CI)"));
    QVector<double> k, v, e_lo, e_hi;
    double lo = 0, hi = 0;
    for (int i = 0; i < n; ++i) {
        const GroupRow& r = f.rows[std::size_t(i)];
        const double y = n + 2 - i;
        if (!r.informative || !std::isfinite(r.rd.value)) {
            ticker->addTick(y, r.level + QObject::tr("  (left out)"));
            continue;
        }
        ticker->addTick(y, r.level + QStringLiteral("  (n=%1)").arg(r.n_focal + r.n_reference, 0, 'f', 0));
        k << y;
        v << u * r.rd.value;
        e_lo << (r.rd.has_ci() ? u * (r.rd.value - r.rd.lo) : 0);
        e_hi << (r.rd.has_ci() ? u * (r.rd.hi - r.rd.value) : 0);
        lo = std::min({lo, u * (r.rd.has_ci() ? r.rd.lo : r.rd.value)});
        hi = std::max({hi, u * (r.rd.has_ci() ? r.rd.hi : r.rd.value)});
    }
    strata->setData(k, v);
    error_bars(plot, strata, stratum_colour)->setData(e_lo, e_hi);

    auto add_summary = [&](double y, Estimate e, QCPScatterStyle::ScatterShape shape, const QColor& c,
                           const QString& name) {
        ticker->addTick(y, name);
        if (!std::isfinite(e.value)) return;
        e = {u * e.value, u * e.lo, u * e.hi};
        auto* g = marker_series(plot, plot->xAxis, plot->yAxis, shape, c, 11, name);
        g->setData(QVector<double>{y}, QVector<double>{e.value});
        if (e.has_ci()) {
            error_bars(plot, g, c)->setData(QVector<double>{e.value - e.lo}, QVector<double>{e.hi - e.value});
            lo = std::min(lo, e.lo);
            hi = std::max(hi, e.hi);
        }
        lo = std::min(lo, e.value);
        hi = std::max(hi, e.value);
    };
    add_summary(1, f.adjusted, QCPScatterStyle::ssSquare, colors::okabe_ito(2),
                f.slope || f.mean ? f.adjusted_name : QObject::tr("adjusted (Mantel-Haenszel)"));
    add_summary(0, f.crude, QCPScatterStyle::ssDiamond, colors::focal(), QObject::tr("pooled (crude)"));

    auto* zero = new QCPItemStraightLine(plot);
    zero->point1->setCoords(0, 0);
    zero->point2->setCoords(0, 1);
    zero->setPen(QPen(fg, 1, Qt::DashLine));
    plot->yAxis->setTicker(ticker);
    plot->yAxis->setRange(-0.8, n + 2.8);
    plot->yAxis->grid()->setVisible(false);
    const double pad = std::max(0.02 * u, (hi - lo) * 0.08);
    plot->xAxis->setRange(lo - pad, hi + pad);
    plot->xAxis->setLabel(f.slope || f.mean ? QObject::tr("%1, %2 minus %3").arg(f.effect_name, f.focal, f.reference)
                                  : QObject::tr("%1 in percentage points, %2 minus %3").arg(f.effect_name, f.focal, f.reference));
    title(plot, QObject::tr("Gap within each stratum of %1").arg(f.strata_label()),
          QObject::tr("circle = stratum, diamond = pooled, square = adjusted; bars = 95% CI"));
}

void draw_mix(QCustomPlot* plot, const FindingView& f) {
    reset(plot);
    double nf = 0, nr = 0;
    for (const GroupRow& r : f.rows) nf += r.n_focal, nr += r.n_reference;
    QCPBars* below = nullptr;
    QSharedPointer<QCPAxisTickerText> ticker(new QCPAxisTickerText);
    ticker->addTick(1, f.focal);
    ticker->addTick(2, f.reference);
    const QColor fg = QApplication::palette().color(QPalette::WindowText);
    for (std::size_t i = 0; i < f.rows.size(); ++i) {
        const GroupRow& r = f.rows[i];
        auto* bars = new QCPBars(plot->xAxis, plot->yAxis);
        const QColor c = colors::okabe_ito(int(i));
        bars->setBrush(c);
        bars->setPen(QPen(fg, 0.8));
        bars->setWidth(0.55);
        bars->setName(r.level);
        const double sf = nf > 0 ? r.n_focal / nf : 0, sr = nr > 0 ? r.n_reference / nr : 0;
        bars->setData(QVector<double>{1, 2}, QVector<double>{sf, sr});
        if (below) bars->moveAbove(below);
        // Label each segment with its stratum so colour is not the only key.
        double base_f = 0, base_r = 0;
        for (std::size_t j = 0; j < i; ++j) {
            base_f += nf > 0 ? f.rows[j].n_focal / nf : 0;
            base_r += nr > 0 ? f.rows[j].n_reference / nr : 0;
        }
        for (auto [x, base, share] : {std::tuple{1.0, base_f, sf}, std::tuple{2.0, base_r, sr}}) {
            if (share < 0.06) continue;
            auto* t = new QCPItemText(plot);
            t->position->setCoords(x, base + share / 2);
            t->setText(QStringLiteral("%1  %2%").arg(r.level).arg(100 * share, 0, 'f', 0));
            t->setColor(c.lightness() < 120 ? Qt::white : Qt::black);  // readable on its own segment
            t->setClipToAxisRect(true);
        }
        below = bars;
    }
    plot->xAxis->setTicker(ticker);
    plot->xAxis->setRange(0.4, 2.6);
    plot->yAxis->setRange(0, 1.0);
    plot->yAxis->setLabel(QObject::tr("share of the group"));
    plot->legend->setVisible(f.rows.size() <= 12);
    plot->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignRight | Qt::AlignTop);
    plot->xAxis->setRange(0.4, 3.2);
    title(plot, QObject::tr("How each group is spread over %1").arg(f.strata_label()),
          QObject::tr("different mixes are what let the pooled gap differ from the gaps within"));
}

void draw_decomposition(QCustomPlot* plot, const FindingView& f) {
    reset(plot);
    const QColor fg = QApplication::palette().color(QPalette::WindowText);
    QSharedPointer<QCPAxisTickerText> ticker(new QCPAxisTickerText);
    ticker->addTick(1, QObject::tr("pooled gap"));
    ticker->addTick(2, QObject::tr("within strata"));
    ticker->addTick(3, QObject::tr("composition"));
    const double u = f.slope || f.mean ? 1.0 : 100.0;  // rate gaps in percentage points
    const double vals[3] = {u * f.crude.value, u * f.within, u * f.composition};
    const QColor cols[3] = {colors::focal(), colors::okabe_ito(2), colors::okabe_ito(0)};
    const Qt::BrushStyle styles[3] = {Qt::SolidPattern, Qt::Dense3Pattern, Qt::BDiagPattern};
    double lo = 0, hi = 0;
    for (int i = 0; i < 3; ++i) {
        if (!std::isfinite(vals[i])) continue;
        auto* b = new QCPBars(plot->xAxis, plot->yAxis);
        b->setBrush(QBrush(cols[i], styles[i]));
        b->setPen(QPen(cols[i].darker(130), 1.2));
        b->setWidth(0.6);
        b->setData(QVector<double>{double(i + 1)}, QVector<double>{vals[i]});
        auto* t = new QCPItemText(plot);
        t->position->setCoords(i + 1, vals[i]);
        t->setPositionAlignment(vals[i] >= 0 ? (Qt::AlignHCenter | Qt::AlignBottom) : (Qt::AlignHCenter | Qt::AlignTop));
        t->setText(f.slope || f.mean ? QString::number(vals[i], 'g', 5) : QObject::tr("%1 pp").arg(vals[i], 0, 'f', 1));
        t->setColor(fg);
        lo = std::min(lo, vals[i]);
        hi = std::max(hi, vals[i]);
    }
    auto* zero = new QCPItemStraightLine(plot);
    zero->point1->setCoords(0, 0);
    zero->point2->setCoords(1, 0);
    zero->setPen(QPen(fg, 1));
    plot->xAxis->setTicker(ticker);
    plot->xAxis->setRange(0.4, 3.6);
    const double pad = std::max(0.01 * u, (hi - lo) * 0.25);
    plot->yAxis->setRange(lo - pad, hi + pad);
    plot->yAxis->setLabel(f.slope || f.mean ? f.effect_name : QObject::tr("%1 (percentage points)").arg(f.effect_name));
    title(plot, QObject::tr("Where the pooled gap comes from"),
          QObject::tr("pooled gap = gap within strata + difference in stratum mix"));
}

void draw_scatter(QCustomPlot* plot, const FindingView& f) {
    reset(plot);
    const QColor fg = QApplication::palette().color(QPalette::WindowText);
    const auto shapes = {QCPScatterStyle::ssCircle, QCPScatterStyle::ssCross, QCPScatterStyle::ssTriangle,
                         QCPScatterStyle::ssSquare, QCPScatterStyle::ssPlus, QCPScatterStyle::ssDiamond};
    std::vector<QCPScatterStyle::ScatterShape> shape(shapes);
    double xmin = std::numeric_limits<double>::max(), xmax = -xmin;
    for (const QPointF& p : f.points) xmin = std::min(xmin, p.x()), xmax = std::max(xmax, p.x());
    if (f.points.empty()) xmin = 0, xmax = 1;
    for (std::size_t s = 0; s < f.slope_rows.size(); ++s) {
        QVector<double> x, y;
        for (std::size_t i = 0; i < f.points.size(); ++i)
            if (i < f.point_stratum.size() && f.point_stratum[i] == int(s)) x << f.points[i].x(), y << f.points[i].y();
        const QColor c = colors::okabe_ito(int(s));
        auto* g = plot->addGraph();
        g->setLineStyle(QCPGraph::lsNone);
        g->setScatterStyle(QCPScatterStyle(shape[s % shape.size()], QPen(c), QBrush(Qt::NoBrush), 5));
        g->setData(x, y);
        g->setName(f.slope_rows[s].level);
        const SlopeRow& r = f.slope_rows[s];
        if (std::isfinite(r.slope.value) && std::isfinite(r.intercept) && !x.isEmpty()) {
            // Each stratum's line spans only that stratum's points.
            const double a = *std::min_element(x.begin(), x.end()), b = *std::max_element(x.begin(), x.end());
            auto* line = plot->addGraph();
            line->setPen(QPen(c, 2));
            line->setData(QVector<double>{a, b}, QVector<double>{r.intercept + r.slope.value * a, r.intercept + r.slope.value * b});
            line->removeFromLegend();
        }
    }
    if (std::isfinite(f.crude.value) && std::isfinite(f.pooled_intercept)) {
        auto* pooled = plot->addGraph();
        pooled->setPen(QPen(fg, 2.5, Qt::DashLine));
        pooled->setData(QVector<double>{xmin, xmax},
                        QVector<double>{f.pooled_intercept + f.crude.value * xmin, f.pooled_intercept + f.crude.value * xmax});
        pooled->setName(QObject::tr("pooled line (dashed)"));
    }
    plot->rescaleAxes();
    plot->xAxis->setLabel(f.focal);
    plot->yAxis->setLabel(f.reference);
    plot->legend->setVisible(f.slope_rows.size() <= 8);
    plot->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignLeft | Qt::AlignTop);
    title(plot, QObject::tr("Pooled and within-stratum slopes by %1").arg(f.strata_label()),
          f.points_note.isEmpty() ? QObject::tr("every point drawn") : f.points_note);
}

void draw_small_multiples(QCustomPlot* plot, const FindingView& f) {
    plot->clearPlottables();
    plot->clearItems();
    plot->plotLayout()->clear();
    const int n = int(f.slope_rows.size());
    const int cols = std::max(1, int(std::ceil(std::sqrt(double(n)))));
    for (int s = 0; s < n; ++s) {
        auto* rect = new QCPAxisRect(plot);
        plot->plotLayout()->addElement(s / cols, s % cols, rect);
        const QColor c = colors::okabe_ito(s);
        QVector<double> x, y;
        for (std::size_t i = 0; i < f.points.size(); ++i)
            if (i < f.point_stratum.size() && f.point_stratum[i] == s) x << f.points[i].x(), y << f.points[i].y();
        auto* g = plot->addGraph(rect->axis(QCPAxis::atBottom), rect->axis(QCPAxis::atLeft));
        g->setLineStyle(QCPGraph::lsNone);
        g->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssCircle, QPen(c), QBrush(Qt::NoBrush), 4));
        g->setData(x, y);
        g->rescaleAxes();
        const SlopeRow& r = f.slope_rows[std::size_t(s)];
        if (!x.isEmpty() && std::isfinite(r.slope.value)) {
            const double a = *std::min_element(x.begin(), x.end()), b = *std::max_element(x.begin(), x.end());
            auto* line = plot->addGraph(rect->axis(QCPAxis::atBottom), rect->axis(QCPAxis::atLeft));
            line->setPen(QPen(c.darker(120), 2));
            line->setData(QVector<double>{a, b}, QVector<double>{r.intercept + r.slope.value * a, r.intercept + r.slope.value * b});
        }
        rect->axis(QCPAxis::atTop)->setVisible(true);
        rect->axis(QCPAxis::atTop)->setTicks(false);
        rect->axis(QCPAxis::atTop)->setLabel(QObject::tr("%1: slope %2 (n=%3)").arg(r.level).arg(r.slope.value, 0, 'f', 3).arg(r.n, 0, 'f', 0));
    }
    apply_theme(plot);
}

Status save(QCustomPlot* plot, const QString& path, const QString& heading) {
    const QString ext = QFileInfo(path).suffix().toLower();
    if (ext != QLatin1String("png") && ext != QLatin1String("pdf") && ext != QLatin1String("svg"))
        return make_error("expected a file name ending in .png, .svg or .pdf", path.toStdString());
    // The heading is drawn for the file only: a row above the chart, taken away afterwards.
    QCPTextElement* head = nullptr;
    if (!heading.isEmpty()) {
        plot->plotLayout()->insertRow(0);
        head = new QCPTextElement(plot, heading, QApplication::font());
        head->setTextColor(QApplication::palette().color(QPalette::WindowText));
        plot->plotLayout()->addElement(0, 0, head);
    }
    struct Restore {
        QCustomPlot* plot;
        QCPTextElement* head;
        ~Restore() {
            if (!head) return;
            plot->plotLayout()->remove(head);
            plot->plotLayout()->simplify();
        }
    } restore{plot, head};
    // QCustomPlot and QSvgGenerator write straight to the file they are given, so a failure
    // half-way (a full disk) would leave a broken chart over the previous one: draw into a
    // scratch file first, then put its bytes in place with the shared atomic writer.
    QTemporaryDir scratch;
    if (!scratch.isValid()) return make_error("cannot create a scratch folder to draw the chart in", path.toStdString());
    const QString drawn = scratch.filePath(QStringLiteral("chart.") + ext);
    bool ok = false;
    const int w = plot->width() > 50 ? plot->width() : 900, h = plot->height() > 50 ? plot->height() : 600;
    if (ext == QLatin1String("png")) {
        ok = plot->savePng(drawn, w, h, 2.0);
    } else if (ext == QLatin1String("pdf")) {
        ok = plot->savePdf(drawn, w, h);
    } else {
        QSvgGenerator gen;
        gen.setFileName(drawn);
        gen.setSize(QSize(w, h));
        gen.setViewBox(QRect(0, 0, w, h));
        gen.setTitle(QStringLiteral("Foldline chart"));
        QCPPainter painter;
        ok = painter.begin(&gen);
        if (ok) {
            plot->toPainter(&painter, w, h);
            ok = painter.end();
        }
    }
    QFile file(drawn);
    if (!ok || !file.open(QIODevice::ReadOnly) || file.size() == 0)
        return make_error("could not draw the chart (is the disk full?)", path.toStdString());
    const QByteArray bytes = file.readAll();
    return write_file_atomically(path.toStdString(), std::string_view(bytes.constData(), static_cast<std::size_t>(bytes.size())));
}

}  // namespace foldline::ui::charts
