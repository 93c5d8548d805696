#pragma once
// Where a diagram's arrow runs: from the border of one box to the border of another, around
// every other box, so that no arrow passes through a node and both of its ends stay visible.
// The canvas (ui/diagram_scene) and the memo's drawing (ui/memo/memo_writer) route with it.
#include <QPainterPath>
#include <QPolygonF>
#include <QRectF>
#include <vector>

namespace foldline::ui {

/// The route of the arrow from boxes[from] to boxes[to]: a polyline whose first point lies on
/// the border of boxes[from] and whose last point lies on the border of boxes[to]. Straight when
/// the line between the centres clears every other box grown by `margin`; otherwise the
/// shortest path through the corners of the grown boxes that clears them all. When no such path
/// exists (a box enclosed by others) the straight line is returned. Indices out of range → {}.
QPolygonF route_edge(const std::vector<QRectF>& boxes, int from, int to, double margin);

/// The route as a painter path with its corners rounded by at most `radius` (keep it below the
/// routing margin, so a rounded corner stays clear of the box it turns around).
QPainterPath route_path(const QPolygonF& route, double radius);

/// Whether the segment a–b passes through the inside of `r` (touching its border is not).
bool segment_enters(QPointF a, QPointF b, const QRectF& r);

}  // namespace foldline::ui
