#include "ui/diagram_scene.h"

#include <QApplication>
#include <QFontMetricsF>
#include <QGraphicsSceneContextMenuEvent>
#include <QGraphicsSceneMouseEvent>
#include <QGraphicsView>
#include <QPainter>
#include <QPalette>
#include <QStyleOptionGraphicsItem>
#include <QtMath>
#include <algorithm>

#include "ui/edge_route.h"
#include "ui/palette.h"

namespace foldline::ui {

namespace {
constexpr double kMinW = 150, kH = 62;
// Room beside the text: the arrow handle on the right, the frame of exposure and outcome.
constexpr double kPadX = 16;

QFont name_font(bool observed) {
    QFont f = QApplication::font();
    f.setBold(true);
    f.setItalic(!observed);
    return f;
}

QFont caption_font() {
    QFont f = QApplication::font();
    f.setPointSizeF(f.pointSizeF() * 0.85);
    return f;
}

}  // namespace

NodeItem::NodeItem(const DiagramNode& node, std::optional<causal::Role> role)
    : name_(node.name), role_(role), observed_(node.observed) {
    setFlags(ItemIsMovable | ItemIsSelectable | ItemSendsGeometryChanges);
    setPos(node.pos);
    setZValue(1);
    // Grow the box to hold the name and the caption, up to kMaxWidth.
    const double text_w = std::max(QFontMetricsF(name_font(observed_)).horizontalAdvance(name_),
                                   QFontMetricsF(caption_font()).horizontalAdvance(caption()));
    const double w = std::clamp(std::ceil(text_w) + 2 * kPadX + 8, kMinW, kMaxWidth);
    rect_ = QRectF(-w / 2, -kH / 2, w, kH);
    setToolTip(observed_ ? QObject::tr("%1 — a column of the data").arg(name_)
                         : QObject::tr("%1 — not measured (declared by the reviewer)").arg(name_));
}

QString NodeItem::caption() const {
    QString c = role_words(role_);
    if (!observed_) c += c.isEmpty() ? QObject::tr("unobserved") : QObject::tr(" · unobserved");
    return c;
}

QRectF NodeItem::name_rect() const { return rect_.adjusted(kPadX, 4, -kPadX, -rect_.height() / 2 + 2); }
QRectF NodeItem::caption_rect() const { return rect_.adjusted(kPadX - 6, rect_.height() / 2 - 2, -kPadX + 6, -4); }

QString NodeItem::shown_name() const {
    return QFontMetricsF(name_font(observed_)).elidedText(name_, Qt::ElideMiddle, name_rect().width());
}

QString NodeItem::shown_caption() const {
    return QFontMetricsF(caption_font()).elidedText(caption(), Qt::ElideRight, caption_rect().width());
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
    const RoleShape shape = role_style(role_).shape;
    p->setRenderHint(QPainter::Antialiasing);
    QPen pen(selected ? colors::accent(pal) : fg, selected ? 3 : 1.6, observed_ ? Qt::SolidLine : Qt::DashLine);
    p->setPen(pen);
    p->setBrush(pal.color(QPalette::Base));
    const QPainterPath path = role_path(shape, rect_);
    p->drawPath(path);
    p->setBrush(fill);
    p->drawPath(path);
    // Exposure and outcome: a second outline inside the first.
    if (const double inset = inner_frame(shape, rect_); inset > 0) {
        p->setPen(QPen(fg, 1.2, observed_ ? Qt::SolidLine : Qt::DashLine));
        p->setBrush(Qt::NoBrush);
        p->drawPath(role_path(shape, rect_.adjusted(inset, inset, -inset, -inset)));
    }
    p->setFont(name_font(observed_));
    p->setPen(fg);
    p->drawText(name_rect(), Qt::AlignCenter, shown_name());
    p->setFont(caption_font());
    p->drawText(caption_rect(), Qt::AlignCenter, shown_caption());
    // Arrow handle.
    p->setPen(QPen(fg, 1.2));
    p->setBrush(pal.color(QPalette::Base));
    p->drawEllipse(port_rect());
    p->drawLine(QPointF(port_rect().center().x() - 3, 0), QPointF(port_rect().center().x() + 3, 0));
    p->drawLine(QPointF(port_rect().center().x() + 1, -2.5), QPointF(port_rect().center().x() + 3, 0));
    p->drawLine(QPointF(port_rect().center().x() + 1, 2.5), QPointF(port_rect().center().x() + 3, 0));
}

EdgeItem::EdgeItem(const QString& from, const QString& to, bool draft) : from_(from), to_(to), draft_(draft) {
    setFlag(ItemIsSelectable, !draft);
    setZValue(draft ? -1 : 0);
    setToolTip(draft ? QObject::tr("Draft: %1 causes %2 — assumed, not drawn by you (accept or discard the draft)")
                           .arg(from, to)
                     : QObject::tr("%1 causes %2 (right-click to reverse or delete)").arg(from, to));
}

void EdgeItem::set_route(const QPolygonF& route) {
    route_ = route;
    setPath(route_path(route, DiagramScene::kMargin / 2));
    head_.clear();
    if (route.size() < 2) return;
    const QPointF b = route.back();
    const QLineF line(b, route[route.size() - 2]);
    const double angle = std::atan2(-line.dy(), line.dx());
    const double size = 12;
    head_ << b << b + QPointF(std::sin(angle + M_PI / 3) * size, std::cos(angle + M_PI / 3) * size)
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
    QColor c = selected ? colors::accent(pal) : pal.color(QPalette::WindowText);
    p->setRenderHint(QPainter::Antialiasing);
    QPen pen(c, selected ? 3 : 1.8, draft_ ? Qt::DashLine : Qt::SolidLine);
    p->setPen(pen);
    p->setBrush(Qt::NoBrush);
    p->drawPath(path());
    p->setPen(QPen(c, 1.2));
    p->setBrush(draft_ ? pal.color(QPalette::Base) : c);
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
    for (QGraphicsItem* i : items(Qt::AscendingOrder))
        if (i->type() == EdgeItem::Type) out << static_cast<EdgeItem*>(i);
    return out;
}

QList<NodeItem*> DiagramScene::node_items() const {
    QList<NodeItem*> out;
    for (const DiagramNode& n : doc_->nodes())
        if (NodeItem* item = nodes_.value(n.name)) out << item;
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
        if (!nodes_.contains(e.from) || !nodes_.contains(e.to)) continue;
        auto* item = new EdgeItem(e.from, e.to, false);
        addItem(item);
        item->setSelected(selected_edges.contains(qMakePair(e.from, e.to)));
    }
    for (const DiagramEdge& e : doc_->draft())
        if (nodes_.contains(e.from) && nodes_.contains(e.to)) addItem(new EdgeItem(e.from, e.to, true));
    reroute();
}

