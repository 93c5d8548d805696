#include "ui/diagram_page.h"

#include "ui/diagram_checks_panel.h"

#include <QApplication>
#include <QFileDialog>
#include <QFileInfo>
#include <QMessageBox>
#include <QSettings>
#include <QComboBox>
#include <QGraphicsView>
#include <QHBoxLayout>
#include <QKeyEvent>
#include <QLabel>
#include <QLineEdit>
#include <QPainter>
#include <QPushButton>
#include <QScrollArea>
#include <QSplitter>
#include <QToolButton>
#include <QUndoStack>
#include <QVBoxLayout>

#include "core/causal/diagram_file.h"
#include "core/common/atomic_file.h"
#include "ui/caution_band.h"
#include "ui/diagram_commands.h"
#include "ui/diagram_scene.h"
#include "ui/palette.h"

namespace foldline::ui {

namespace {

/// The legend: each role's shape with its name, so nothing depends on colour.
class RoleLegend : public QWidget {
public:
    explicit RoleLegend(QWidget* parent = nullptr) : QWidget(parent) {
        setMinimumHeight(int(roles().size()) * 30 + 8);
        setToolTip(tr("Shapes of the roles; dashed outlines are unobserved variables"));
    }
    static std::vector<causal::Role> roles() {
        using causal::Role;
        return {Role::Exposure, Role::Outcome, Role::Confounder, Role::Mediator, Role::Collider, Role::OutcomeDescendant,
                Role::ExposureCause};
    }

protected:
    void paintEvent(QPaintEvent*) override {
        QPainter p(this);
        p.setRenderHint(QPainter::Antialiasing);
        const QPalette pal = palette();
        int y = 4;
        for (const causal::Role r : roles()) {
            const QRectF box(4, y, 46, 22);
            p.setPen(QPen(pal.color(QPalette::WindowText), 1.4));
            p.setBrush(pal.color(QPalette::Base));
            p.drawPath(role_path(role_style(r).shape, box));
            if (r == causal::Role::Exposure) p.fillRect(QRectF(box.left() + 3, box.top() + 4, 4, box.height() - 8), pal.color(QPalette::WindowText));
            if (r == causal::Role::Outcome) p.fillRect(QRectF(box.right() - 7, box.top() + 4, 4, box.height() - 8), pal.color(QPalette::WindowText));
            p.drawText(QRectF(58, y, width() - 60, 22), Qt::AlignVCenter, role_words(r));
            y += 30;
        }
    }
};

}  // namespace

DiagramPage::DiagramPage(QWidget* parent)
    : QWidget(parent), doc_(new DiagramDoc(this)), scene_(new DiagramScene(doc_, this)), undo_(new QUndoStack(this)) {
    view_ = new QGraphicsView(scene_);
    view_->setObjectName(QStringLiteral("diagram_view"));
    view_->setRenderHint(QPainter::Antialiasing);
    view_->setDragMode(QGraphicsView::RubberBandDrag);
    view_->setToolTip(tr("Drag a node to move it; drag from its ▸ handle (or Shift+drag) to draw an arrow"));

    connect_ = new QToolButton;
    connect_->setText(tr("Draw arrows"));
    connect_->setCheckable(true);
    connect_->setToolTip(tr("While on, dragging from any node draws an arrow (A)"));
    connect(connect_, &QToolButton::toggled, this, &DiagramPage::set_connect_mode);
    columns_ = new QComboBox;
    columns_->setToolTip(tr("Columns of the data not yet in the diagram"));
    columns_->setMinimumContentsLength(14);
    auto* add_col = new QPushButton(tr("Add column"));
    connect(add_col, &QPushButton::clicked, this, [this] { add_observed(columns_->currentText()); });
    unobserved_ = new QLineEdit;
    unobserved_->setPlaceholderText(tr("name of something not measured"));
    unobserved_->setToolTip(tr("Declare a variable the data does not hold, e.g. a common cause you suspect"));
    auto* add_u = new QPushButton(tr("Add unobserved"));
    connect(add_u, &QPushButton::clicked, this, [this] {
        if (add_unobserved(unobserved_->text().trimmed())) unobserved_->clear();
    });
    connect(unobserved_, &QLineEdit::returnPressed, add_u, &QPushButton::click);
    auto* del = new QPushButton(tr("Delete"));
    del->setToolTip(tr("Delete the selected nodes and arrows (Delete)"));
    connect(del, &QPushButton::clicked, this, &DiagramPage::delete_selected);
    auto* layout_btn = new QPushButton(tr("Tidy"));
    layout_btn->setToolTip(tr("Arrange the nodes left to right along the arrows (Ctrl+L)"));
    connect(layout_btn, &QPushButton::clicked, this, &DiagramPage::auto_layout);

    auto* bar = new QHBoxLayout;
    bar->addWidget(connect_);
    bar->addSpacing(8);
    bar->addWidget(columns_);
    bar->addWidget(add_col);
    bar->addSpacing(8);
    bar->addWidget(unobserved_, 1);
    bar->addWidget(add_u);
    bar->addSpacing(8);
    bar->addWidget(del);
    bar->addWidget(layout_btn);

    message_ = new QLabel;
    message_->setObjectName(QStringLiteral("diagram_message"));
    message_->setWordWrap(true);
    message_->hide();

    verdict_label_ = new QLabel;
    verdict_label_->setObjectName(QStringLiteral("verdict"));
    verdict_label_->setWordWrap(true);
    verdict_label_->setTextFormat(Qt::RichText);
    verdict_label_->setAlignment(Qt::AlignTop | Qt::AlignLeft);
    verdict_label_->setTextInteractionFlags(Qt::TextSelectableByMouse);
    auto* side = new QWidget;
    auto* sl = new QVBoxLayout(side);
    sl->addWidget(verdict_label_);
    sl->addSpacing(10);
    checks_ = new DiagramChecksPanel;
    sl->addWidget(checks_);
    sl->addSpacing(10);
    sl->addWidget(new QLabel(tr("<b>Shapes</b>")));
    sl->addWidget(new RoleLegend);
    sl->addStretch();
    auto* scroll = new QScrollArea;
    scroll->setWidget(side);
    scroll->setWidgetResizable(true);
    scroll->setMinimumWidth(280);

    auto* canvas = new QWidget;
    auto* cl = new QVBoxLayout(canvas);
    cl->setContentsMargins(0, 0, 0, 0);
    cl->addLayout(bar);
    cl->addWidget(message_);
    cl->addWidget(view_, 1);

    split_ = new QSplitter(Qt::Horizontal);
    split_->setObjectName(QStringLiteral("diagram_splitter"));
    split_->addWidget(canvas);
    split_->addWidget(scroll);
    split_->setStretchFactor(0, 3);
    split_->setStretchFactor(1, 1);

    auto* lay = new QVBoxLayout(this);
    lay->addWidget(new CautionBand);
    lay->addWidget(split_, 1);

    connect(scene_, &DiagramScene::edge_requested, this, &DiagramPage::request_edge);
    connect(scene_, &DiagramScene::nodes_moved, this,
            [this](const QHash<QString, QPointF>& before, const QHash<QString, QPointF>& after) {
                undo_->push(new MoveNodesCommand(doc_, before, after, tr("move")));
            });
    connect(doc_, &DiagramDoc::structure_changed, this, &DiagramPage::refresh_verdict);
    connect(doc_, &DiagramDoc::structure_changed, this, [this] { checks_->set_diagram(doc_->diagram()); });
    connect(doc_, &DiagramDoc::structure_changed, this, &DiagramPage::refill_columns);
    refresh_verdict();
}

QString DiagramPage::message() const { return message_->isHidden() ? QString() : message_->text(); }

void DiagramPage::show_message(const QString& text) {
    message_->setText(text.isEmpty() ? QString() : QStringLiteral("⚠ ") + text);
    message_->setVisible(!text.isEmpty());
}

void DiagramPage::seed(const QString& exposure, const QString& outcome, const QStringList& strata,
                       const QStringList& columns) {
    undo_->clear();
    doc_->seed(exposure, outcome, strata);
    data_columns_ = columns;
    refill_columns();  // the seed above ran before the columns were known
    show_message({});
    auto_layout();
    undo_->clear();
    fit_view();
}

Status DiagramPage::open_file(const QString& path) {
    auto d = causal::read_diagram(path.toStdString());
    if (!d) return d.error();
    if (auto st = doc_->replace(*d); !st) {
        Error e = st.error();
        e.file = path.toStdString();
        return e;
    }
    if (doc_->crowded()) {
        const QHash<QString, QPointF> pos = doc_->layout();
        for (auto it = pos.begin(); it != pos.end(); ++it) doc_->move_node(it.key(), it.value());
    }
    undo_->clear();
    refill_columns();
    show_message({});
    fit_view();
    return Ok{};
}

Status DiagramPage::save_file(const QString& path) const { return causal::write_diagram(doc_->diagram(), path.toStdString()); }

Status DiagramPage::export_dot(const QString& path) const {
    // The shared atomic writer, as for every other file: its error carries the system's reason.
    return write_file_atomically(path.toStdString(), causal::diagram_to_dot(doc_->diagram()));
}

void DiagramPage::open_dialog() {
    const QString path = QFileDialog::getOpenFileName(this, tr("Open diagram"), QSettings().value("diagram/last_dir").toString(),
                                                      tr("Diagrams (*.diagram.json *.json);;All files (*)"));
    if (path.isEmpty()) return;
    QSettings().setValue("diagram/last_dir", QFileInfo(path).absolutePath());
    const Status st = open_file(path);
    if (!st) QMessageBox::warning(this, tr("Open diagram"), QString::fromStdString(st.error().to_string()));
}

void DiagramPage::save_dialog() {
    QString path = QFileDialog::getSaveFileName(this, tr("Save diagram"), QSettings().value("diagram/last_dir").toString(),
                                                tr("Diagrams (*.diagram.json)"));
    if (path.isEmpty()) return;
    if (!path.endsWith(QLatin1String(".json"))) path += QStringLiteral(".diagram.json");
    QSettings().setValue("diagram/last_dir", QFileInfo(path).absolutePath());
    const Status st = save_file(path);
    if (!st) QMessageBox::warning(this, tr("Save diagram"), QString::fromStdString(st.error().to_string()));
}

void DiagramPage::export_dot_dialog() {
    QString path = QFileDialog::getSaveFileName(this, tr("Export diagram as DOT"), QSettings().value("diagram/last_dir").toString(),
                                                tr("Graphviz DOT (*.dot *.gv)"));
    if (path.isEmpty()) return;
    if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".dot");
    const Status st = export_dot(path);
    if (!st) QMessageBox::warning(this, tr("Export DOT"), QString::fromStdString(st.error().to_string()));
}

