#include "ui/memo/memo_writer.h"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <functional>

#include <QApplication>
#include <QBuffer>
#include <QFont>
#include <QFontMetricsF>
#include <QImage>
#include <QPainter>
#include <QPainterPath>
#include <QPdfWriter>
#include <QPicture>
#include <QTextLayout>
#include <qcustomplot.h>

#include "core/common/atomic_file.h"
#include "ui/edge_route.h"
#include "ui/layered_layout.h"
#include "ui/role_style.h"

namespace foldline::ui {

using report::MemoChart;
using report::MemoContent;
using report::MemoDiagram;
using report::MemoScatter;
using report::MemoSection;
using report::MemoTable;

namespace {

constexpr int kDpi = 300;
double pt(double points) { return points * kDpi / 72.0; }

// Our palette: ink, rules and the two compared groups; a causal role's fill is ui/role_style's.
const QColor kInk(0x22, 0x26, 0x2B);
const QColor kMuted(0x5F, 0x66, 0x70);
const QColor kRule(0xC9, 0xCE, 0xD4);
const QColor kBand(0xEE, 0xF1, 0xF4);
const QColor kFocal(0x1B, 0x6F, 0x8A);
const QColor kReference(0xD9, 0x8A, 0x2B);
const QColor kAlert(0xA8, 0x32, 0x2D);

bool is_control(char32_t c) {
    if (c == U'\n' || c == U'\t') return false;
    if (c < 0x20 || c == 0x7F || (c >= 0x80 && c <= 0x9F)) return true;
    return c == 0x061C || c == 0x200E || c == 0x200F || (c >= 0x202A && c <= 0x202E) ||
           (c >= 0x2066 && c <= 0x2069);
}

QString q(const std::string& s) { return printable(s); }

// Ligatures (fi, ff) would make the PDF's text read back as "ﬁgures": a search for "figures"
// then fails. Qt's shaper leaves Latin ligatures out when letter spacing is set, so set a
// spacing too small to see.
void no_ligatures(QFont& f) { f.setLetterSpacing(QFont::AbsoluteSpacing, 0.05); }

QString elided(const QString& s, int max) { return s.size() <= max ? s : s.left(max - 1) + QChar(0x2026); }

// ---------------------------------------------------------------------------------------------
// Page flow: places paragraphs, tables and drawings top to bottom, starting a new page (with
// header and footer) when the next piece does not fit. Run once without a painter to count the
// pages, then again to draw.
class Flow {
public:
    /// `only_page` 0: draw every page onto the PDF; n > 0: draw page n alone (a preview image;
    /// the painter then paints on the image, the PDF writer only supplies the metrics).
    Flow(QPdfWriter& pdf, QPainter* painter, const MemoContent& memo, int total_pages, int only_page = 0)
        : pdf_(pdf), p_(painter), memo_(memo), total_(total_pages), only_page_(only_page) {
        page_ = QRectF(0, 0, pdf.width(), pdf.height());
        body_ = page_.adjusted(pt(54), pt(62), -pt(54), -pt(58));
        y_ = body_.top();
        begin_page();
    }

    int pages() const { return page_no_; }
    bool drawing() const { return p_ && (only_page_ == 0 || page_no_ == only_page_); }
    double width() const { return body_.width(); }
    double left() const { return body_.left(); }
    QPaintDevice* device() const { return &pdf_; }
    QPainter* painter() const { return p_; }

    QFont font(double size, bool bold = false, bool italic = false) const {
        QFont f(QStringLiteral("DejaVu Sans"));
        // Pixel size in PDF device units: the same font then draws at the same size on a preview
        // image whose painter is scaled to the page (a point size would follow that device's DPI).
        f.setPixelSize(static_cast<int>(std::lround(pt(size))));
        f.setBold(bold);
        f.setItalic(italic);
        f.setHintingPreference(QFont::PreferNoHinting);
        no_ligatures(f);
        return QFont(f, &pdf_);
    }

    void space(double points) { y_ += pt(points); }
    double remaining() const { return body_.bottom() - y_; }

    void ensure(double height) {
        if (y_ + height > body_.bottom() && y_ > body_.top() + 1) new_page();
    }

    void new_page() {
        if (p_ && only_page_ == 0) pdf_.newPage();
        ++page_no_;
        y_ = body_.top();
        begin_page();
    }

    // Lays out one paragraph (no line breaks inside) at `width`; returns the layout.
    std::unique_ptr<QTextLayout> layout(const QString& text, const QFont& f, double width,
                                        Qt::Alignment align = Qt::AlignLeft,
                                        QTextOption::WrapMode wrap = QTextOption::WrapAtWordBoundaryOrAnywhere) const {
        auto l = std::make_unique<QTextLayout>(text, f, &pdf_);
        QTextOption opt;
        opt.setWrapMode(wrap);
        opt.setTextDirection(Qt::LeftToRight);
        opt.setAlignment(align);
        l->setTextOption(opt);
        l->setCacheEnabled(true);
        l->beginLayout();
        double h = 0;
        while (true) {
            QTextLine line = l->createLine();
            if (!line.isValid()) break;
            line.setLineWidth(width);
            line.setPosition(QPointF(0, h));
            h += line.height();
        }
        l->endLayout();
        return l;
    }

    static double height_of(const QTextLayout& l) {
        double h = 0;
        for (int i = 0; i < l.lineCount(); ++i) h += l.lineAt(i).height();
        return h;
    }

