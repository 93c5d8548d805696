#include "ui/step_bar.h"

#include <QHelpEvent>
#include <QMouseEvent>
#include <QPainter>
#include <QPainterPath>
#include <QToolTip>

#include "ui/palette.h"

namespace foldline::ui {

namespace {
constexpr int kMargin = 10;
constexpr int kGap = 14;
constexpr int kHeight = 50;
constexpr int kFold = 12;  // size of the turned-down corner
}  // namespace

StepBar::StepBar(const QStringList& names, QWidget* parent)
    : QWidget(parent), names_(names), states_(names.size(), State::Locked) {
    if (!states_.isEmpty()) states_[0] = State::Open;
    setMouseTracking(true);
    setSizePolicy(QSizePolicy::Expanding, QSizePolicy::Fixed);
    setAccessibleName(tr("Audit steps"));
}

QSize StepBar::sizeHint() const { return {140 * count(), kHeight + 2 * kMargin}; }
QSize StepBar::minimumSizeHint() const { return {90 * count(), kHeight + 2 * kMargin}; }

QRect StepBar::card_rect(int i) const {
    if (i < 0 || i >= count()) return {};
    const int w = (width() - 2 * kMargin - (count() - 1) * kGap) / count();
    return {kMargin + i * (w + kGap), kMargin, w, kHeight};
}

int StepBar::card_at(QPoint p) const {
    for (int i = 0; i < count(); ++i)
        if (card_rect(i).contains(p)) return i;
    return -1;
}

void StepBar::set_current(int i) {
    if (i < 0 || i >= count()) return;
    current_ = i;
    if (states_[i] == State::Locked) states_[i] = State::Open;
    update();
}

void StepBar::set_state(int i, State s) {
    if (i < 0 || i >= count()) return;
    states_[i] = s;
    update();
}

void StepBar::paintEvent(QPaintEvent*) {
    QPainter p(this);
    p.setRenderHint(QPainter::Antialiasing);
    const QPalette pal = palette();
    const QColor accent = colors::accent(pal);
    const QColor text = pal.color(QPalette::WindowText);
    const QColor muted = colors::muted(pal);
    const QColor base = pal.color(QPalette::Base);

    // The thread that joins the cards: the path runs left to right.
    p.setPen(QPen(muted, 2, Qt::DotLine));
    p.drawLine(card_rect(0).center(), card_rect(count() - 1).center());

    for (int i = 0; i < count(); ++i) {
        const QRectF r = QRectF(card_rect(i)).adjusted(0.5, 0.5, -0.5, -0.5);
        const bool cur = i == current_;
        const State st = states_[i];
        // Card outline with the top-right corner folded down.
        QPainterPath card;
        card.moveTo(r.topLeft());
        card.lineTo(r.right() - kFold, r.top());
        card.lineTo(r.right(), r.top() + kFold);
        card.lineTo(r.bottomRight());
        card.lineTo(r.bottomLeft());
        card.closeSubpath();
        QColor fill = cur ? accent : base;
        if (i == hover_ && !cur && st != State::Locked) fill = fill.darker(dark() ? 80 : 106);
        p.setPen(QPen(st == State::Locked ? muted : (cur ? accent : text), cur ? 2 : 1,
                      st == State::Locked ? Qt::DashLine : Qt::SolidLine));
        p.setBrush(fill);
        p.drawPath(card);
        QPainterPath fold;
        fold.moveTo(r.right() - kFold, r.top());
        fold.lineTo(r.right() - kFold, r.top() + kFold);
        fold.lineTo(r.right(), r.top() + kFold);
        fold.closeSubpath();
        p.setBrush(cur ? accent.darker(130) : muted);
        p.setPen(Qt::NoPen);
        p.drawPath(fold);

        const QColor fg = cur ? (colors::dark_theme(pal) ? QColor(Qt::black) : QColor(Qt::white))
                              : (st == State::Locked ? muted : text);
        // Number disc, with a tick inside once the step is done.
        const QRectF disc(r.left() + 10, r.center().y() - 12, 24, 24);
        p.setPen(QPen(fg, 1.5));
        p.setBrush(Qt::NoBrush);
        p.drawEllipse(disc);
        if (st == State::Done && !cur) {
            QPainterPath tick;
            tick.moveTo(disc.left() + 6, disc.center().y());
            tick.lineTo(disc.left() + 10.5, disc.bottom() - 7);
            tick.lineTo(disc.right() - 5.5, disc.top() + 7);
            p.setPen(QPen(fg, 2.2, Qt::SolidLine, Qt::RoundCap, Qt::RoundJoin));
            p.drawPath(tick);
        } else {
            QFont f = font();
            f.setBold(true);
            p.setFont(f);
            p.drawText(disc, Qt::AlignCenter, QString::number(i + 1));
        }
        QFont f = font();
        f.setBold(cur);
        f.setPointSizeF(f.pointSizeF() * 1.08);
        p.setFont(f);
        p.setPen(fg);
        const QRectF label(disc.right() + 8, r.top(), r.right() - disc.right() - 8 - kFold, r.height());
        p.drawText(label, Qt::AlignVCenter | Qt::AlignLeft,
                   p.fontMetrics().elidedText(names_[i], Qt::ElideRight, int(label.width())));
    }
}

bool StepBar::dark() const { return colors::dark_theme(palette()); }

void StepBar::mousePressEvent(QMouseEvent* e) {
    const int i = card_at(e->position().toPoint());
    if (i >= 0 && states_[i] != State::Locked) emit step_requested(i);
}

void StepBar::mouseMoveEvent(QMouseEvent* e) {
    const int i = card_at(e->position().toPoint());
    if (i != hover_) {
        hover_ = i;
        setCursor(i >= 0 && states_[i] != State::Locked ? Qt::PointingHandCursor : Qt::ArrowCursor);
        update();
    }
}

void StepBar::leaveEvent(QEvent*) {
    hover_ = -1;
    update();
}

bool StepBar::event(QEvent* e) {
    if (e->type() == QEvent::ToolTip) {
        auto* he = static_cast<QHelpEvent*>(e);
        const int i = card_at(he->pos());
        if (i >= 0) {
            const QString how = states_[i] == State::Locked ? tr("not available yet")
                                : states_[i] == State::Done ? tr("done") : tr("open");
            QToolTip::showText(he->globalPos(),
                               tr("Step %1: %2 (%3) — Ctrl+%1").arg(i + 1).arg(names_[i], how), this);
        } else {
            QToolTip::hideText();
        }
        return true;
    }
    return QWidget::event(e);
}

}  // namespace foldline::ui
