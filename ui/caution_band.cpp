#include "ui/caution_band.h"

#include <QApplication>
#include <QEvent>

#include "ui/palette.h"

namespace foldline::ui {

QString caution_text() {
    return QObject::tr("A statistical screen, not a legal or clinical determination. Read every finding "
                       "with local law, counsel and licensed practice.");
}

CautionBand::CautionBand(QWidget* parent) : QLabel(parent) {
    setObjectName(QStringLiteral("caution"));
    setText(QStringLiteral("<b>%1</b> %2").arg(tr("Caution:"), caution_text().toHtmlEscaped()));
    setWordWrap(true);
    setMargin(6);
    setAutoFillBackground(true);
    restyle();
}

void CautionBand::changeEvent(QEvent* e) {
    if (e->type() == QEvent::PaletteChange || e->type() == QEvent::ApplicationPaletteChange) restyle();
    QLabel::changeEvent(e);
}

void CautionBand::restyle() {
    // Tint the application's window colour (not our own, which already carries the tint).
    QPalette p = palette();
    const QColor bg = colors::caution_background(QApplication::palette());
    if (p.color(QPalette::Window) != bg) {
        p.setColor(QPalette::Window, bg);
        setPalette(p);
    }
}

}  // namespace foldline::ui
