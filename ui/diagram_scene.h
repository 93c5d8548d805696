#pragma once
// The diagram canvas. It owns an editing mode and mirrors a DiagramDoc with one item per node
// and arrow; edits the reviewer makes with the mouse go out as signals (the page turns them
// into undoable commands), never straight into the document. Arrows are routed around the
// boxes (ui/edge_route), so none runs through a node.
#include "ui/diagram_doc.h"
#include "ui/role_style.h"

#include <QGraphicsItem>
#include <QGraphicsPathItem>
#include <QGraphicsScene>
#include <QHash>
#include <optional>

namespace foldline::ui {

/// A node drawn with a shape for its role, its name, and the role spelled out beneath (shape,
/// colour and words from ui/role_style). No role (no verdict yet): a grey box, no words. The
/// box grows with its name and caption up to a limit; a longer name is elided (the tooltip
/// holds it whole), so no label runs out of its box.
class NodeItem : public QGraphicsItem {
public:
    enum { Type = UserType + 31 };
    NodeItem(const DiagramNode& node, std::optional<causal::Role> role);
    int type() const override { return Type; }
    QString name() const { return name_; }
    bool observed() const { return observed_; }
    std::optional<causal::Role> role() const { return role_; }
    /// The fill painted over the base colour of `pal` (role_style's colour, fill_alpha's opacity).
    QColor fill(const QPalette& pal) const;
    /// The box in item coordinates (centred on the node's position) and in scene coordinates.
    QRectF box() const { return rect_; }
    QRectF scene_box() const { return rect_.translated(pos()); }
    /// The name and caption as drawn (elided when they would not fit).
    QString shown_name() const;
    QString shown_caption() const;
    /// The caption under the name: the role's words, "unobserved" for a declared variable.
    QString caption() const;
    QRectF boundingRect() const override;
    QPainterPath shape() const override;
    void paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget* w) override;
    /// The handle on the right edge from which arrows are dragged.
    QRectF port_rect() const;
    /// Widest a box grows before its name is elided.
    static constexpr double kMaxWidth = 280;

private:
    QRectF name_rect() const;
    QRectF caption_rect() const;
    QString name_;
    std::optional<causal::Role> role_;
    bool observed_;
    QRectF rect_;
};

/// An arrow along a routed path. A draft arrow (DiagramDoc::draft) is dashed and cannot be
/// selected: it is not part of the diagram until the reviewer accepts it.
class EdgeItem : public QGraphicsPathItem {
public:
    enum { Type = UserType + 32 };
    EdgeItem(const QString& from, const QString& to, bool draft);
    int type() const override { return Type; }
    QString from() const { return from_; }
    QString to() const { return to_; }
    bool draft() const { return draft_; }
    /// The route the arrow follows (first point on the source's border, last on the target's).
    QPolygonF route() const { return route_; }
    void set_route(const QPolygonF& route);
    void paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget* w) override;
    QPainterPath shape() const override;

private:
    QString from_, to_;
    bool draft_;
    QPolygonF route_;
    QPolygonF head_;
};

class DiagramScene : public QGraphicsScene {
    Q_OBJECT
public:
    enum class Mode { Move, Connect };
    DiagramScene(DiagramDoc* doc, QObject* parent = nullptr);

    Mode mode() const { return mode_; }
    void set_mode(Mode m);
    /// Roles from the latest verdict (node → role); redraws the nodes.
    void set_roles(const QHash<QString, causal::Role>& roles);
    NodeItem* node_item(const QString& name) const { return nodes_.value(name); }
    QList<NodeItem*> node_items() const;
    /// Arrows of the diagram and of a pending draft (EdgeItem::draft tells them apart).
    QList<EdgeItem*> edge_items() const;
    /// Rebuilds every item from the document.
    void rebuild();
    /// Routes every arrow again around the boxes where they are now.
    void reroute();
    /// Clearance kept between an arrow and a box it passes (scene units).
    static constexpr double kMargin = 14;

signals:
    void edge_requested(const QString& from, const QString& to);
    void nodes_moved(const QHash<QString, QPointF>& before, const QHash<QString, QPointF>& after);
    /// A context menu asked for on a node or an arrow (nothing under the pointer: both empty).
    void node_menu_requested(const QString& name, const QPoint& screen_pos);
    void edge_menu_requested(const QString& from, const QString& to, const QPoint& screen_pos);

protected:
    void mousePressEvent(QGraphicsSceneMouseEvent* e) override;
    void mouseMoveEvent(QGraphicsSceneMouseEvent* e) override;
    void mouseReleaseEvent(QGraphicsSceneMouseEvent* e) override;
    void contextMenuEvent(QGraphicsSceneContextMenuEvent* e) override;

private:
    NodeItem* node_at(QPointF p) const;
    void on_node_moved(const QString& name, QPointF pos);

    DiagramDoc* doc_;
    Mode mode_ = Mode::Move;
    QHash<QString, NodeItem*> nodes_;
    QHash<QString, causal::Role> roles_;
    NodeItem* connect_from_ = nullptr;
    QGraphicsLineItem* rubber_ = nullptr;
    QHash<QString, QPointF> press_pos_;
};

}  // namespace foldline::ui