    // A paragraph of plain text; '\n' starts a new line. Breaks between lines across pages.
    void paragraph(const QString& text, const QFont& f, const QColor& color = kInk, double indent = 0,
                   double after = 5) {
        const QStringList parts = text.split('\n');
        for (const QString& part : parts) {
            auto l = layout(part.isEmpty() ? QStringLiteral(" ") : part, f, width() - indent);
            for (int i = 0; i < l->lineCount(); ++i) {
                QTextLine line = l->lineAt(i);
                ensure(line.height());
                if (drawing()) {
                    p_->setPen(color);
                    line.draw(p_, QPointF(left() + indent, y_ - line.position().y()));
                }
                y_ += line.height();
            }
        }
        space(after);
    }

    void heading(const QString& text, double size, double keep_with_next_points) {
        ensure(pt(size * 1.6) + pt(keep_with_next_points));
        space(size * 0.4);
        paragraph(text, font(size, true), kInk, 0, size * 0.35);
    }

    // A labelled paragraph: the label bold, the text after it.
    void labelled(const QString& label, const QString& text, double after = 5) {
        paragraph(label, font(8.5, true), kMuted, 0, 1);
        paragraph(text, font(9.5), kInk, 0, after);
    }

    void table(const MemoTable& t, double size = 8) {
        const std::size_t n = t.header.size();
        if (n == 0) return;
        double total = 0;
        for (std::size_t c = 0; c < n; ++c) total += c < t.widths.size() ? t.widths[c] : 1.0;
        std::vector<double> w(n);
        for (std::size_t c = 0; c < n; ++c) w[c] = width() * (c < t.widths.size() ? t.widths[c] : 1.0) / total;
        const double pad = pt(3);
        const QFont body = font(size);
        // Headers break between words only: when a header's longest word is wider than its
        // column, the whole header row is set smaller (down to 6 pt) rather than split a word.
        double head_size = size;
        auto widest_word_fits = [&](const QFont& f) {
            const QFontMetricsF m(f, &pdf_);
            for (std::size_t c = 0; c < n; ++c)
                for (const QString& word : q(t.header[c]).split(QLatin1Char(' '), Qt::SkipEmptyParts))
                    if (m.horizontalAdvance(word) > w[c] - 2 * pad) return false;
            return true;
        };
        while (head_size > 6 && !widest_word_fits(font(head_size, true))) head_size -= 0.5;
        const QFont head = font(head_size, true);

        auto row_layouts = [&](const std::vector<std::string>& cells, const QFont& f,
                               std::vector<std::unique_ptr<QTextLayout>>& out) {
            out.clear();
            double h = 0;
            const bool header = &cells == &t.header;
            for (std::size_t c = 0; c < n; ++c) {
                const QString text = c < cells.size() ? q(cells[c]) : QString();
                const bool right = c < t.numeric.size() && t.numeric[c];
                out.push_back(layout(text, f, w[c] - 2 * pad, right ? Qt::AlignRight : Qt::AlignLeft,
                                     header ? QTextOption::WordWrap : QTextOption::WrapAtWordBoundaryOrAnywhere));
                h = std::max(h, height_of(*out.back()));
            }
            return h + 2 * pad;
        };
        auto draw_row = [&](std::vector<std::unique_ptr<QTextLayout>>& ls, double h, bool header, bool shade) {
            if (drawing()) {
                if (header) p_->fillRect(QRectF(left(), y_, width(), h), kBand);
                else if (shade) p_->fillRect(QRectF(left(), y_, width(), h), QColor(0xF8, 0xF9, 0xFA));
                p_->setPen(QPen(kRule, pt(0.5)));
                p_->drawLine(QPointF(left(), y_ + h), QPointF(left() + width(), y_ + h));
                double x = left();
                p_->setPen(header ? kInk : kInk);
                for (std::size_t c = 0; c < n; ++c) {
                    ls[c]->draw(p_, QPointF(x + pad, y_ + pad));
                    x += w[c];
                }
            }
            y_ += h;
        };
        std::vector<std::unique_ptr<QTextLayout>> hl, rl;
        const double hh = row_layouts(t.header, head, hl);
        ensure(hh * 2.2);
        draw_row(hl, hh, true, false);
        for (std::size_t r = 0; r < t.rows.size(); ++r) {
            const double h = row_layouts(t.rows[r], body, rl);
            if (y_ + h > body_.bottom()) {
                new_page();
                row_layouts(t.header, head, hl);
                draw_row(hl, hh, true, false);
            }
            draw_row(rl, h, false, r % 2 == 1);
        }
        space(6);
    }