void DiagramScene::reroute() {
    const QList<NodeItem*> ns = node_items();
    std::vector<QRectF> boxes;
    QHash<QString, int> index;
    for (NodeItem* n : ns) {
        index.insert(n->name(), int(boxes.size()));
        boxes.push_back(n->scene_box());
    }
    for (EdgeItem* e : edge_items())
        e->set_route(route_edge(boxes, index.value(e->from(), -1), index.value(e->to(), -1), kMargin));
}

void DiagramScene::on_node_moved(const QString& name, QPointF pos) {
    if (NodeItem* n = nodes_.value(name)) {
        n->setPos(pos);
        reroute();
    }
}

NodeItem* DiagramScene::node_at(QPointF p) const {
    for (QGraphicsItem* i : items(p))
        if (i->type() == NodeItem::Type) return static_cast<NodeItem*>(i);
    return nullptr;
}

void DiagramScene::contextMenuEvent(QGraphicsSceneContextMenuEvent* e) {
    for (QGraphicsItem* i : items(e->scenePos())) {
        if (i->type() == NodeItem::Type) {
            if (!i->isSelected()) {
                clearSelection();
                i->setSelected(true);
            }
            emit node_menu_requested(static_cast<NodeItem*>(i)->name(), e->screenPos());
            e->accept();
            return;
        }
        if (i->type() == EdgeItem::Type && !static_cast<EdgeItem*>(i)->draft()) {
            auto* edge = static_cast<EdgeItem*>(i);
            if (!edge->isSelected()) {
                clearSelection();
                edge->setSelected(true);
            }
            emit edge_menu_requested(edge->from(), edge->to(), e->screenPos());
            e->accept();
            return;
        }
    }
    QGraphicsScene::contextMenuEvent(e);
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
    if (!press_pos_.isEmpty()) reroute();
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
