// tests/ui/edge_route_test.cpp <-> ui/edge_route.h, ui/layered_layout.h (and their use by the diagram canvas)
#include <QRandomGenerator>
#include <QtTest>

#include "ui/diagram_page.h"
#include "ui/diagram_scene.h"
#include "ui/edge_route.h"
#include "ui/layered_layout.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

/// Whether the drawn path passes through the inside of `box` (sampled every half unit).
bool path_enters(const QPainterPath& path, const QRectF& box) {
    const QRectF inner = box.adjusted(0.5, 0.5, -0.5, -0.5);
    const double len = path.length();
    const int steps = std::max(2, int(len * 2));
    for (int i = 0; i <= steps; ++i)
        if (inner.contains(path.pointAtPercent(path.percentAtLength(len * i / steps)))) return true;
    return false;
}

bool on_border(QPointF p, const QRectF& r) {
    const double tol = 1e-6;
    const bool in_x = p.x() >= r.left() - tol && p.x() <= r.right() + tol;
    const bool in_y = p.y() >= r.top() - tol && p.y() <= r.bottom() + tol;
    return in_x && in_y &&
           (std::abs(p.x() - r.left()) < tol || std::abs(p.x() - r.right()) < tol ||
            std::abs(p.y() - r.top()) < tol || std::abs(p.y() - r.bottom()) < tol);
}

/// Every pair's route ends on its two borders and enters no other box.
QString check_all_pairs(const std::vector<QRectF>& boxes, double margin) {
    for (int a = 0; a < int(boxes.size()); ++a)
        for (int b = 0; b < int(boxes.size()); ++b) {
            if (a == b) continue;
            const QPolygonF r = route_edge(boxes, a, b, margin);
            if (r.size() < 2) return QStringLiteral("%1 → %2: no route").arg(a).arg(b);
            if (!on_border(r.front(), boxes[std::size_t(a)]) || !on_border(r.back(), boxes[std::size_t(b)]))
                return QStringLiteral("%1 → %2: an end is off its box's border").arg(a).arg(b);
            const QPainterPath path = route_path(r, margin / 2);
            for (int k = 0; k < int(boxes.size()); ++k)
                if (k != a && k != b && path_enters(path, boxes[std::size_t(k)]))
                    return QStringLiteral("%1 → %2 runs through box %3").arg(a).arg(b).arg(k);
        }
    return {};
}

QRectF box_at(double x, double y, double w = 150, double h = 62) { return QRectF(x - w / 2, y - h / 2, w, h); }

}  // namespace

class EdgeRouteTest : public QObject {
    Q_OBJECT
private slots:
    void segment_test_tells_inside_from_touching() {
        const QRectF r(0, 0, 10, 10);
        QVERIFY(segment_enters({-5, 5}, {15, 5}, r));
        QVERIFY(!segment_enters({-5, 0}, {15, 0}, r));   // along the top edge
        QVERIFY(!segment_enters({-5, -1}, {15, -1}, r)); // above it
        QVERIFY(segment_enters({2, 2}, {3, 3}, r));      // wholly inside
        QVERIFY(!segment_enters({-5, 25}, {25, -5}, r)); // x + y = 20 touches the corner (10, 10) only
    }

    void a_box_in_the_way_is_walked_around() {
        // Three in a row: the straight line from the first to the third crosses the middle one.
        const std::vector<QRectF> boxes = {box_at(0, 0), box_at(220, 0), box_at(440, 0)};
        QVERIFY(segment_enters(boxes[0].center(), boxes[2].center(), boxes[1]));
        const QPolygonF r = route_edge(boxes, 0, 2, 14);
        QVERIFY(r.size() > 2);
        QVERIFY(!path_enters(route_path(r, 7), boxes[1]));
        // Nothing in the way: one straight segment from border to border.
        const QPolygonF s = route_edge(boxes, 0, 1, 14);
        QCOMPARE(s.size(), 2);
        QCOMPARE(s.front(), QPointF(75, 0));
        QCOMPARE(s.back(), QPointF(145, 0));
        QVERIFY(route_edge(boxes, 0, 7, 14).isEmpty());
    }