void DiagramPage::fit_view() {
    // Natural size when the diagram fits; shrink (never enlarge) when it does not.
    const QRectF r = scene_->itemsBoundingRect().adjusted(-40, -40, 40, 40);
    view_->resetTransform();
    const QSize vp = view_->viewport()->size();
    if (r.width() > vp.width() || r.height() > vp.height()) view_->fitInView(r, Qt::KeepAspectRatio);
    view_->centerOn(r.center());
}

void DiagramPage::showEvent(QShowEvent* e) {
    QWidget::showEvent(e);
    fit_view();
}

void DiagramPage::refill_columns() {
    columns_->clear();
    for (const QString& c : data_columns_)
        if (!doc_->node(c)) columns_->addItem(c);
}

QPointF DiagramPage::free_spot() const {
    const QRectF r = scene_->itemsBoundingRect();
    return r.isNull() ? QPointF(0, 0) : QPointF(r.center().x(), r.bottom() + 80);
}

bool DiagramPage::request_edge(const QString& from, const QString& to) {
    const QString why = doc_->check_edge(from, to);
    if (!why.isEmpty()) {
        show_message(why);
        return false;
    }
    show_message({});
    undo_->push(new AddEdgeCommand(doc_, from, to));
    return true;
}

bool DiagramPage::add_observed(const QString& column) {
    const QString why = doc_->check_node(column);
    if (!why.isEmpty()) {
        show_message(why);
        return false;
    }
    show_message({});
    undo_->push(new AddNodeCommand(doc_, DiagramNode{column, true, free_spot()}));
    return true;
}

