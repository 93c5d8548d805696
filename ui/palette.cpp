#include "ui/palette.h"

#include <array>

namespace foldline::ui::colors {

namespace {
// Okabe & Ito (2008): black, orange, sky blue, bluish green, yellow, blue, vermillion,
// reddish purple. Black is moved to the end so the first colours work on dark themes too.
constexpr std::array<QRgb, 8> kOkabeIto = {0xE69F00, 0x56B4E9, 0x009E73, 0xF0E442,
                                           0x0072B2, 0xD55E00, 0xCC79A7, 0x999999};
}  // namespace

QColor okabe_ito(int i) {
    if (i < 0) i = 0;
    return QColor::fromRgb(kOkabeIto[static_cast<std::size_t>(i) % kOkabeIto.size()]);
}

QColor focal() { return QColor::fromRgb(0xD55E00); }
QColor reference() { return QColor::fromRgb(0x0072B2); }

bool dark_theme(const QPalette& p) { return p.color(QPalette::Window).lightness() < 128; }

QColor accent(const QPalette& p) {
    return dark_theme(p) ? QColor::fromRgb(0x56B4E9) : QColor::fromRgb(0x0072B2);
}

QColor muted(const QPalette& p) {
    QColor t = p.color(QPalette::WindowText);
    QColor w = p.color(QPalette::Window);
    return QColor((t.red() + w.red()) / 2, (t.green() + w.green()) / 2, (t.blue() + w.blue()) / 2);
}

QColor caution_background(const QPalette& p) {
    QColor w = p.color(QPalette::Window);
    QColor tint = QColor::fromRgb(0xE69F00);
    const double a = dark_theme(p) ? 0.22 : 0.16;
    return QColor(int(w.red() * (1 - a) + tint.red() * a), int(w.green() * (1 - a) + tint.green() * a),
                  int(w.blue() * (1 - a) + tint.blue() * a));
}

}  // namespace foldline::ui::colors
