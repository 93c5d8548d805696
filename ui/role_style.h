#pragma once
// One look per causal role (core/causal/roles.h) for every drawing of a diagram: the canvas,
// its legend and the memo's diagram read the fill colour, the canvas shape and the legend
// words here, so a role looks the same wherever it is drawn.
// Core headers first: Qt's `slots` keyword macro would otherwise clash with core names.
#include "core/causal/roles.h"

#include <QColor>
#include <QPainterPath>
#include <QRectF>
#include <QString>
#include <optional>
#include <vector>

namespace foldline::ui {

/// Outline drawn for a role on the canvas and in its legend.
enum class RoleShape {
    Box,       ///< plain rectangle (no role yet, and roles with no shape of their own)
    Framed,    ///< exposure: a box with a second frame inside it
    Octagon,   ///< outcome: a box with its corners cut, framed twice
    Hexagon,   ///< confounder: a common cause reaching both sides
    Capsule,   ///< mediator: something passed along
    Funnel,    ///< collider: arrows collide into it
    Pointer,   ///< cause of the exposure only: it only pushes the exposure
    Notched,   ///< after the outcome: downstream of it
};

struct RoleStyle {
    QColor fill;         ///< opaque base colour (Okabe–Ito); each surface sets its transparency
    RoleShape shape = RoleShape::Box;
    const char* words;   ///< legend and caption words in English (the memo prints these);
                         ///< empty for "no role yet"
};

/// The style of `role`; nullopt (no verdict yet) → a grey box with no words.
const RoleStyle& role_style(std::optional<causal::Role> role);
/// Every role, in the order of causal::Role.
const std::vector<causal::Role>& all_roles();
/// The legend words of `role` for the workbench (translated); empty for nullopt.
QString role_words(std::optional<causal::Role> role);
/// How opaque a fill is drawn over white paper or a light theme's base, and over a dark one.
int fill_alpha(bool dark);
/// The outline of `shape` inside `r`.
QPainterPath role_path(RoleShape shape, const QRectF& r);
/// The exposure's and the outcome's shapes carry a second outline, this far inside the first
/// (canvas, legend and memo draw it); 0 for every other shape.
double inner_frame(RoleShape shape, const QRectF& r);

}  // namespace foldline::ui
