#pragma once
// Colours of the workbench: the Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008,
// "Color Universal Design") for groups and strata, plus a few tones derived from the system
// palette so light and dark themes both read well.
#include <QColor>
#include <QPalette>

namespace foldline::ui::colors {

/// The eight Okabe–Ito colours; i wraps around (i < 0 is treated as 0).
QColor okabe_ito(int i);
/// Colour of the focal group (vermillion) and of the reference group (blue).
QColor focal();
QColor reference();
/// True when the application's window colour is dark (the system chose a dark theme).
bool dark_theme(const QPalette& p);
/// Accent used for the current step and for selections; readable on both themes.
QColor accent(const QPalette& p);
/// Muted foreground for secondary text and greyed rows.
QColor muted(const QPalette& p);
/// Background of the caution band: a faint warm tint of the window colour.
QColor caution_background(const QPalette& p);

}  // namespace foldline::ui::colors
