#include "ui/diagram_scene.h"

#include <QApplication>
#include <QGraphicsSceneMouseEvent>
#include <QPainter>
#include <QPalette>
#include <QStyleOptionGraphicsItem>
#include <QtMath>

#include "ui/palette.h"

namespace foldline::ui {

namespace {
constexpr double kW = 150, kH = 62;

}  // namespace

NodeItem::NodeItem(const DiagramNode& node, std::optional<causal::Role> role)
    : name_(node.name), role_(role), observed_(node.observed), rect_(-kW / 2, -kH / 2, kW, kH) {
    setFlags(ItemIsMovable | ItemIsSelectable | ItemSendsGeometryChanges);
    setPos(node.pos);
    setZValue(1);
    setToolTip(observed_ ? QObject::tr("%1 — a column of the data").arg(name_)
                         : QObject::tr("%1 — not measured (declared by the reviewer)").arg(name_));
}

QRectF NodeItem::boundingRect() const { return rect_.adjusted(-4, -4, 14, 4); }

QRectF NodeItem::port_rect() const { return QRectF(rect_.right() - 2, -6, 12, 12); }

QColor NodeItem::fill(const QPalette& pal) const {
    QColor c = role_style(role_).fill;
    c.setAlpha(fill_alpha(colors::dark_theme(pal)));
    return c;
}

QPainterPath NodeItem::shape() const {
    QPainterPath p = role_path(role_style(role_).shape, rect_);
    p.addEllipse(port_rect());
    return p;
}

void NodeItem::paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget*) {
    const QPalette pal = QApplication::palette();
    const bool selected = opt->state & QStyle::State_Selected;
    const QColor fg = pal.color(QPalette::WindowText);
    const QColor fill = this->fill(pal);
    p->setRenderHint(QPainter::Antialiasing);
    QPen pen(selected ? colors::accent(pal) : fg, selected ? 3 : 1.6, observed_ ? Qt::SolidLine : Qt::DashLine);
    p->setPen(pen);
    p->setBrush(pal.color(QPalette::Base));
    const QPainterPath path = role_path(role_style(role_).shape, rect_);
    p->drawPath(path);
    p->setBrush(fill);
    p->drawPath(path);
    // Exposure and outcome carry a heavy bar on the side the effect leaves or arrives.
    if (role_ == causal::Role::Exposure || role_ == causal::Role::Outcome) {
        const double x = role_ == causal::Role::Exposure ? rect_.left() + 4 : rect_.right() - 10;
        p->setPen(Qt::NoPen);
        p->setBrush(fg);
        p->drawRect(QRectF(x, rect_.top() + 8, 6, rect_.height() - 16));
    }
    QFont f = QApplication::font();
    f.setBold(true);
    f.setItalic(!observed_);
    p->setFont(f);
    p->setPen(fg);
    const QRectF name_r = rect_.adjusted(12, 4, -12, -rect_.height() / 2 + 2);
    p->drawText(name_r, Qt::AlignCenter, p->fontMetrics().elidedText(name_, Qt::ElideMiddle, int(name_r.width())));
    QFont small = QApplication::font();
    small.setPointSizeF(small.pointSizeF() * 0.85);
    p->setFont(small);
    QString caption = role_words(role_);
    if (!observed_) caption += caption.isEmpty() ? QObject::tr("unobserved") : QObject::tr(" · unobserved");
    p->drawText(rect_.adjusted(6, rect_.height() / 2 - 2, -6, -4), Qt::AlignCenter, caption);
    // Arrow handle.
    p->setPen(QPen(fg, 1.2));
    p->setBrush(pal.color(QPalette::Base));
    p->drawEllipse(port_rect());
    p->drawLine(QPointF(port_rect().center().x() - 3, 0), QPointF(port_rect().center().x() + 3, 0));
    p->drawLine(QPointF(port_rect().center().x() + 1, -2.5), QPointF(port_rect().center().x() + 3, 0));
    p->drawLine(QPointF(port_rect().center().x() + 1, 2.5), QPointF(port_rect().center().x() + 3, 0));
}

QPointF NodeItem::exit_point(QPointF towards) const {
    const QPointF c = pos();
    const QPointF d = towards - c;
    if (qFuzzyIsNull(d.x()) && qFuzzyIsNull(d.y())) return c;
    const double sx = d.x() != 0 ? (kW / 2) / std::abs(d.x()) : 1e9;
    const double sy = d.y() != 0 ? (kH / 2) / std::abs(d.y()) : 1e9;
    return c + d * std::min(sx, sy);
}

EdgeItem::EdgeItem(NodeItem* from, NodeItem* to) : from_(from), to_(to) {
    setFlags(ItemIsSelectable);
    setZValue(0);
    adjust();
    setToolTip(QObject::tr("%1 causes %2 (select and press Delete to remove)").arg(from->name(), to->name()));
}

void EdgeItem::adjust() {
    const QPointF a = from_->exit_point(to_->pos());
    const QPointF b = to_->exit_point(from_->pos());
    QPainterPath path(a);
    path.lineTo(b);
    setPath(path);
    const QLineF line(b, a);
    const double angle = std::atan2(-line.dy(), line.dx());
    const double size = 12;
    head_ = QPolygonF() << b << b + QPointF(std::sin(angle + M_PI / 3) * size, std::cos(angle + M_PI / 3) * size)
                        << b + QPointF(std::sin(angle + M_PI - M_PI / 3) * size, std::cos(angle + M_PI - M_PI / 3) * size);
}

QPainterPath EdgeItem::shape() const {
    QPainterPathStroker s;
    s.setWidth(10);
    QPainterPath p = s.createStroke(path());
    p.addPolygon(head_);
    return p;
}