    // A drawing of fixed height, kept on one page.
    void block(double height, const std::function<void(QPainter&, const QRectF&)>& draw) {
        ensure(height);
        if (drawing()) {
            p_->save();
            draw(*p_, QRectF(left(), y_, width(), height));
            p_->restore();
        }
        y_ += height;
    }

private:
    void begin_page() {
        if (!drawing()) return;
        QPainter& p = *p_;
        const QFont small = font(7.5);
        p.setFont(small);
        p.setPen(kMuted);
        const double top = pt(30);
        const QRectF head(body_.left(), top, body_.width(), pt(14));
        p.drawText(head, Qt::AlignLeft | Qt::AlignVCenter,
                   elided(q(memo_.title.empty() ? std::string("Audit memo") : memo_.title), 90));
        p.drawText(head, Qt::AlignRight | Qt::AlignVCenter, QStringLiteral("Foldline audit memo"));
        p.setPen(QPen(kRule, pt(0.6)));
        p.drawLine(QPointF(body_.left(), top + pt(16)), QPointF(body_.right(), top + pt(16)));
        const double bottom = page_.bottom() - pt(34);
        p.drawLine(QPointF(body_.left(), bottom), QPointF(body_.right(), bottom));
        const QRectF foot(body_.left(), bottom + pt(3), body_.width(), pt(14));
        p.setPen(kMuted);
        p.drawText(foot, Qt::AlignLeft | Qt::AlignVCenter, q(memo_.date));
        p.drawText(foot, Qt::AlignHCenter | Qt::AlignVCenter,
                   QStringLiteral("Page %1 of %2").arg(page_no_).arg(std::max(total_, page_no_)));
        p.drawText(foot, Qt::AlignRight | Qt::AlignVCenter,
                   QStringLiteral("A statistical screen, not a legal or clinical determination"));
    }

