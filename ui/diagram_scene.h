#pragma once
// The diagram canvas. It owns an editing mode and mirrors a DiagramDoc with one item per node
// and arrow; edits the reviewer makes with the mouse go out as signals (the page turns them
// into undoable commands), never straight into the document.
#include "ui/diagram_doc.h"
#include "ui/role_style.h"

#include <QGraphicsItem>
#include <QGraphicsScene>
#include <QHash>
#include <optional>

namespace foldline::ui {

/// A node drawn with a shape for its role, its name, and the role spelled out beneath (shape,
/// colour and words from ui/role_style). No role (no verdict yet): a grey box, no words.
class NodeItem : public QGraphicsItem {
public:
    enum { Type = UserType + 31 };
    NodeItem(const DiagramNode& node, std::optional<causal::Role> role);
    int type() const override { return Type; }
    QString name() const { return name_; }
    std::optional<causal::Role> role() const { return role_; }
    /// The fill painted over the base colour of `pal` (role_style's colour, fill_alpha's opacity).
    QColor fill(const QPalette& pal) const;
    QRectF boundingRect() const override;
    QPainterPath shape() const override;
    void paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget* w) override;
    /// Where a line from the centre towards `towards` leaves the node's outline.
    QPointF exit_point(QPointF towards) const;
    /// The handle on the right edge from which arrows are dragged.
    QRectF port_rect() const;
private:
    QString name_;
    std::optional<causal::Role> role_;
    bool observed_;
    QRectF rect_;
};

class EdgeItem : public QGraphicsPathItem {
public:
    enum { Type = UserType + 32 };
    EdgeItem(NodeItem* from, NodeItem* to);
    int type() const override { return Type; }
    QString from() const { return from_->name(); }
    QString to() const { return to_->name(); }
    void adjust();
    void paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget* w) override;
    QPainterPath shape() const override;

private:
    NodeItem *from_, *to_;
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
    QList<EdgeItem*> edge_items() const;
    /// Rebuilds every item from the document.
    void rebuild();

signals:
    void edge_requested(const QString& from, const QString& to);
    void nodes_moved(const QHash<QString, QPointF>& before, const QHash<QString, QPointF>& after);

protected:
    void mousePressEvent(QGraphicsSceneMouseEvent* e) override;
    void mouseMoveEvent(QGraphicsSceneMouseEvent* e) override;
    void mouseReleaseEvent(QGraphicsSceneMouseEvent* e) override;

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
