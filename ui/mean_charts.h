#pragma once
// QCustomPlot chart of a mean-gap finding's group means (the gap, mix and decomposition charts
// are ui/charts.h's, shared with rates).
#include "ui/finding_view.h"

class QCustomPlot;

namespace foldline::ui::charts {

/// Each group's mean with its 95% t interval, one row per stratum and a pooled row below them:
/// focal as circles, reference as triangles (shape as well as colour). A stratum where a group is
/// absent shows the group present and says "left out" in its label. An empty view draws the axes.
void draw_group_means(QCustomPlot* plot, const FindingView& f);

}  // namespace foldline::ui::charts