    QPdfWriter& pdf_;
    QPainter* p_;
    const MemoContent& memo_;
    int total_;
    int only_page_;
    int page_no_ = 1;
    QRectF page_, body_;
    double y_ = 0;
};

// ---------------------------------------------------------------------------------------------
// Charts: QCustomPlot paints into a QPicture (vector commands, text kept as text), which is
// replayed scaled onto the PDF page. Fonts use pixel sizes so they scale with the picture.

QFont chart_font(int px, bool bold = false) {
    QFont f(QStringLiteral("DejaVu Sans"));
    f.setPixelSize(px);
    f.setBold(bold);
    no_ligatures(f);
    return f;
}

void style_axis(QCPAxis* a) {
    a->setTickLabelFont(chart_font(11));
    a->setLabelFont(chart_font(11));
    a->setBasePen(QPen(kMuted, 1));
    a->setTickPen(QPen(kMuted, 1));
    a->setSubTickPen(QPen(kMuted, 1));
    a->setTickLabelColor(kInk);
    a->setLabelColor(kInk);
    a->grid()->setPen(QPen(QColor(0xE2, 0xE5, 0xE9), 1, Qt::DotLine));
}

// Many strata: number them (the side-by-side table gives the names in the same order).
constexpr std::size_t kMaxNamedCategories = 16;

QSharedPointer<QCPAxisTickerText> category_ticker(const MemoChart& c, std::size_t first) {
    QSharedPointer<QCPAxisTickerText> t(new QCPAxisTickerText);
    const bool numbered = c.points.size() - 1 > kMaxNamedCategories;
    for (std::size_t i = first; i < c.points.size(); ++i) {
        const QString label = numbered && i > 0 ? QString::number(i) : elided(q(c.points[i].label), 22);
        if (!numbered || i == 0 || i % 5 == 0) t->addTick(static_cast<double>(i), label);
    }
    return t;
}

void label_categories(QCPAxis* axis, const MemoChart& c, std::size_t rotate_above) {
    if (c.points.size() - 1 > kMaxNamedCategories) {
        axis->setLabel(QStringLiteral("strata numbered in the order of the side-by-side table"));
    } else if (c.points.size() > rotate_above) {
        // Negative rotation ends each label under its own point (a positive one starts it there
        // and reads as the next point's). The first label reaches left of the plot: the left
        // margin makes room for it, so no label is cut.
        constexpr double kDegrees = 35;
        axis->setTickLabelRotation(-kDegrees);
        const QFontMetricsF m(axis->tickLabelFont());
        double widest = 0;
        for (const auto& p : c.points) widest = std::max(widest, m.horizontalAdvance(elided(q(p.label), 22)));
        const int reach = static_cast<int>(std::ceil(widest * std::cos(kDegrees * std::numbers::pi / 180.0)));
        QMargins min = axis->axisRect()->minimumMargins();
        min.setLeft(std::max(min.left(), reach));
        axis->axisRect()->setMinimumMargins(min);
    }
}

QPicture render_plot(QCustomPlot& plot, int w, int h) {
    QPicture pic;
    QCPPainter painter(&pic);
    plot.toPainter(&painter, w, h);
    painter.end();
    return pic;
}

// A white w x h plot with the chart's title above it and both axes in the memo's style.
void start_chart(QCustomPlot& plot, const std::string& title_text, int w, int h) {
    plot.resize(w, h);
    plot.setBackground(Qt::white);
    auto* title = new QCPTextElement(&plot, q(title_text), chart_font(12, true));
    title->setTextColor(kInk);
    plot.plotLayout()->insertRow(0);
    plot.plotLayout()->addElement(0, 0, title);
    style_axis(plot.xAxis);
    style_axis(plot.yAxis);
}

// The legend in its own row between the title and the chart, entries side by side, so it never
// hides a point or a bar (inside the axis rect it covered the last strata on wide charts).
void legend_above(QCustomPlot& plot, int font_size) {
    plot.legend->setVisible(true);
    plot.legend->setFont(chart_font(font_size));
    plot.legend->setBorderPen(Qt::NoPen);
    plot.legend->setFillOrder(QCPLegend::foColumnsFirst);
    plot.axisRect()->insetLayout()->take(plot.legend);
    plot.plotLayout()->insertRow(1);
    plot.plotLayout()->addElement(1, 0, plot.legend);
    plot.plotLayout()->setRowStretchFactor(1, 0.001);
    plot.legend->setMargins(QMargins(2, 0, 2, 0));
}

QPicture rate_chart(const MemoChart& c, int w, int h) {
    QCustomPlot plot;
    start_chart(plot, c.title, w, h);
    plot.xAxis->setTicker(category_ticker(c, 0));
    label_categories(plot.xAxis, c, 6);
    plot.xAxis->grid()->setVisible(false);
    plot.yAxis->setLabel(q(c.value_label));
    QSharedPointer<QCPAxisTickerFixed> yt(new QCPAxisTickerFixed);
    yt->setTickStep(0.2);
    plot.yAxis->setTicker(yt);
    plot.yAxis->setNumberFormat("f");
    plot.yAxis->setNumberPrecision(1);
    plot.yAxis->setRange(0, 1.04);
    plot.xAxis->setRange(-0.6, static_cast<double>(c.points.size()) - 0.4);

    struct Series {
        QString name;
        QColor color;
        QCPScatterStyle::ScatterShape shape;
        double offset;
        bool focal;
    };
    const Series series[2] = {{q(c.focal), kFocal, QCPScatterStyle::ssDisc, -0.14, true},
                              {q(c.reference), kReference, QCPScatterStyle::ssDiamond, 0.14, false}};
    for (const auto& s : series) {
        QVector<double> x, y, lo, hi;
        for (std::size_t i = 0; i < c.points.size(); ++i) {
            const auto& pnt = c.points[i];
            const double v = s.focal ? pnt.focal : pnt.reference;
            if (!std::isfinite(v)) continue;
            const double l = s.focal ? pnt.focal_lo : pnt.reference_lo;
            const double u = s.focal ? pnt.focal_hi : pnt.reference_hi;
            x << static_cast<double>(i) + s.offset;
            y << v;
            lo << (std::isfinite(l) ? v - l : 0);
            hi << (std::isfinite(u) ? u - v : 0);
        }
        QCPGraph* g = plot.addGraph();
        g->setName(s.name);
        g->setLineStyle(QCPGraph::lsNone);
        g->setScatterStyle(QCPScatterStyle(s.shape, s.color, s.color, 8));
        g->setData(x, y, true);
        auto* bars = new QCPErrorBars(plot.xAxis, plot.yAxis);
        bars->removeFromLegend();
        bars->setDataPlottable(g);
        bars->setPen(QPen(s.color, 1.4));
        bars->setWhiskerWidth(6);
        bars->setData(lo, hi);
    }
    // Separate the pooled comparison from the strata.
    if (c.points.size() > 1) {
        auto* sep = new QCPItemStraightLine(&plot);
        sep->point1->setCoords(0.5, 0);
        sep->point2->setCoords(0.5, 1);
        sep->setPen(QPen(kRule, 1, Qt::DashLine));
    }
    legend_above(plot, 11);
    return render_plot(plot, w, h);
}

// One colour per stratum line (ours); beyond the list the colours repeat with a dashed line.
const QColor kStrataColors[] = {QColor(0x1B, 0x6F, 0x8A), QColor(0xD9, 0x8A, 0x2B), QColor(0x5B, 0x8C, 0x3E),
                                QColor(0x8E, 0x4E, 0xA0), QColor(0xB5, 0x4A, 0x5E), QColor(0x3F, 0x7F, 0x7A),
                                QColor(0x9A, 0x7B, 0x2E), QColor(0x4A, 0x5F, 0xB0)};
constexpr std::size_t kStrataColorCount = sizeof kStrataColors / sizeof kStrataColors[0];
// Strata beyond this are drawn without a legend entry (the side-by-side table names them).
constexpr std::size_t kMaxLegendLines = 10;

QPicture scatter_chart(const MemoScatter& c, int w, int h) {
    QCustomPlot plot;
    start_chart(plot, c.title, w, h);
    plot.xAxis->setLabel(q(c.x_label));
    plot.yAxis->setLabel(q(c.y_label));
    auto colour = [](int line) {
        return line < 0 ? kRule : kStrataColors[std::size_t(line) % kStrataColorCount];
    };
    // Points, one graph per stratum so each keeps its colour; light so the lines stay readable.
    std::vector<QVector<double>> px(c.lines.size() + 1), py(c.lines.size() + 1);
    for (std::size_t i = 0; i < c.x.size(); ++i) {
        const std::size_t slot = c.group[i] < 0 ? c.lines.size() : std::size_t(c.group[i]);
        px[slot] << c.x[i];
        py[slot] << c.y[i];
    }
    for (std::size_t slot = 0; slot < px.size(); ++slot) {
        if (px[slot].isEmpty()) continue;
        QColor col = colour(slot == c.lines.size() ? -1 : int(slot));
        col.setAlpha(90);
        QCPGraph* g = plot.addGraph();
        g->removeFromLegend();
        g->setLineStyle(QCPGraph::lsNone);
        g->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssDisc, col, col, 3));
        g->setData(px[slot], py[slot], true);
    }
    auto add_line = [&](const report::MemoScatterLine& l, const QPen& pen, bool legend) {
        QCPGraph* g = plot.addGraph();
        g->setName(q(l.label) + QStringLiteral("  (slope %1)").arg(l.slope, 0, 'g', 4));
        g->setPen(pen);
        g->setData(QVector<double>{l.x_min, l.x_max},
                   QVector<double>{l.intercept + l.slope * l.x_min, l.intercept + l.slope * l.x_max}, true);
        if (!legend) g->removeFromLegend();
    };
    for (std::size_t i = 0; i < c.lines.size(); ++i)
        add_line(c.lines[i],
                 QPen(colour(int(i)), 2.2, i >= kStrataColorCount ? Qt::DashLine : Qt::SolidLine),
                 i < kMaxLegendLines);
    if (c.pooled) add_line(*c.pooled, QPen(kInk, 2.6, Qt::DashLine), true);
    plot.rescaleAxes();
    plot.xAxis->scaleRange(1.05, plot.xAxis->range().center());
    plot.yAxis->scaleRange(1.08, plot.yAxis->range().center());
    plot.legend->setVisible(true);
    plot.legend->setFont(chart_font(10));
    plot.legend->setBorderPen(QPen(kRule, 1));
    plot.legend->setBrush(QColor(255, 255, 255, 220));
    plot.axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignLeft);
    return render_plot(plot, w, h);
}

