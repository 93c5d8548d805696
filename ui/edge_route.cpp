#include "ui/edge_route.h"

#include <QLineF>
#include <algorithm>
#include <cmath>
#include <limits>

namespace foldline::ui {

namespace {

/// Liang–Barsky: the parameter interval [t0, t1] of a + t (b − a), t in [0, 1], inside `r`;
/// false when the segment misses `r`.
bool clip(QPointF a, QPointF b, const QRectF& r, double& t0, double& t1) {
    const double dx = b.x() - a.x(), dy = b.y() - a.y();
    const double p[4] = {-dx, dx, -dy, dy};
    const double q[4] = {a.x() - r.left(), r.right() - a.x(), a.y() - r.top(), r.bottom() - a.y()};
    t0 = 0;
    t1 = 1;
    for (int i = 0; i < 4; ++i) {
        if (p[i] == 0) {
            if (q[i] < 0) return false;
            continue;
        }
        const double t = q[i] / p[i];
        if (p[i] < 0) t0 = std::max(t0, t);
        else t1 = std::min(t1, t);
        if (t0 > t1) return false;
    }
    return true;
}

/// Where the segment from `inside` (in `r`) towards `outside` crosses the border of `r`.
QPointF leave(QPointF inside, QPointF outside, const QRectF& r) {
    double t0 = 0, t1 = 1;
    if (!clip(inside, outside, r, t0, t1)) return inside;
    return inside + (outside - inside) * t1;
}

}  // namespace

bool segment_enters(QPointF a, QPointF b, const QRectF& r) {
    // Touching the border is allowed: test against the box shrunk by a hair.
    const QRectF inner = r.adjusted(1e-6, 1e-6, -1e-6, -1e-6);
    if (inner.isEmpty()) return false;
    double t0 = 0, t1 = 1;
    if (!clip(a, b, inner, t0, t1)) return false;
    const double len = QLineF(a, b).length();
    return len == 0 ? inner.contains(a) : (t1 - t0) * len > 1e-6;
}

QPolygonF route_edge(const std::vector<QRectF>& boxes, int from, int to, double margin) {
    const int n = static_cast<int>(boxes.size());
    if (from < 0 || to < 0 || from >= n || to >= n) return {};
    const QRectF& fa = boxes[std::size_t(from)];
    const QRectF& fb = boxes[std::size_t(to)];
    const QPointF a = fa.center(), b = fb.center();
    std::vector<QRectF> grown;
    for (int i = 0; i < n; ++i)
        if (i != from && i != to) grown.push_back(boxes[std::size_t(i)].adjusted(-margin, -margin, margin, margin));
    auto clear = [&](QPointF p, QPointF q) {
        return std::none_of(grown.begin(), grown.end(), [&](const QRectF& r) { return segment_enters(p, q, r); });
    };
    std::vector<QPointF> path;
    if (clear(a, b)) {
        path = {a, b};
    } else {
        // Visibility graph over the grown boxes' corners (pushed out by a hair so a corner is
        // never inside its own box), searched with Dijkstra from a to b.
        std::vector<QPointF> pts = {a, b};
        const double e = 1e-3;
        for (const QRectF& r : grown)
            for (const QPointF c : {QPointF(r.left() - e, r.top() - e), QPointF(r.right() + e, r.top() - e),
                                    QPointF(r.right() + e, r.bottom() + e), QPointF(r.left() - e, r.bottom() + e)}) {
                const auto inside = [&](const QRectF& g) { return g.adjusted(e, e, -e, -e).contains(c); };
                if (std::none_of(grown.begin(), grown.end(), inside) && !fa.contains(c) && !fb.contains(c))
                    pts.push_back(c);
            }
        const std::size_t m = pts.size();
        std::vector<double> dist(m, std::numeric_limits<double>::infinity());
        std::vector<int> prev(m, -1);
        std::vector<char> done(m, 0);
        dist[0] = 0;
        for (;;) {
            int u = -1;
            for (std::size_t i = 0; i < m; ++i)
                if (!done[i] && std::isfinite(dist[i]) && (u < 0 || dist[i] < dist[std::size_t(u)])) u = int(i);
            if (u < 0 || u == 1) break;
            done[std::size_t(u)] = 1;
            for (std::size_t v = 0; v < m; ++v) {
                if (done[v]) continue;
                const double d = dist[std::size_t(u)] + QLineF(pts[std::size_t(u)], pts[v]).length();
                if (d < dist[v] && clear(pts[std::size_t(u)], pts[v])) {
                    dist[v] = d;
                    prev[v] = u;
                }
            }
        }
        if (prev[1] < 0) {
            path = {a, b};
        } else {
            for (int v = 1; v >= 0; v = prev[std::size_t(v)]) path.push_back(pts[std::size_t(v)]);
            std::reverse(path.begin(), path.end());
        }
    }
    // Ends on the borders: the first segment leaves the source box, the last enters the target.
    path.front() = leave(a, path[1], fa);
    path.back() = leave(b, path[path.size() - 2], fb);
    return QPolygonF(QList<QPointF>(path.begin(), path.end()));
}

QPainterPath route_path(const QPolygonF& route, double radius) {
    QPainterPath p;
    if (route.isEmpty()) return p;
    p.moveTo(route.front());
    for (int i = 1; i + 1 < route.size(); ++i) {
        const QPointF c = route[i];
        const QLineF in(c, route[i - 1]), out(c, route[i + 1]);
        const double r = std::min({radius, in.length() / 2, out.length() / 2});
        if (r <= 0) {
            p.lineTo(c);
            continue;
        }
        p.lineTo(in.pointAt(r / in.length()));
        p.quadTo(c, out.pointAt(r / out.length()));
    }
    if (route.size() > 1) p.lineTo(route.back());
    return p;
}

}  // namespace foldline::ui