bool DiagramPage::add_unobserved(const QString& name) {
    const QString why = doc_->check_node(name);
    if (!why.isEmpty()) {
        show_message(why);
        return false;
    }
    show_message({});
    undo_->push(new AddNodeCommand(doc_, DiagramNode{name, false, free_spot()}));
    return true;
}

void DiagramPage::delete_selected() {
    QList<QPair<QString, QString>> edges;
    QStringList nodes;
    for (QGraphicsItem* i : scene_->selectedItems()) {
        if (i->type() == EdgeItem::Type) edges << qMakePair(static_cast<EdgeItem*>(i)->from(), static_cast<EdgeItem*>(i)->to());
        if (i->type() == NodeItem::Type) nodes << static_cast<NodeItem*>(i)->name();
    }
    nodes.removeAll(doc_->exposure());
    nodes.removeAll(doc_->outcome());
    if (edges.isEmpty() && nodes.isEmpty()) {
        if (!scene_->selectedItems().isEmpty()) show_message(tr("The exposure and the outcome stay in the diagram."));
        return;
    }
    undo_->beginMacro(tr("delete"));
    for (const auto& e : edges)
        if (!nodes.contains(e.first) && !nodes.contains(e.second)) undo_->push(new RemoveEdgeCommand(doc_, e.first, e.second));
    for (const QString& n : nodes) undo_->push(new RemoveNodeCommand(doc_, n));
    undo_->endMacro();
    show_message({});
}

