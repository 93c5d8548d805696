#pragma once
// QCustomPlot charts of one finding. Each function clears the plot and draws from the view's
// numbers only; shapes as well as colours tell the series apart.
#include <QString>

#include "core/common/error.h"
#include "ui/finding_view.h"

class QCustomPlot;

namespace foldline::ui::charts {

/// Clears the plot to one themed axis rect with a hidden legend (what every draw_ starts from).
void reset_plot(QCustomPlot* plot);
/// Colours the plot's axes, grid and background from the application palette.
void apply_theme(QCustomPlot* plot);
/// Per-stratum risk differences with CIs (circles), plus the pooled (diamond) and adjusted
/// (square) estimates, against a line at zero. An empty view draws only the axes.
void draw_forest(QCustomPlot* plot, const FindingView& f);
/// How each group is spread over the strata: one stacked bar per group (shares sum to 1).
void draw_mix(QCustomPlot* plot, const FindingView& f);
/// The pooled gap and its within-stratum and composition parts as bars.
void draw_decomposition(QCustomPlot* plot, const FindingView& f);
/// Slope findings: the scatter (sampled or binned, said on the chart), the pooled line and one
/// line per stratum.
void draw_scatter(QCustomPlot* plot, const FindingView& f);
/// Slope findings: one small panel per stratum with its points and line.
void draw_small_multiples(QCustomPlot* plot, const FindingView& f);
/// Saves by the suffix of `path`: .png, .svg or .pdf, with `heading` (data set, groups, question)
/// drawn above the chart's own title in the file only. Error on an unknown suffix or a failed write.
Status save(QCustomPlot* plot, const QString& path, const QString& heading = {});

}  // namespace foldline::ui::charts