QPicture mix_chart(const MemoChart& c, int w, int h) {
    QCustomPlot plot;
    plot.resize(w, h);
    plot.setBackground(Qt::white);
    auto* title = new QCPTextElement(&plot, q(c.mix_title), chart_font(12, true));
    title->setTextColor(kInk);
    plot.plotLayout()->insertRow(0);
    plot.plotLayout()->addElement(0, 0, title);
    style_axis(plot.xAxis);
    style_axis(plot.yAxis);
    plot.xAxis->setTicker(category_ticker(c, 1));
    label_categories(plot.xAxis, c, 7);
    plot.xAxis->grid()->setVisible(false);
    plot.yAxis->setLabel(QStringLiteral("share of the group"));
    double top = 0.05;
    auto* group = new QCPBarsGroup(&plot);
    for (int s = 0; s < 2; ++s) {
        QVector<double> x, y;
        for (std::size_t i = 1; i < c.points.size(); ++i) {
            const double v = s == 0 ? c.points[i].share_focal : c.points[i].share_reference;
            x << static_cast<double>(i);
            y << (std::isfinite(v) ? v : 0);
            if (std::isfinite(v)) top = std::max(top, v);
        }
        auto* bars = new QCPBars(plot.xAxis, plot.yAxis);
        bars->setName(s == 0 ? q(c.focal) : q(c.reference));
        const QColor col = s == 0 ? kFocal : kReference;
        bars->setPen(QPen(col.darker(115), 1));
        bars->setBrush(col);
        bars->setWidth(0.36);
        bars->setBarsGroup(group);
        bars->setData(x, y, true);
    }
    plot.yAxis->setRange(0, top * 1.15);
    plot.xAxis->setRange(0.4, static_cast<double>(c.points.size()) - 0.4);
    legend_above(plot, 11);
    return render_plot(plot, w, h);
}

void draw_picture(QPainter& p, const QRectF& r, const QPicture& pic, int w, int h) {
    p.translate(r.topLeft());
    // Playback already scales by device DPI / picture DPI; undo that so the picture fills r.
    const double kx = static_cast<double>(pic.logicalDpiX()) / p.device()->logicalDpiX();
    const double ky = static_cast<double>(pic.logicalDpiY()) / p.device()->logicalDpiY();
    p.scale(r.width() / w * kx, r.height() / h * ky);
    p.drawPicture(0, 0, pic);
}

// ---------------------------------------------------------------------------------------------
// The causal diagram with roles: boxes at the editor's positions, arrows between them, the
// finding's stratifier outlined, unobserved variables dashed, and a key of the roles shown.