void DiagramPage::auto_layout() {
    QHash<QString, QPointF> before, after = doc_->layout();
    for (const DiagramNode& n : doc_->nodes()) before.insert(n.name, n.pos);
    if (before == after) return;
    undo_->push(new MoveNodesCommand(doc_, before, after, tr("tidy")));
}

void DiagramPage::set_connect_mode(bool on) {
    scene_->set_mode(on ? DiagramScene::Mode::Connect : DiagramScene::Mode::Move);
    view_->setDragMode(on ? QGraphicsView::NoDrag : QGraphicsView::RubberBandDrag);
    if (connect_->isChecked() != on) connect_->setChecked(on);
}

void DiagramPage::refresh_verdict() {
    verdict_ = doc_->verdict();
    QString html;
    if (!verdict_.computed) {
        html = tr("<p><b>No verdict yet.</b></p><p>%1</p>").arg(verdict_.problem.toHtmlEscaped());
    } else {
        html = tr("<p style='font-size:large'><b>Quote: %1</b></p>").arg(verdict_.recommended.toHtmlEscaped());
        html += QStringLiteral("<p>%1</p>").arg(verdict_.reason.toHtmlEscaped());
        if (!verdict_.adjusted.isEmpty())
            html += tr("<p><b>Estimate to quote:</b> %1</p>").arg(verdict_.adjusted.toHtmlEscaped());
        html += tr("<p><b>Valid adjustment sets</b> (smallest first):</p><ul>");
        if (verdict_.valid_sets.isEmpty()) html += tr("<li>none made of observed columns</li>");
        for (const QStringList& s : verdict_.valid_sets)
            html += QStringLiteral("<li>%1</li>").arg(s.isEmpty() ? tr("∅ — no adjustment needed")
                                                                   : QStringList(s).join(QStringLiteral(", ")).toHtmlEscaped());
        html += QStringLiteral("</ul>");
        html += tr("<p><b>Roles</b></p><ul>");
        for (const DiagramNode& n : doc_->nodes()) {
            if (auto r = verdict_.roles.constFind(n.name); r != verdict_.roles.cend())
                html += QStringLiteral("<li>%1: %2</li>").arg(n.name.toHtmlEscaped(), role_words(*r).toHtmlEscaped());
        }
        html += QStringLiteral("</ul>");
        if (!verdict_.direct_effect.isEmpty())
            html += tr("<p><b>Effect not through the mediators:</b> %1</p>").arg(verdict_.direct_effect.toHtmlEscaped());
    }
    verdict_label_->setText(html);
    scene_->set_roles(verdict_.roles);
    emit verdict_changed(verdict_);
}

}  // namespace foldline::ui