void EdgeItem::paint(QPainter* p, const QStyleOptionGraphicsItem* opt, QWidget*) {
    const QPalette pal = QApplication::palette();
    const bool selected = opt->state & QStyle::State_Selected;
    const QColor c = selected ? colors::accent(pal) : pal.color(QPalette::WindowText);
    p->setRenderHint(QPainter::Antialiasing);
    p->setPen(QPen(c, selected ? 3 : 1.8));
    p->setBrush(Qt::NoBrush);
    p->drawPath(path());
    p->setBrush(c);
    p->drawPolygon(head_);
}

DiagramScene::DiagramScene(DiagramDoc* doc, QObject* parent) : QGraphicsScene(parent), doc_(doc) {
    connect(doc_, &DiagramDoc::structure_changed, this, &DiagramScene::rebuild);
    connect(doc_, &DiagramDoc::node_moved, this, &DiagramScene::on_node_moved);
    rebuild();
}

void DiagramScene::set_mode(Mode m) { mode_ = m; }

void DiagramScene::set_roles(const QHash<QString, causal::Role>& roles) {
    roles_ = roles;
    rebuild();
}

QList<EdgeItem*> DiagramScene::edge_items() const {
    QList<EdgeItem*> out;
    for (QGraphicsItem* i : items())
        if (i->type() == EdgeItem::Type) out << static_cast<EdgeItem*>(i);
    return out;
}

void DiagramScene::rebuild() {
    QStringList selected_nodes;
    QList<QPair<QString, QString>> selected_edges;
    for (QGraphicsItem* i : selectedItems()) {
        if (i->type() == NodeItem::Type) selected_nodes << static_cast<NodeItem*>(i)->name();
        if (i->type() == EdgeItem::Type) selected_edges << qMakePair(static_cast<EdgeItem*>(i)->from(), static_cast<EdgeItem*>(i)->to());
    }
    rubber_ = nullptr;
    connect_from_ = nullptr;
    clear();
    nodes_.clear();
    for (const DiagramNode& n : doc_->nodes()) {
        std::optional<causal::Role> role;
        if (auto it = roles_.constFind(n.name); it != roles_.cend()) role = *it;
        if (n.name == doc_->exposure()) role = causal::Role::Exposure;
        if (n.name == doc_->outcome()) role = causal::Role::Outcome;
        auto* item = new NodeItem(n, role);
        addItem(item);
        item->setSelected(selected_nodes.contains(n.name));
        nodes_.insert(n.name, item);
    }
    for (const DiagramEdge& e : doc_->edges()) {
        NodeItem* a = nodes_.value(e.from);
        NodeItem* b = nodes_.value(e.to);
        if (!a || !b) continue;
        auto* item = new EdgeItem(a, b);
        addItem(item);
        item->setSelected(selected_edges.contains(qMakePair(e.from, e.to)));
    }
}

void DiagramScene::on_node_moved(const QString& name, QPointF pos) {
    if (NodeItem* n = nodes_.value(name)) {
        n->setPos(pos);
        for (EdgeItem* e : edge_items())
            if (e->from() == name || e->to() == name) e->adjust();
    }
}

NodeItem* DiagramScene::node_at(QPointF p) const {
    for (QGraphicsItem* i : items(p))
        if (i->type() == NodeItem::Type) return static_cast<NodeItem*>(i);
    return nullptr;
}

void DiagramScene::mousePressEvent(QGraphicsSceneMouseEvent* e) {
    NodeItem* n = node_at(e->scenePos());
    const bool on_port = n && n->port_rect().contains(n->mapFromScene(e->scenePos()));
    if (e->button() == Qt::LeftButton && n &&
        (mode_ == Mode::Connect || on_port || (e->modifiers() & Qt::ShiftModifier))) {
        connect_from_ = n;
        rubber_ = new QGraphicsLineItem(QLineF(n->pos(), e->scenePos()));
        rubber_->setPen(QPen(colors::accent(QApplication::palette()), 2, Qt::DashLine));
        rubber_->setZValue(5);
        addItem(rubber_);
        e->accept();
        return;
    }
    press_pos_.clear();
    QGraphicsScene::mousePressEvent(e);
    for (QGraphicsItem* i : selectedItems())
        if (i->type() == NodeItem::Type) press_pos_.insert(static_cast<NodeItem*>(i)->name(), i->pos());
}

void DiagramScene::mouseMoveEvent(QGraphicsSceneMouseEvent* e) {
    if (rubber_) {
        rubber_->setLine(QLineF(connect_from_->pos(), e->scenePos()));
        return;
    }
    QGraphicsScene::mouseMoveEvent(e);
    if (!press_pos_.isEmpty())
        for (EdgeItem* edge : edge_items()) edge->adjust();
}

void DiagramScene::mouseReleaseEvent(QGraphicsSceneMouseEvent* e) {
    if (rubber_) {
        const QString from = connect_from_->name();
        removeItem(rubber_);
        delete rubber_;
        rubber_ = nullptr;
        connect_from_ = nullptr;
        if (NodeItem* to = node_at(e->scenePos()); to && to->name() != from) emit edge_requested(from, to->name());
        else if (to && to->name() == from) emit edge_requested(from, from);
        return;
    }
    QGraphicsScene::mouseReleaseEvent(e);
    QHash<QString, QPointF> before, after;
    for (auto it = press_pos_.begin(); it != press_pos_.end(); ++it)
        if (NodeItem* n = nodes_.value(it.key()); n && n->pos() != it.value()) {
            before.insert(it.key(), it.value());
            after.insert(it.key(), n->pos());
        }
    press_pos_.clear();
    if (!after.isEmpty()) emit nodes_moved(before, after);
}

}  // namespace foldline::ui