    void no_route_runs_through_a_box_on_several_layouts() {
        // The layouts the workbench's Tidy makes (layers 220 apart, rows 120 apart), a grid, and
        // seeded random placements with no two boxes overlapping.
        std::vector<std::vector<QRectF>> layouts;
        layouts.push_back({box_at(0, 0), box_at(440, 0), box_at(220, -120), box_at(220, 120), box_at(220, 0),
                           box_at(660, -120)});
        std::vector<QRectF> grid;
        for (int i = 0; i < 3; ++i)
            for (int j = 0; j < 3; ++j) grid.push_back(box_at(i * 230.0, j * 110.0));
        layouts.push_back(grid);
        QRandomGenerator rng(20261205);
        for (int l = 0; l < 6; ++l) {
            std::vector<QRectF> boxes;
            int tries = 0;
            while (boxes.size() < 8 && tries++ < 2000) {
                const QRectF b = box_at(rng.bounded(900.0), rng.bounded(600.0), 120 + rng.bounded(120.0));
                const QRectF room = b.adjusted(-30, -30, 30, 30);
                if (std::none_of(boxes.begin(), boxes.end(), [&](const QRectF& o) { return o.intersects(room); }))
                    boxes.push_back(b);
            }
            layouts.push_back(boxes);
        }
        for (std::size_t l = 0; l < layouts.size(); ++l) {
            const QString why = check_all_pairs(layouts[l], 14);
            QVERIFY2(why.isEmpty(), qPrintable(QStringLiteral("layout %1: %2").arg(l).arg(why)));
        }
    }

    void layers_follow_the_arrows() {
        // u → x → m → y and u → y: layers by longest path from the source (u 0, x 1, m 2, y 3);
        // x and y on the line y = 0, the others above or below it.
        const std::vector<QString> names = {"x", "y", "m", "u"};
        const std::vector<std::pair<int, int>> edges = {{3, 0}, {0, 2}, {2, 1}, {3, 1}};
        const std::vector<QPointF> at = layered_layout(names, edges, 0, 1);
        QCOMPARE(at[3], QPointF(0, -120));
        QCOMPARE(at[0], QPointF(220, 0));
        QCOMPARE(at[2], QPointF(440, -120));
        QCOMPARE(at[1], QPointF(660, 0));
        // Boxes placed there clear every route.
        std::vector<QRectF> boxes;
        for (const QPointF& p : at) boxes.push_back(box_at(p.x(), p.y()));
        QVERIFY2(check_all_pairs(boxes, 14).isEmpty(), qPrintable(check_all_pairs(boxes, 14)));
    }

    void canvas_arrows_clear_every_node() {
        // The canvas routes its arrows the same way: a node placed on the line between two others.
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {"X", "Y", "S"});
        page.doc()->move_node("X", {0, 0});
        page.doc()->move_node("S", {220, 0});
        page.doc()->move_node("Y", {440, 0});
        QVERIFY(page.add_unobserved("U"));
        page.doc()->move_node("U", {220, 130});
        QVERIFY(page.request_edge("U", "X"));
        QVERIFY(page.request_edge("S", "Y"));
        const QList<NodeItem*> nodes = page.scene()->node_items();
        QCOMPARE(page.scene()->edge_items().size(), 3);
        for (EdgeItem* e : page.scene()->edge_items()) {
            QVERIFY(e->route().size() >= 2);
            QVERIFY(on_border(e->route().front(), page.scene()->node_item(e->from())->scene_box()));
            QVERIFY(on_border(e->route().back(), page.scene()->node_item(e->to())->scene_box()));
            for (NodeItem* n : nodes)
                if (n->name() != e->from() && n->name() != e->to())
                    QVERIFY2(!path_enters(e->path(), n->scene_box()),
                             qPrintable(QStringLiteral("%1 → %2 crosses %3").arg(e->from(), e->to(), n->name())));
        }
        // X → Y had to go around S.
        for (EdgeItem* e : page.scene()->edge_items())
            if (e->from() == "X" && e->to() == "Y") QVERIFY(e->route().size() > 2);
    }
};

QTEST_MAIN(EdgeRouteTest)
#include "edge_route_test.moc"
