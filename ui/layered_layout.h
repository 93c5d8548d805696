#pragma once
// Positions for a diagram's nodes in layers along the arrows, for the canvas's Tidy and for the
// memo's drawing when the saved positions would make boxes overlap.
#include <QPointF>
#include <QString>
#include <utility>
#include <vector>

namespace foldline::ui {

/// One position per name: layer = longest path from any source (x = layer × dx); within a layer
/// names sorted, the exposure and the outcome on the line y = 0 and every other node above or
/// below it in turn (rows dy apart), so arrows from a common cause to the outcome pass clear of
/// the exposure. `edges` index into `names`; `exposure` / `outcome` may be -1.
std::vector<QPointF> layered_layout(const std::vector<QString>& names, const std::vector<std::pair<int, int>>& edges,
                                    int exposure, int outcome, double dx = 220, double dy = 120);

}  // namespace foldline::ui