void draw_diagram(QPainter& p, const QRectF& area, const MemoDiagram& d, const Flow& flow) {
    const QFont f = flow.font(7.5);
    const QFont fb = flow.font(7.5, true);
    QFontMetricsF fm(fb, flow.device());
    const double key_h = pt(26);
    const QRectF canvas = area.adjusted(pt(4), pt(4), -pt(4), -key_h);
    if (d.nodes.empty()) return;
    std::vector<QSizeF> sizes;
    double maxw = 0;
    for (const auto& n : d.nodes) {
        const QString label = elided(q(n.name), 28);
        const QSizeF s(fm.horizontalAdvance(label) + pt(16), fm.height() + pt(8));
        sizes.push_back(s);
        maxw = std::max(maxw, s.width());
    }
    // The editor's positions scaled into the canvas; when that makes two boxes overlap (positions
    // saved crowded), the nodes are laid out in layers along the arrows instead (ui/layered_layout).
    auto place = [&](const std::vector<QPointF>& at) {
        double minx = 1e300, maxx = -1e300, miny = 1e300, maxy = -1e300;
        for (const QPointF& c : at) {
            minx = std::min(minx, c.x());
            maxx = std::max(maxx, c.x());
            miny = std::min(miny, c.y());
            maxy = std::max(maxy, c.y());
        }
        const QRectF inner = canvas.adjusted(maxw / 2, pt(12), -maxw / 2, -pt(12));
        const double sx = maxx > minx ? inner.width() / (maxx - minx) : 0;
        const double sy = maxy > miny ? inner.height() / (maxy - miny) : 0;
        const double s = (sx > 0 && sy > 0) ? std::min(sx, sy) : std::max(sx, sy);
        const double ox = inner.left() + (inner.width() - (maxx - minx) * s) / 2;
        const double oy = inner.top() + (inner.height() - (maxy - miny) * s) / 2;
        std::vector<QRectF> out;
        for (std::size_t i = 0; i < at.size(); ++i) {
            const QPointF c(ox + (at[i].x() - minx) * s, oy + (at[i].y() - miny) * s);
            out.emplace_back(c.x() - sizes[i].width() / 2, c.y() - sizes[i].height() / 2, sizes[i].width(),
                             sizes[i].height());
        }
        return out;
    };
    auto overlap = [&](const std::vector<QRectF>& bs) {
        for (std::size_t i = 0; i < bs.size(); ++i)
            for (std::size_t j = i + 1; j < bs.size(); ++j)
                if (bs[i].adjusted(-pt(3), -pt(3), pt(3), pt(3)).intersects(bs[j])) return true;
        return false;
    };
    std::vector<QPointF> saved;
    std::vector<QString> names;
    int exposure = -1, outcome = -1;
    for (std::size_t i = 0; i < d.nodes.size(); ++i) {
        saved.emplace_back(d.nodes[i].x, d.nodes[i].y);
        names.push_back(q(d.nodes[i].name));
        if (d.nodes[i].role == causal::Role::Exposure) exposure = int(i);
        if (d.nodes[i].role == causal::Role::Outcome) outcome = int(i);
    }
    std::vector<QRectF> boxes = place(saved);
    if (overlap(boxes)) {
        std::vector<QRectF> layered = place(layered_layout(names, d.edges, exposure, outcome));
        if (!overlap(layered)) boxes = std::move(layered);
    }
    p.setRenderHint(QPainter::Antialiasing, true);
    // Arrows go around the boxes (ui/edge_route, as on the canvas), never through one.
    for (const auto& [a, b] : d.edges) {
        const QPolygonF route = route_edge(boxes, a, b, pt(4));
        if (route.size() < 2) continue;
        p.setPen(QPen(kMuted, pt(0.8)));
        p.setBrush(Qt::NoBrush);
        p.drawPath(route_path(route, pt(2)));
        const QPointF to = route.back(), from = route[route.size() - 2];
        const double ang = std::atan2(to.y() - from.y(), to.x() - from.x());
        const double len = pt(5), wid = pt(2.4);
        QPolygonF head;
        head << to << QPointF(to.x() - len * std::cos(ang) + wid * std::sin(ang), to.y() - len * std::sin(ang) - wid * std::cos(ang))
             << QPointF(to.x() - len * std::cos(ang) - wid * std::sin(ang), to.y() - len * std::sin(ang) + wid * std::cos(ang));
        p.setBrush(kMuted);
        p.setPen(Qt::NoPen);
        p.drawPolygon(head);
    }
    std::vector<causal::Role> roles_seen;
    for (std::size_t i = 0; i < d.nodes.size(); ++i) {
        const auto& n = d.nodes[i];
        QPen pen(n.in_stratifier ? kInk : kMuted, n.in_stratifier ? pt(1.8) : pt(0.7));
        if (!n.observed) pen.setStyle(Qt::DashLine);
        p.setPen(pen);
        p.setBrush(memo_role_fill(n.role));
        // The canvas's shape for the role (ui/role_style), with the exposure's and the
        // outcome's second outline.
        const RoleShape shape = role_style(n.role).shape;
        p.drawPath(role_path(shape, boxes[i]));
        if (const double inset = inner_frame(shape, boxes[i]) * 0.5; inset > 0) {
            QPen inner = pen;
            inner.setWidthF(pt(0.6));
            p.setPen(inner);
            p.setBrush(Qt::NoBrush);
            p.drawPath(role_path(shape, boxes[i].adjusted(inset, inset, -inset, -inset)));
        }
        p.setPen(kInk);
        p.setFont(n.in_stratifier || n.role == causal::Role::Exposure || n.role == causal::Role::Outcome ? fb : f);
        p.drawText(boxes[i], Qt::AlignCenter, elided(q(n.name), 28));
        if (std::find(roles_seen.begin(), roles_seen.end(), n.role) == roles_seen.end()) roles_seen.push_back(n.role);
    }
    // Key.
    p.setFont(f);
    double x = area.left() + pt(4);
    double y = area.bottom() - key_h + pt(6);
    QFontMetricsF fk(f, flow.device());
    auto key_item = [&](const QString& label, const QColor& fill, const QPen& pen) {
        const double wtxt = fk.horizontalAdvance(label);
        if (x + pt(14) + wtxt > area.right()) {
            x = area.left() + pt(4);
            y += pt(11);
        }
        p.setPen(pen);
        p.setBrush(fill);
        p.drawRoundedRect(QRectF(x, y, pt(10), pt(7)), pt(1.5), pt(1.5));
        p.setPen(kInk);
        p.drawText(QPointF(x + pt(13), y + pt(6.5)), label);
        x += pt(22) + wtxt;
    };
    // Roles that share a fill (the canvas tells them apart by shape and caption, the memo cannot)
    // share one key entry, so a colour never stands for two entries.
    std::vector<std::pair<QColor, QString>> keys;
    for (const auto r : roles_seen) {
        const QColor fill = memo_role_fill(r);
        const QString words = QString::fromUtf8(role_style(r).words);
        auto same = std::find_if(keys.begin(), keys.end(), [&](const auto& k) { return k.first == fill; });
        if (same == keys.end()) keys.emplace_back(fill, words);
        else same->second += QStringLiteral(" or ") + words;
    }
    for (const auto& [fill, words] : keys) key_item(words, fill, QPen(kMuted, pt(0.7)));
    key_item(QStringLiteral("stratifier of this finding"), Qt::white, QPen(kInk, pt(1.8)));
    key_item(QStringLiteral("not in the data (unobserved)"), Qt::white, QPen(kMuted, pt(0.7), Qt::DashLine));
}

