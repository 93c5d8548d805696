#include "ui/diagram_page.h"

#include "ui/diagram_checks_panel.h"

#include <QApplication>
#include <QFileDialog>
#include <QFileInfo>
#include <QMessageBox>
#include <QSettings>
#include <QComboBox>
#include <QGraphicsView>
#include <QAction>
#include <QFrame>
#include <QHBoxLayout>
#include <QInputDialog>
#include <QMenu>
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

/// The legend: every role a node can take, with its shape and fill, then the outline of an
/// unobserved variable and the line of a draft arrow; words beside each, so nothing depends on
/// colour alone.
class RoleLegend : public QWidget {
public:
    explicit RoleLegend(QWidget* parent = nullptr) : QWidget(parent) {
        setObjectName(QStringLiteral("role_legend"));
        setMinimumHeight(int(all_roles().size() + 3) * kRow + 8);
        setToolTip(tr("Shapes and fills of the roles a node can take once the arrows are drawn"));
    }
    /// The legend's entries, in order (role words, then the three outline entries).
    static QStringList entries() {
        QStringList out;
        for (const causal::Role r : all_roles()) out << role_words(r);
        out << tr("no role yet (no verdict)") << tr("dashed outline: not measured") << tr("dashed arrow: draft, not yet accepted");
        return out;
    }

protected:
    static constexpr int kRow = 26;
    void paintEvent(QPaintEvent*) override {
        QPainter p(this);
        p.setRenderHint(QPainter::Antialiasing);
        const QPalette pal = palette();
        const QColor fg = pal.color(QPalette::WindowText);
        const QStringList words = entries();
        int y = 4;
        auto box = [&](std::optional<causal::Role> r, Qt::PenStyle style) {
            const QRectF b(4, y + 1, 46, 20);
            const RoleStyle& st = role_style(r);
            QColor fill = st.fill;
            fill.setAlpha(fill_alpha(colors::dark_theme(pal)));
            p.setPen(QPen(fg, 1.4, style));
            p.setBrush(pal.color(QPalette::Base));
            p.drawPath(role_path(st.shape, b));
            p.setBrush(fill);
            p.drawPath(role_path(st.shape, b));
            if (const double inset = inner_frame(st.shape, b); inset > 0) {
                p.setPen(QPen(fg, 1.0, style));
                p.setBrush(Qt::NoBrush);
                p.drawPath(role_path(st.shape, b.adjusted(inset, inset, -inset, -inset)));
            }
        };
        int i = 0;
        for (const causal::Role r : all_roles()) {
            box(r, Qt::SolidLine);
            p.setPen(fg);
            p.drawText(QRectF(58, y, width() - 60, 22), Qt::AlignVCenter, words[i++]);
            y += kRow;
        }
        box(std::nullopt, Qt::SolidLine);
        p.setPen(fg);
        p.drawText(QRectF(58, y, width() - 60, 22), Qt::AlignVCenter, words[i++]);
        y += kRow;
        box(std::nullopt, Qt::DashLine);
        p.setPen(fg);
        p.drawText(QRectF(58, y, width() - 60, 22), Qt::AlignVCenter, words[i++]);
        y += kRow;
        p.setPen(QPen(fg, 1.8, Qt::DashLine));
        p.drawLine(QPointF(6, y + 11), QPointF(44, y + 11));
        p.setPen(QPen(fg, 1.2));
        p.setBrush(pal.color(QPalette::Base));
        p.drawPolygon(QPolygonF({QPointF(50, y + 11), QPointF(42, y + 7), QPointF(42, y + 15)}));
        p.drawText(QRectF(58, y, width() - 60, 22), Qt::AlignVCenter, words[i++]);
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
    connect_->setToolTip(tr("While on, dragging from any node draws an arrow (Ctrl+D)"));
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

    // No verdict until the arrows are the reviewer's: the banner says so and offers a draft
    // (shown dashed, assumed, accepted with one click) or confirming the diagram as drawn.
    banner_ = new QFrame;
    banner_->setObjectName(QStringLiteral("diagram_banner"));
    static_cast<QFrame*>(banner_)->setFrameShape(QFrame::StyledPanel);
    banner_label_ = new QLabel;
    banner_label_->setObjectName(QStringLiteral("diagram_banner_text"));
    banner_label_->setWordWrap(true);
    draft_btn_ = new QPushButton(tr("Draft arrows from the finding"));
    draft_btn_->setObjectName(QStringLiteral("diagram_draft"));
    draft_btn_->setToolTip(tr("Show dashed arrows from each stratifier to the exposure and the outcome, to accept or discard"));
    confirm_btn_ = new QPushButton(tr("Use the diagram as drawn"));
    confirm_btn_->setObjectName(QStringLiteral("diagram_confirm"));
    confirm_btn_->setToolTip(tr("The arrows shown are all you claim: read the verdict for them"));
    accept_btn_ = new QPushButton(tr("Accept draft"));
    accept_btn_->setObjectName(QStringLiteral("diagram_accept_draft"));
    accept_btn_->setToolTip(tr("Make every dashed arrow an arrow of your diagram (undoable)"));
    discard_btn_ = new QPushButton(tr("Discard draft"));
    discard_btn_->setObjectName(QStringLiteral("diagram_discard_draft"));
    connect(draft_btn_, &QPushButton::clicked, this, &DiagramPage::offer_draft);
    connect(confirm_btn_, &QPushButton::clicked, this, &DiagramPage::confirm_as_drawn);
    connect(accept_btn_, &QPushButton::clicked, this, &DiagramPage::accept_draft);
    connect(discard_btn_, &QPushButton::clicked, this, &DiagramPage::discard_draft);
    auto* bl = new QHBoxLayout(banner_);
    bl->addWidget(banner_label_, 1);
    for (QPushButton* b : {draft_btn_, confirm_btn_, accept_btn_, discard_btn_}) bl->addWidget(b);
    banner_->hide();

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
    finding_label_ = new QLabel;
    finding_label_->setObjectName(QStringLiteral("diagram_finding"));
    finding_label_->setWordWrap(true);
    finding_label_->setTextFormat(Qt::RichText);
    finding_label_->setToolTip(tr("The verdict below is read for this finding; choose another on the Findings step"));
    sl->addWidget(finding_label_);
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
    cl->addWidget(banner_);
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
    connect(doc_, &DiagramDoc::structure_changed, this, &DiagramPage::refresh_banner);
    connect(scene_, &DiagramScene::node_menu_requested, this, &DiagramPage::show_node_menu);
    connect(scene_, &DiagramScene::edge_menu_requested, this, &DiagramPage::show_edge_menu);

    // Keyboard access to the canvas (while it has the focus): move through the nodes and arrows,
    // move nodes, reverse an arrow, rename, and the selection's menu (which also draws arrows).
    auto key = [this](const char* name, const QString& text, const QList<QKeySequence>& keys, auto slot) {
        auto* a = new QAction(text, view_);
        a->setObjectName(QLatin1String(name));
        a->setShortcuts(keys);
        a->setShortcutContext(Qt::WidgetWithChildrenShortcut);
        view_->addAction(a);
        connect(a, &QAction::triggered, this, slot);
    };
    key("canvas_next", tr("Select the next node or arrow"), {QKeySequence(Qt::Key_N)}, [this] { select_next(1); });
    key("canvas_previous", tr("Select the previous node or arrow"), {QKeySequence(Qt::SHIFT | Qt::Key_N)},
        [this] { select_next(-1); });
    const double step = 10, big = 40;
    key("canvas_left", tr("Move left"), {QKeySequence(Qt::Key_Left)}, [=, this] { nudge(-step, 0); });
    key("canvas_right", tr("Move right"), {QKeySequence(Qt::Key_Right)}, [=, this] { nudge(step, 0); });
    key("canvas_up", tr("Move up"), {QKeySequence(Qt::Key_Up)}, [=, this] { nudge(0, -step); });
    key("canvas_down", tr("Move down"), {QKeySequence(Qt::Key_Down)}, [=, this] { nudge(0, step); });
    key("canvas_left_far", tr("Move far left"), {QKeySequence(Qt::SHIFT | Qt::Key_Left)}, [=, this] { nudge(-big, 0); });
    key("canvas_right_far", tr("Move far right"), {QKeySequence(Qt::SHIFT | Qt::Key_Right)}, [=, this] { nudge(big, 0); });
    key("canvas_up_far", tr("Move far up"), {QKeySequence(Qt::SHIFT | Qt::Key_Up)}, [=, this] { nudge(0, -big); });
    key("canvas_down_far", tr("Move far down"), {QKeySequence(Qt::SHIFT | Qt::Key_Down)}, [=, this] { nudge(0, big); });
    key("canvas_reverse", tr("Reverse the selected arrows"), {QKeySequence(Qt::Key_R)}, [this] {
        for (QGraphicsItem* i : scene_->selectedItems())
            if (i->type() == EdgeItem::Type) reverse_edge(static_cast<EdgeItem*>(i)->from(), static_cast<EdgeItem*>(i)->to());
    });
    key("canvas_rename", tr("Rename the selected node"), {QKeySequence(Qt::Key_F2)}, [this] {
        for (QGraphicsItem* i : scene_->selectedItems())
            if (i->type() == NodeItem::Type) {
                const QString name = static_cast<NodeItem*>(i)->name();
                bool ok = false;
                const QString to = QInputDialog::getText(this, tr("Rename node"), tr("New name for %1:").arg(name),
                                                         QLineEdit::Normal, name, &ok);
                if (ok) rename_node(name, to.trimmed());
                return;
            }
    });
    key("canvas_menu", tr("Menu of the selection"), {QKeySequence(Qt::SHIFT | Qt::Key_F10)}, [this] { show_selection_menu(); });
    view_->setFocusPolicy(Qt::StrongFocus);
    view_->setToolTip(view_->toolTip() +
                      tr("; keys: N / Shift+N select the next / previous node or arrow, arrow keys move nodes, "
                         "R reverses an arrow, F2 renames, Shift+F10 opens the menu (arrows, role, delete)"));
    refresh_verdict();
    refresh_banner();
}

void DiagramPage::set_finding(const QString& words) {
    finding_label_->setText(words.isEmpty() ? QString()
                                            : tr("<p><b>Verdict for the finding:</b> %1</p>").arg(words.toHtmlEscaped()));
    finding_label_->setProperty("finding", words);
}

QString DiagramPage::finding() const { return finding_label_->property("finding").toString(); }

QString DiagramPage::banner() const { return banner_->isHidden() ? QString() : banner_label_->text(); }

QString DiagramPage::verdict_text() const { return verdict_label_->text(); }

void DiagramPage::refresh_banner() {
    const std::vector<DiagramEdge> draft = doc_->draft();
    QString text;
    if (!draft.empty()) {
        QStringList arrows;
        for (const DiagramEdge& e : draft) arrows << QStringLiteral("%1 → %2").arg(e.from, e.to);
        text = tr("Draft, not your diagram yet: the dashed arrows (%1) assume that each one is a real cause. Foldline "
                  "did not learn them from the data. Accept the draft only if you hold every arrow it shows true; "
                  "until then there is no verdict.").arg(arrows.join(QStringLiteral(", ")));
    } else if (!doc_->confirmed()) {
        text = tr("No verdict yet: apart from %1 → %2 nobody has drawn an arrow. Draw the arrows you know (drag from a "
                  "node's ▸ handle), draft them from the finding, or use the diagram as drawn.")
                   .arg(doc_->exposure(), doc_->outcome());
    }
    banner_label_->setText(text);
    banner_->setVisible(!text.isEmpty());
    draft_btn_->setVisible(draft.empty() && !doc_->confirmed());
    confirm_btn_->setVisible(draft.empty() && !doc_->confirmed());
    accept_btn_->setVisible(!draft.empty());
    discard_btn_->setVisible(!draft.empty());
}

void DiagramPage::confirm_as_drawn() {
    if (doc_->confirmed()) return;
    show_message({});
    undo_->push(new ConfirmDiagramCommand(doc_));
}

bool DiagramPage::offer_draft() {
    std::vector<DiagramEdge> draft = doc_->draft_from_strata();
    if (draft.empty()) {
        show_message(tr("The finding's stratifiers have no arrow to draft: each already has its arrows, or would close a cycle."));
        return false;
    }
    show_message({});
    undo_->push(new SetDraftCommand(doc_, std::move(draft), tr("draft arrows")));
    return true;
}

void DiagramPage::accept_draft() {
    const std::vector<DiagramEdge> draft = doc_->draft();
    if (draft.empty()) return;
    undo_->beginMacro(tr("accept the draft"));
    undo_->push(new SetDraftCommand(doc_, {}, tr("accept the draft")));
    for (const DiagramEdge& e : draft)
        if (doc_->check_edge(e.from, e.to).isEmpty()) undo_->push(new AddEdgeCommand(doc_, e.from, e.to));
    if (!doc_->confirmed()) undo_->push(new ConfirmDiagramCommand(doc_));
    undo_->endMacro();
    show_message({});
}

void DiagramPage::discard_draft() {
    if (doc_->draft().empty()) return;
    undo_->push(new SetDraftCommand(doc_, {}, tr("discard the draft")));
}

bool DiagramPage::reverse_edge(const QString& from, const QString& to) {
    const QString why = doc_->check_reverse(from, to);
    if (!why.isEmpty()) {
        show_message(why);
        return false;
    }
    show_message({});
    undo_->push(new ReverseEdgeCommand(doc_, from, to));
    return true;
}

bool DiagramPage::rename_node(const QString& name, const QString& new_name) {
    if (new_name == name) return true;
    const QString why = doc_->check_rename(name, new_name);
    if (!why.isEmpty()) {
        show_message(why);
        return false;
    }
    show_message({});
    undo_->push(new RenameNodeCommand(doc_, name, new_name));
    return true;
}

bool DiagramPage::set_node_observed(const QString& name, bool observed) {
    const auto n = doc_->node(name);
    if (!n || n->observed == observed) return false;
    if (observed && !data_columns_.contains(name)) {
        show_message(tr("%1 is not a column of the data, so it cannot be marked measured.").arg(name));
        return false;
    }
    if (!observed && (name == doc_->exposure() || name == doc_->outcome())) {
        show_message(tr("The exposure and the outcome are columns of the data: they stay measured."));
        return false;
    }
    show_message({});
    undo_->push(new SetObservedCommand(doc_, name, observed));
    return true;
}

void DiagramPage::select_next(int step) {
    QList<QGraphicsItem*> order;
    for (NodeItem* n : scene_->node_items()) order << n;
    for (EdgeItem* e : scene_->edge_items())
        if (!e->draft()) order << e;
    if (order.isEmpty()) return;
    int at = -1;
    for (int i = 0; i < order.size(); ++i)
        if (order[i]->isSelected()) at = i;
    const int next = at < 0 ? (step > 0 ? 0 : int(order.size()) - 1) : int((at + step + order.size()) % order.size());
    scene_->clearSelection();
    order[next]->setSelected(true);
    view_->ensureVisible(order[next]);
}

void DiagramPage::nudge(double dx, double dy) {
    QHash<QString, QPointF> before, after;
    for (QGraphicsItem* i : scene_->selectedItems())
        if (i->type() == NodeItem::Type) {
            const QString name = static_cast<NodeItem*>(i)->name();
            before.insert(name, i->pos());
            after.insert(name, i->pos() + QPointF(dx, dy));
        }
    if (after.isEmpty()) return;
    undo_->push(new MoveNodesCommand(doc_, before, after, tr("move")));
}

QMenu* DiagramPage::node_menu(const QString& name) {
    auto* menu = new QMenu(this);
    menu->setObjectName(QStringLiteral("node_menu"));
    const auto node = doc_->node(name);
    if (!node) return menu;
    const bool question = name == doc_->exposure() || name == doc_->outcome();
    // Role: what the arrows make of the node (read-only), and whether it is measured.
    QString role = role_words(verdict_.roles.contains(name) ? std::optional(verdict_.roles.value(name)) : std::nullopt);
    if (name == doc_->exposure()) role = role_words(causal::Role::Exposure);
    if (name == doc_->outcome()) role = role_words(causal::Role::Outcome);
    QAction* role_info = menu->addAction(role.isEmpty() ? tr("Role: none until the verdict") : tr("Role: %1 (from the arrows)").arg(role));
    role_info->setEnabled(false);
    QAction* measured = menu->addAction(tr("Measured (a column of the data)"));
    measured->setObjectName(QStringLiteral("node_measured"));
    measured->setCheckable(true);
    measured->setChecked(node->observed);
    measured->setEnabled(!question && (node->observed || data_columns_.contains(name)));
    connect(measured, &QAction::toggled, this, [this, name](bool on) { set_node_observed(name, on); });
    menu->addSeparator();
    QMenu* to = menu->addMenu(tr("Arrow to"));
    to->setObjectName(QStringLiteral("node_arrow_to"));
    QMenu* from = menu->addMenu(tr("Arrow from"));
    from->setObjectName(QStringLiteral("node_arrow_from"));
    for (const DiagramNode& other : doc_->nodes()) {
        if (other.name == name) continue;
        QAction* a = to->addAction(other.name);
        a->setEnabled(doc_->check_edge(name, other.name).isEmpty());
        connect(a, &QAction::triggered, this, [this, name, o = other.name] { request_edge(name, o); });
        QAction* b = from->addAction(other.name);
        b->setEnabled(doc_->check_edge(other.name, name).isEmpty());
        connect(b, &QAction::triggered, this, [this, name, o = other.name] { request_edge(o, name); });
    }
    menu->addSeparator();
    QAction* rename = menu->addAction(tr("Rename…"));
    rename->setObjectName(QStringLiteral("node_rename"));
    const QString why = doc_->check_rename(name, name);
    rename->setEnabled(why.isEmpty());
    rename->setToolTip(why);
    connect(rename, &QAction::triggered, this, [this, name] {
        bool ok = false;
        const QString to = QInputDialog::getText(this, tr("Rename node"), tr("New name for %1:").arg(name), QLineEdit::Normal,
                                                 name, &ok);
        if (ok) rename_node(name, to.trimmed());
    });
    QAction* del = menu->addAction(tr("Delete"));
    del->setObjectName(QStringLiteral("node_delete"));
    del->setEnabled(!question);
    connect(del, &QAction::triggered, this, [this, name] {
        undo_->push(new RemoveNodeCommand(doc_, name));
        show_message({});
    });
    return menu;
}

QMenu* DiagramPage::edge_menu(const QString& from, const QString& to) {
    auto* menu = new QMenu(this);
    menu->setObjectName(QStringLiteral("edge_menu"));
    QAction* rev = menu->addAction(tr("Reverse (%1 → %2)").arg(to, from));
    rev->setObjectName(QStringLiteral("edge_reverse"));
    const QString why = doc_->check_reverse(from, to);
    rev->setEnabled(why.isEmpty());
    rev->setToolTip(why);
    connect(rev, &QAction::triggered, this, [this, from, to] { reverse_edge(from, to); });
    QAction* del = menu->addAction(tr("Delete"));
    del->setObjectName(QStringLiteral("edge_delete"));
    connect(del, &QAction::triggered, this, [this, from, to] {
        undo_->push(new RemoveEdgeCommand(doc_, from, to));
        show_message({});
    });
    return menu;
}

void DiagramPage::show_node_menu(const QString& name, const QPoint& screen_pos) {
    QMenu* m = node_menu(name);
    m->setAttribute(Qt::WA_DeleteOnClose);
    m->popup(screen_pos);
}

void DiagramPage::show_edge_menu(const QString& from, const QString& to, const QPoint& screen_pos) {
    QMenu* m = edge_menu(from, to);
    m->setAttribute(Qt::WA_DeleteOnClose);
    m->popup(screen_pos);
}

void DiagramPage::show_selection_menu() {
    const QList<QGraphicsItem*> sel = scene_->selectedItems();
    if (sel.isEmpty()) return;
    QGraphicsItem* i = sel.first();
    const QPoint at = view_->viewport()->mapToGlobal(view_->mapFromScene(i->sceneBoundingRect().center()));
    if (i->type() == NodeItem::Type) show_node_menu(static_cast<NodeItem*>(i)->name(), at);
    else if (i->type() == EdgeItem::Type) show_edge_menu(static_cast<EdgeItem*>(i)->from(), static_cast<EdgeItem*>(i)->to(), at);
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
        // Core's sentence (e.g. which of the finding's columns the diagram lacks), as a sentence.
        QString why = verdict_.problem;
        if (!why.isEmpty()) why[0] = why[0].toUpper();
        if (!why.isEmpty() && !why.endsWith(QLatin1Char('.'))) why += QLatin1Char('.');
        html = tr("<p><b>No verdict yet.</b></p><p>%1</p>").arg(why.toHtmlEscaped());
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