// ---------------------------------------------------------------------------------------------

void render(Flow& flow, const MemoContent& m) {
    // Title block.
    flow.paragraph(q(m.title.empty() ? std::string("Audit memo") : m.title), flow.font(18, true), kInk, 0, 2);
    flow.paragraph(QStringLiteral("Audit memo: pooled and stratified comparisons"), flow.font(10), kMuted, 0, 8);
    // Page 1 answers first, in plain sentences, before the facts and figures.
    if (!m.answer.empty()) {
        flow.heading(QStringLiteral("The answer in brief"), 13, 40);
        for (const auto& a : m.answer) flow.paragraph(q(a), flow.font(10), kInk, 0, 5);
        flow.space(4);
    }
    MemoTable facts;
    facts.header = {"About this audit", ""};
    facts.widths = {1, 4};
    facts.numeric = {false, false};
    for (const auto& [label, value] : m.facts) facts.rows.push_back({label, value});
    flow.table(facts, 8.5);
    if (!m.data_warning.empty()) {
        flow.paragraph(QStringLiteral("Data changed"), flow.font(9.5, true), kAlert, 0, 1);
        flow.paragraph(q(m.data_warning), flow.font(9.5), kAlert, 0, 6);
    }

    flow.heading(QStringLiteral("Summary"), 13, 40);
    flow.paragraph(q(m.summary), flow.font(9.5), kInk, 0, 6);

    flow.heading(QStringLiteral("Findings"), 13, 60);
    flow.table(m.findings, 7.5);
    flow.paragraph(q(m.findings_note), flow.font(8, false, true), kMuted, 0, 8);

    const int cw = 760, ch = 330, mh = 250;
    for (const auto& s : m.sections) {
        flow.new_page();
        flow.heading(q(s.heading), 13, 80);
        flow.paragraph(q(s.lead), flow.font(9.5), kInk, 0, 6);
        flow.paragraph(QStringLiteral("Pooled and adjusted figures"), flow.font(10, true), kInk, 0, 3);
        flow.table(s.figures, 8);
        flow.labelled(QStringLiteral("Verdict"), q(s.verdict));
        if (!s.diagram_checks.empty()) flow.labelled(QStringLiteral("Diagram against the data"), q(s.diagram_checks));
        if (!s.decomposition.empty()) flow.labelled(QStringLiteral("Decomposition"), q(s.decomposition));
        if (!s.e_value.empty()) flow.labelled(QStringLiteral("Sensitivity to unmeasured confounding"), q(s.e_value));
        flow.labelled(QStringLiteral("Review"), q(s.decision));
        if (!s.note.empty()) flow.labelled(QStringLiteral("Reviewer's note"), q(s.note));
        if (!s.related.rows.empty()) {
            flow.space(2);
            flow.paragraph(QStringLiteral("Related findings in this family (%1)").arg(s.related.rows.size()),
                           flow.font(10, true), kInk, 0, 3);
            flow.table(s.related, 7.5);
        }
        flow.space(4);
        flow.paragraph(QStringLiteral("Side by side: pooled and each stratum"), flow.font(10, true), kInk, 0, 3);
        flow.table(s.strata, 7.5);
        if (!s.chart.points.empty()) {
            const double w = flow.width();
            const QPicture rates = rate_chart(s.chart, cw, ch);
            flow.block(w * ch / cw, [&](QPainter& p, const QRectF& r) { draw_picture(p, r, rates, cw, ch); });
            flow.space(4);
            if (s.chart.points.size() > 1) {
                const QPicture mix = mix_chart(s.chart, cw, mh);
                flow.block(w * mh / cw, [&](QPainter& p, const QRectF& r) { draw_picture(p, r, mix, cw, mh); });
                flow.space(6);
            }
        }
        if (s.scatter && !s.scatter->lines.empty()) {
            const double w = flow.width();
            const int sh = 420;
            const QPicture trend = scatter_chart(*s.scatter, cw, sh);
            flow.block(w * sh / cw, [&](QPainter& p, const QRectF& r) { draw_picture(p, r, trend, cw, sh); });
            QString note = q(s.scatter->note) + QStringLiteral("; dashed black: the pooled line");
            if (s.scatter->lines.size() > kMaxLegendLines)
                note += QStringLiteral("; the legend names the first %1 of %2 strata (the table above lists all)")
                            .arg(kMaxLegendLines)
                            .arg(s.scatter->lines.size());
            if (!s.scatter->note.empty())
                flow.paragraph(note + QStringLiteral("."),
                               flow.font(8, false, true), kMuted, 0, 6);
        }
        if (s.diagram) {
            flow.ensure(pt(250));
            flow.paragraph(QStringLiteral("Causal diagram") +
                               (s.diagram->name.empty() ? QString() : QStringLiteral(" \u201C%1\u201D").arg(q(s.diagram->name))),
                           flow.font(10, true), kInk, 0, 2);
            const MemoDiagram& d = *s.diagram;
            flow.block(pt(220), [&](QPainter& p, const QRectF& r) {
                p.setPen(QPen(kRule, pt(0.5)));
                p.setBrush(Qt::NoBrush);
                p.drawRect(r);
                draw_diagram(p, r, d, flow);
            });
            flow.space(6);
        }
    }

    if (!m.appendix.rows.empty()) {
        flow.new_page();
        flow.heading(QStringLiteral("Appendix: every check"), 13, 60);
        flow.table(m.appendix, 7);
        flow.paragraph(q(m.appendix_note), flow.font(8, false, true), kMuted, 0, 8);
    }
    flow.heading(QStringLiteral("Method notes"), 13, 60);
    for (const auto& n : m.method_notes) {
        flow.paragraph(QString(QChar(0x2022)) + QStringLiteral("  ") + q(n), flow.font(9), kInk, 0, 4);
    }
    flow.heading(QStringLiteral("Caution"), 13, 30);
    flow.paragraph(q(m.caution), flow.font(10, true), kAlert, 0, 4);
}

void setup(QPdfWriter& pdf, const MemoContent& m) {
    pdf.setResolution(kDpi);
    pdf.setPageSize(QPageSize(m.page_size == project::PageSize::Letter ? QPageSize::Letter : QPageSize::A4));
    pdf.setPageMargins(QMarginsF(0, 0, 0, 0));
    pdf.setTitle(q(m.title));
    pdf.setCreator(QStringLiteral("Foldline"));
}

}  // namespace

QColor memo_role_fill(causal::Role role) {
    const QColor c = role_style(role).fill;
    const double a = fill_alpha(false) / 255.0;
    auto over_white = [a](int v) { return static_cast<int>(std::lround(v * a + 255 * (1 - a))); };
    return QColor(over_white(c.red()), over_white(c.green()), over_white(c.blue()));
}

QString printable(const std::string& text) {
    const QString in = QString::fromUtf8(text.data(), static_cast<qsizetype>(text.size()));
    QString out;
    out.reserve(in.size());
    for (char32_t c : in.toUcs4()) {
        if (is_control(c))
            out += QStringLiteral("[U+") + QString::number(static_cast<uint>(c), 16).toUpper().rightJustified(4, '0') +
                   QStringLiteral("]");
        else out += QString::fromUcs4(&c, 1);
    }
    return out;
}

namespace {
// Headless runs have no session folder; Qt's notice about it is noise for a command-line user.
void quiet_handler(QtMsgType type, const QMessageLogContext& ctx, const QString& msg) {
    if (msg.startsWith(QStringLiteral("QStandardPaths:"))) return;
    qt_message_output(type, ctx, msg);
}
}  // namespace

void ensure_memo_application() {
    if (QCoreApplication::instance()) return;
    static const QtMessageHandler previous = qInstallMessageHandler(quiet_handler);
    (void)previous;
    // A PDF needs no window: without an explicit choice, use the offscreen platform so the
    // headless commands work with no display at all.
    if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM")) qputenv("QT_QPA_PLATFORM", "offscreen");
    static int argc = 1;
    static char name[] = "foldline";
    static char* argv[] = {name, nullptr};
    static QApplication* app = new QApplication(argc, argv);  // lives until the process ends
    (void)app;
}

QByteArray memo_pdf(const MemoContent& memo) {
    ensure_memo_application();
    int total = 1;
    {
        QBuffer scratch;
        scratch.open(QIODevice::WriteOnly);
        QPdfWriter pdf(&scratch);
        setup(pdf, memo);
        Flow dry(pdf, nullptr, memo, 0);
        render(dry, memo);
        total = dry.pages();
    }
    QBuffer out;
    out.open(QIODevice::WriteOnly);
    {
        QPdfWriter pdf(&out);
        setup(pdf, memo);
        QPainter painter(&pdf);
        Flow flow(pdf, &painter, memo, total);
        render(flow, memo);
        painter.end();
    }
    return out.data();
}

QImage memo_page_image(const MemoContent& memo, int page, int width_px) {
    ensure_memo_application();
    QBuffer scratch;
    scratch.open(QIODevice::WriteOnly);
    QPdfWriter pdf(&scratch);
    setup(pdf, memo);
    int total = 1;
    {
        Flow dry(pdf, nullptr, memo, 0);
        render(dry, memo);
        total = dry.pages();
    }
    if (page < 1 || page > total || width_px <= 0) return {};
    const double scale = static_cast<double>(width_px) / pdf.width();
    QImage image(width_px, static_cast<int>(std::lround(pdf.height() * scale)), QImage::Format_RGB32);
    image.fill(Qt::white);
    QPainter painter(&image);
    painter.setRenderHint(QPainter::Antialiasing, true);
    painter.setRenderHint(QPainter::TextAntialiasing, true);
    painter.scale(scale, scale);
    Flow flow(pdf, &painter, memo, total, page);
    render(flow, memo);
    painter.end();
    return image;
}

Status write_memo_pdf(const MemoContent& memo, const std::string& path) {
    const QByteArray bytes = memo_pdf(memo);
    if (bytes.isEmpty()) return make_error("the PDF writer produced nothing", path);
    return write_file_atomically(path, std::string_view(bytes.constData(), static_cast<std::size_t>(bytes.size())));
}

}  // namespace foldline::ui
