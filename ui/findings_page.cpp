#include "ui/findings_page.h"

#include <QAction>
#include <QApplication>
#include <QButtonGroup>
#include <QClipboard>
#include <QFileDialog>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QRegularExpression>
#include <QDir>
#include <QLabel>
#include <QLineEdit>
#include <QMenu>
#include <QMessageBox>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QScrollArea>
#include <QSettings>
#include <QSplitter>
#include <QStyledItemDelegate>
#include <QTabWidget>
#include <QTableWidget>
#include <QToolButton>
#include <QTreeView>
#include <QUndoStack>
#include <QVBoxLayout>
#include <qcustomplot.h>

#include "ui/caution_band.h"
#include "ui/charts.h"
#include "ui/family_tree_model.h"
#include "ui/findings_model.h"
#include "ui/mean_charts.h"
#include "ui/mean_view.h"
#include "ui/palette.h"
#include "ui/review_commands.h"
#include "ui/tsv.h"

namespace foldline::ui {

namespace {

QString count_text(double pos, double n) {
    return QStringLiteral("%1 / %2").arg(pos, 0, 'f', 0).arg(n, 0, 'f', 0);
}

QString ratio_text(double r) { return std::isfinite(r) ? QString::number(r, 'f', 2) : QStringLiteral("—"); }

void set_headers(QTableWidget* t, const QStringList& names, const QStringList& tips) {
    t->setColumnCount(int(names.size()));
    for (int i = 0; i < names.size(); ++i) {
        auto* h = new QTableWidgetItem(names[i]);
        if (i < tips.size()) h->setToolTip(tips[i]);
        t->setHorizontalHeaderItem(i, h);
    }
}

QTableWidget* make_table() {
    auto* t = new QTableWidget;
    t->setEditTriggers(QAbstractItemView::NoEditTriggers);
    t->verticalHeader()->hide();
    t->horizontalHeader()->setStretchLastSection(true);
    t->setSelectionBehavior(QAbstractItemView::SelectRows);
    t->setWordWrap(false);
    return t;
}

void put(QTableWidget* t, int r, int c, const QString& text, bool greyed = false, const QString& tip = {}) {
    auto* item = new QTableWidgetItem(text);
    if (c > 0) item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
    if (greyed) {
        item->setForeground(colors::muted(QApplication::palette()));
        QFont f = item->font();
        f.setItalic(true);
        item->setFont(f);
    }
    if (!tip.isEmpty()) item->setToolTip(tip);
    t->setItem(r, c, item);
}

/// The findings list's rows: a little air around each, and the strata wrapped onto a second line
/// when the column is too narrow for a pair, instead of cutting the names short.
class FindingsRowDelegate : public QStyledItemDelegate {
public:
    explicit FindingsRowDelegate(QTreeView* view) : QStyledItemDelegate(view), view_(view) {}

    QSize sizeHint(const QStyleOptionViewItem& option, const QModelIndex& index) const override {
        QSize s = QStyledItemDelegate::sizeHint(option, index);
        const QModelIndex strata = index.siblingAtColumn(FindingsModel::Strata);
        int depth = 0;
        for (QModelIndex p = strata.parent(); p.isValid(); p = p.parent()) ++depth;
        // The text's room: the column less the fold mark's indent and the cell's margins.
        const int room = view_->header()->sectionSize(FindingsModel::Strata) - view_->indentation() * (depth + 1) - 12;
        const QRect r = option.fontMetrics.boundingRect(QRect(0, 0, std::max(room, 40), 100000), Qt::TextWordWrap,
                                                        strata.data().toString());
        s.setHeight(std::max(s.height(), r.height()) + 8);
        return s;
    }

private:
    QTreeView* view_;
};

const QString kTipRate = QObject::tr("Share of the group with the positive outcome, with its 95% Wilson score interval");
const QString kTipRd = QObject::tr("Risk difference in percentage points: focal rate minus reference rate, with its 95% Newcombe interval");
const QString kTipRatio = QObject::tr("Selection-rate ratio: focal rate divided by reference rate; below 0.8 is the common four-fifths flag");
const QString kTipCounts = QObject::tr("Positives out of the group's total");

}  // namespace

FindingsPage::FindingsPage(FindingsModel* model, QWidget* parent)
    : QWidget(parent), model_(model), tree_(new FamilyTreeModel(model, this)), filter_(new FindingsFilter(this)),
      reviews_(new QUndoStack(this)) {
    filter_->setSourceModel(tree_);

    // Left: filter chips, search, ranked list.
    auto* chips = new QHBoxLayout;
    chips->setSpacing(4);
    for (FindingClass c : {FindingClass::Reversal, FindingClass::Explained, FindingClass::Masked,
                           FindingClass::Heterogeneous, FindingClass::Stable}) {
        auto* b = new QToolButton;
        b->setCheckable(true);
        b->setChecked(true);
        b->setAutoRaise(false);
        b->setToolTip(tr("Show or hide %1 findings: %2").arg(class_title(c).toLower(), class_meaning(c)));
        b->setObjectName(QStringLiteral("show_") + class_title(c).toLower());
        connect(b, &QToolButton::toggled, this, [this, c](bool on) {
            filter_->set_class_shown(c, on);
            update_chips();
        });
        chips_[int(c)] = b;
        chips->addWidget(b);
    }
    chips->addStretch();
    search_ = new QLineEdit;
    search_->setPlaceholderText(tr("Search strata…"));
    search_->setClearButtonEnabled(true);
    search_->setObjectName(QStringLiteral("search_findings"));
    connect(search_, &QLineEdit::textChanged, filter_, &FindingsFilter::set_search);

    list_ = new QTreeView;
    list_->setObjectName(QStringLiteral("findings_list"));
    // Arrows move inside the list (Right or + unfolds a family, Left or - folds it); Tab leaves
    // it for the decision buttons and the note.
    list_->setTabKeyNavigation(false);
    list_->setModel(filter_);
    list_->setSortingEnabled(true);
    list_->sortByColumn(FindingsModel::Class, Qt::AscendingOrder);
    list_->setSelectionBehavior(QAbstractItemView::SelectRows);
    list_->setSelectionMode(QAbstractItemView::SingleSelection);
    list_->setAllColumnsShowFocus(true);
    list_->setRootIsDecorated(true);
    // The fold mark and the indent sit with the strata, where a member's pair is read against its
    // lead's column; the class stays in the first column.
    list_->setTreePosition(FindingsModel::Strata);
    list_->setIndentation(14);
    list_->setUniformRowHeights(false);
    list_->setItemDelegate(new FindingsRowDelegate(list_));
    list_->setExpandsOnDoubleClick(true);
    // Every column fits its contents and the strata take what is left, so class, strata, gaps,
    // q-value and decision are all in view without scrolling sideways.
    list_->header()->setSectionResizeMode(QHeaderView::ResizeToContents);
    list_->header()->setSectionResizeMode(FindingsModel::Strata, QHeaderView::Stretch);
    list_->header()->setStretchLastSection(false);
    list_->header()->setSectionsMovable(false);
    list_->setTextElideMode(Qt::ElideMiddle);
    list_->setAlternatingRowColors(true);
    list_->setWordWrap(true);
    // Rows wrap to the strata column's width: a new width lays them out again.
    connect(list_->header(), &QHeaderView::sectionResized, list_, [this](int section) {
        if (section == FindingsModel::Strata) list_->doItemsLayout();
    });
    list_->setContextMenuPolicy(Qt::CustomContextMenu);
    connect(list_, &QWidget::customContextMenuRequested, this, [this](const QPoint& at) {
        const QModelIndex i = list_->indexAt(at);
        if (!i.isValid()) return;
        select(source_row(i));
        QMenu* menu = context_menu_for(source_row(i));
        menu->exec(list_->viewport()->mapToGlobal(at));
        menu->deleteLater();
    });
    connect(model_, &QAbstractItemModel::rowsInserted, this, &FindingsPage::update_chips);
    connect(model_, &QAbstractItemModel::modelReset, this, &FindingsPage::update_chips);
    update_chips();
    connect(list_->selectionModel(), &QItemSelectionModel::currentChanged, this, [this](const QModelIndex& cur) {
        const int row = source_row(cur);
        if (row != shown_) show_finding(row);
    });

    // The hidden-group hint: a note beside the findings, not one of them (it has no class, no
    // q-value and no review), so it is a labelled line above the list, never a row in it.
    hint_ = new QLabel;
    hint_->setObjectName(QStringLiteral("hidden_group_hint"));
    hint_->setWordWrap(true);
    hint_->setTextFormat(Qt::PlainText);
    hint_->setFrameShape(QFrame::StyledPanel);
    hint_->setMargin(6);
    hint_->setToolTip(tr("From \"Also look for hidden groups\": mixtures fitted to the two columns. "
                         "A hint to look further, not a finding about any real group."));
    hint_->hide();
    partial_ = new QLabel;
    partial_->setObjectName(QStringLiteral("partial_note"));
    partial_->setWordWrap(true);
    partial_->setTextFormat(Qt::PlainText);
    partial_->setFrameShape(QFrame::StyledPanel);
    partial_->setMargin(6);
    partial_->hide();

    auto* left = new QWidget;
    auto* ll = new QVBoxLayout(left);
    ll->setContentsMargins(0, 0, 0, 0);
    ll->addLayout(chips);
    ll->addWidget(partial_);
    ll->addWidget(hint_);
    ll->addWidget(search_);
    ll->addWidget(list_, 1);

    // Right: the selected finding.
    heading_ = new QLabel;
    heading_->setObjectName(QStringLiteral("finding_heading"));
    heading_->setTextFormat(Qt::RichText);
    meaning_ = new QLabel;
    meaning_->setWordWrap(true);

    auto* decide_row = new QHBoxLayout;
    decision_ = new QButtonGroup(this);
    decision_->setExclusive(true);
    const std::pair<Decision, QString> choices[] = {
        {Decision::Upheld, tr("The finding stands and the chosen view is the one to quote")},
        {Decision::SetAside, tr("The finding does not hold up or does not matter for this question")},
        {Decision::FollowUp, tr("More data or expert advice is needed before deciding")},
        {Decision::Undecided, tr("Not decided yet: takes back a decision made earlier (the note stays)")}};
    decide_row->addWidget(new QLabel(tr("Decision:")));
    for (const auto& [d, tip] : choices) {
        auto* b = new QPushButton(d == Decision::Undecided ? tr("Undecided") : decision_title(d));
        b->setCheckable(true);
        b->setToolTip(tip);
        b->setObjectName(QStringLiteral("decide_") + QString::number(int(d)));
        decision_->addButton(b, int(d));
        decide_row->addWidget(b);
    }
    connect(decision_, &QButtonGroup::idClicked, this, [this](int id) { decide(Decision(id)); });
    apply_ = new QAction(tr("Apply decision to the &family"), this);
    apply_->setObjectName(QStringLiteral("action_apply_family"));
    apply_->setShortcut(QKeySequence(tr("Ctrl+Shift+M")));
    apply_->setToolTip(tr("Copy this lead's decision to every finding folded beneath it, in one undoable step "
                          "(Ctrl+Shift+M). Each keeps its own note and records that its decision came from the lead; "
                          "findings decided otherwise are overwritten only if you say so."));
    apply_->setStatusTip(apply_->toolTip());
    apply_->setEnabled(false);
    addAction(apply_);
    connect(apply_, &QAction::triggered, this, [this] { apply_to_family(); });
    apply_button_ = new QPushButton(tr("Apply to family"));
    apply_button_->setObjectName(QStringLiteral("apply_family"));
    apply_button_->setToolTip(apply_->toolTip());
    apply_button_->setEnabled(false);
    apply_button_->hide();
    connect(apply_button_, &QPushButton::clicked, apply_, &QAction::trigger);
    decide_row->addSpacing(12);
    decide_row->addWidget(apply_button_);
    decide_row->addStretch();
    family_ = new QLabel;
    family_->setObjectName(QStringLiteral("family_line"));
    family_->setWordWrap(true);
    family_->setTextFormat(Qt::RichText);
    family_->hide();
    // A member's line links to its lead.
    connect(family_, &QLabel::linkActivated, this, [this](const QString&) {
        const int lead = tree_->lead_row(selected());
        if (lead >= 0) select(lead);
    });
    note_ = new QPlainTextEdit;
    note_->setPlaceholderText(tr("Reviewer's note on this finding…"));
    note_->setMaximumHeight(52);
    note_->setObjectName(QStringLiteral("finding_note"));
    note_->setTabChangesFocus(true);  // Tab moves on; the note is one or two lines of text
    connect(note_, &QPlainTextEdit::textChanged, this, [this] {
        if (showing_) return;
        const int r = selected();
        if (const FindingView* f = model_->at(r)) model_->set_decision(r, f->decision, note_->toPlainText());
    });

    pooled_ = make_table();
    pooled_->setObjectName(QStringLiteral("pooled_table"));
    strata_ = make_table();
    strata_->setObjectName(QStringLiteral("strata_table"));
    auto* pooled_box = new QWidget;
    auto* pl = new QVBoxLayout(pooled_box);
    pl->setContentsMargins(0, 0, 0, 0);
    pooled_title_ = new QLabel;
    pooled_title_->setObjectName(QStringLiteral("pooled_title"));
    pl->addWidget(pooled_title_);
    pl->addWidget(pooled_);
    auto* strata_box = new QWidget;
    auto* sl = new QVBoxLayout(strata_box);
    sl->setContentsMargins(0, 0, 0, 0);
    sl->addWidget(new QLabel(tr("<b>Within each stratum</b>")));
    sl->addWidget(strata_);
    auto* tables = tables_split_ = new QSplitter(Qt::Horizontal);
    tables->setObjectName(QStringLiteral("tables_splitter"));
    tables->addWidget(pooled_box);
    tables->addWidget(strata_box);
    tables->setStretchFactor(0, 2);
    tables->setStretchFactor(1, 3);

    charts_ = new QTabWidget;
    charts_->setObjectName(QStringLiteral("chart_tabs"));
    auto make_plot = [this](const QString& name, const QString& tip) {
        auto* p = new QCustomPlot;
        p->setObjectName(name);
        p->setToolTip(tip);
        p->setMinimumHeight(220);
        return p;
    };
    forest_ = make_plot(QStringLiteral("chart_forest"), tr("Each stratum's gap with its 95% interval, beside the pooled and adjusted gaps"));
    mix_ = make_plot(QStringLiteral("chart_mix"), tr("How each group is spread across the strata"));
    decomp_ = make_plot(QStringLiteral("chart_decomposition"), tr("The pooled gap split into a within-stratum part and a part due to different stratum mixes"));
    scatter_ = make_plot(QStringLiteral("chart_scatter"), tr("Points with the pooled line (dashed) and one line per stratum"));
    multiples_ = make_plot(QStringLiteral("chart_multiples"), tr("One small panel per stratum"));
    means_ = make_plot(QStringLiteral("chart_means"), tr("Each group's mean with its 95% interval, within each stratum and pooled"));
    forest_scroll_ = new QScrollArea;
    forest_scroll_->setWidget(forest_);
    forest_scroll_->setWidgetResizable(true);
    forest_scroll_->setFrameShape(QFrame::NoFrame);
    charts_->addTab(forest_scroll_, tr("Gaps by stratum"));
    charts_->addTab(mix_, tr("Stratum mix"));
    charts_->addTab(decomp_, tr("Decomposition"));
    charts_->addTab(scatter_, tr("Scatter"));
    charts_->addTab(multiples_, tr("Per stratum"));
    charts_->addTab(means_, tr("Group means"));

    auto* copy = new QPushButton(tr("Copy table (TSV)"));
    copy->setToolTip(tr("Copy the per-stratum table, or the table you clicked last, as tab-separated text (Ctrl+Shift+C)"));
    connect(copy, &QPushButton::clicked, this, &FindingsPage::copy_table);
    auto* save = new QPushButton(tr("Save chart…"));
    save->setToolTip(tr("Save the visible chart as PNG, SVG or PDF (Ctrl+Shift+S)"));
    connect(save, &QPushButton::clicked, this, &FindingsPage::save_chart);
    auto* tools = new QHBoxLayout;
    tools->addStretch();
    tools->addWidget(copy);
    tools->addWidget(save);

    detail_split_ = new QSplitter(Qt::Vertical);
    detail_split_->setObjectName(QStringLiteral("detail_splitter"));
    detail_split_->addWidget(tables);
    detail_split_->addWidget(charts_);
    detail_split_->setStretchFactor(0, 2);
    detail_split_->setStretchFactor(1, 3);

    detail_ = new QWidget;
    auto* dl = new QVBoxLayout(detail_);
    dl->setContentsMargins(0, 0, 0, 0);
    pay_caution_ = new QLabel;
    pay_caution_->setObjectName(QStringLiteral("pay_caution"));
    pay_caution_->setWordWrap(true);
    pay_caution_->setTextFormat(Qt::RichText);
    pay_caution_->setText(QStringLiteral("<b>%1</b> %2").arg(tr("Caution:"), pay_review_caution().toHtmlEscaped()));
    pay_caution_->setFrameShape(QFrame::StyledPanel);
    pay_caution_->setMargin(6);
    pay_caution_->hide();
    dl->addWidget(heading_);
    dl->addWidget(pay_caution_);
    dl->addWidget(meaning_);
    dl->addWidget(family_);
    dl->addLayout(decide_row);
    dl->addWidget(note_);
    dl->addWidget(detail_split_, 1);
    dl->addLayout(tools);
    empty_ = new QLabel(tr("Run a scan (step 3) and pick a finding from the list."));
    empty_->setAlignment(Qt::AlignCenter);
    auto* right = new QWidget;
    auto* rl = new QVBoxLayout(right);
    rl->setContentsMargins(0, 0, 0, 0);
    rl->addWidget(empty_);
    rl->addWidget(detail_, 1);
    detail_->hide();

    split_ = new QSplitter(Qt::Horizontal);
    split_->setObjectName(QStringLiteral("findings_splitter"));
    split_->addWidget(left);
    split_->addWidget(right);
    // The list keeps room for every column, the strata included, at 1440 px.
    split_->setStretchFactor(0, 1);
    split_->setStretchFactor(1, 1);
    split_->setSizes({860, 580});
    tables->setSizes({330, 600});

    auto* lay = new QVBoxLayout(this);
    lay->addWidget(new CautionBand);
    lay->addWidget(split_, 1);

    connect(model_, &QAbstractItemModel::modelReset, this, [this] {
        // Another scan: the decisions' history belonged to the findings that are gone.
        reviews_->clear();
        show_finding(-1);
    });
    // A decision changed elsewhere (undo, the menu, a family applied) shows on the open finding.
    connect(model_, &QAbstractItemModel::dataChanged, this, [this](const QModelIndex& tl, const QModelIndex& br) {
        const int r = selected();
        if (r >= tl.row() && r <= br.row())
            if (const FindingView* f = model_->at(r)) show_review(*f);
    });
    connect(model_, &QAbstractItemModel::rowsInserted, this, &FindingsPage::update_apply);
}

int FindingsPage::source_row(const QModelIndex& view_index) const {
    return view_index.isValid() ? tree_->source_row(filter_->mapToSource(view_index)) : -1;
}

int FindingsPage::selected() const { return source_row(list_->selectionModel()->currentIndex()); }

bool FindingsPage::select(int row) {
    const QModelIndex p = filter_->mapFromSource(tree_->index_of(row, 0));
    if (!p.isValid()) return false;
    // A finding folded beneath its lead is shown by unfolding the family.
    if (p.parent().isValid()) list_->expand(p.parent());
    list_->selectionModel()->setCurrentIndex(p, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
    list_->scrollTo(p);
    return true;
}

int FindingsPage::select_top() {
    if (filter_->rowCount() == 0) return -1;
    const QModelIndex p = filter_->index(0, 0);
    list_->selectionModel()->setCurrentIndex(p, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
    return source_row(p);
}

void FindingsPage::set_search(const QString& text) { search_->setText(text); }

void FindingsPage::set_hidden_group_hint(const QString& note) {
    hint_->setText(note.isEmpty() ? QString() : tr("Hidden-group hint (not a finding): %1").arg(note));
    hint_->setVisible(!note.isEmpty());
}

void FindingsPage::update_chips() {
    int counts[5] = {0, 0, 0, 0, 0};
    for (const FindingView& f : model_->findings()) ++counts[int(f.cls)];
    for (int i = 0; i < 5; ++i) {
        QToolButton* b = chips_[i];
        if (!b) continue;
        const auto c = FindingClass(i);
        // On or off is said in words and a box, not by the button's shading alone.
        b->setText(QStringLiteral("%1 %2 %3 (%4)")
                       .arg(b->isChecked() ? QStringLiteral("☑") : QStringLiteral("☐"), class_glyph(c), class_title(c))
                       .arg(counts[i]));
        b->setAccessibleName(tr("%1 findings: %2, %3").arg(class_title(c)).arg(counts[i])
                                 .arg(b->isChecked() ? tr("shown") : tr("hidden")));
    }
}

void FindingsPage::set_partial_note(const QString& why) {
    partial_->setText(why.isEmpty() ? QString() : tr("Partial: %1").arg(why));
    partial_->setVisible(!why.isEmpty());
}

QString FindingsPage::partial_note() const { return partial_->isHidden() ? QString() : partial_->text(); }

QString FindingsPage::hidden_group_hint() const { return hint_->isHidden() ? QString() : hint_->text(); }

void FindingsPage::show_finding(int row) {
    const FindingView* f = model_->at(row);
    shown_ = f ? row : -1;
    detail_->setVisible(f != nullptr);
    empty_->setVisible(f == nullptr);
    if (!f) {
        update_apply();
        emit finding_selected(-1);
        return;
    }
    showing_ = true;
    heading_->setText(QStringLiteral("<span style='font-size:large'><b>%1 %2</b> — stratified by <b>%3</b></span>")
                          .arg(class_glyph(f->cls), class_title(f->cls), f->strata_label().toHtmlEscaped()));
    QString detail = class_meaning(f->cls);
    // The q-value is the reversal test's (FDR over every check), whatever the class: say so, so a
    // heterogeneous or explained finding's q near 1 is not read as "nothing here".
    if (std::isfinite(f->q_value)) detail += tr("  Reversal q-value %1").arg(f->q_value, 0, 'g', 3);
    if (std::isfinite(f->stability)) detail += tr("; kept its class in %1% of resamples").arg(100 * f->stability, 0, 'f', 0);
    meaning_->setText(detail);
    show_review(*f);
    note_->setPlainText(f->note);
    pay_caution_->setVisible(f->mean);
    pooled_title_->setText(f->slope  ? tr("<b>Pooled and adjusted</b> (slopes pooled over all strata and within them, tests)")
                           : f->mean ? tr("<b>Pooled and adjusted</b> (group means pooled over all strata, the gap adjusted "
                                          "within them, tests)")
                                     : tr("<b>Pooled and adjusted</b> (rates pooled over all strata, gaps adjusted within "
                                          "them, tests)"));
    if (f->slope) fill_slope_tables(*f);
    else if (f->mean) fill_mean_tables(*f);
    else fill_rate_tables(*f);
    draw_charts(*f);
    showing_ = false;
    emit finding_selected(row);
}

void FindingsPage::show_review(const FindingView& f) {
    if (auto* b = decision_->button(int(f.decision))) b->setChecked(true);
    else {
        decision_->setExclusive(false);
        for (auto* b2 : decision_->buttons()) b2->setChecked(false);
        decision_->setExclusive(true);
    }
    const int row = selected();
    const std::vector<int> folded = tree_->folded_under(row);
    QString line;
    if (f.in_family() && tree_->lead_row(row) != row) {
        line = tr("%1 of the family led by <a href=\"lead\">%2</a>: %3.")
                   .arg(f.family_role == FamilyRole::Proxy ? tr("Proxy") : tr("Member"),
                        f.family_lead.toHtmlEscaped(), f.family_reason.toHtmlEscaped());
        if (!f.applied_from.isEmpty())
            line += QStringLiteral(" <b>%1</b>").arg(tr("Decision applied from the lead %1.").arg(f.applied_from.toHtmlEscaped()));
    } else if (!folded.empty()) {
        line = tr("Leads a family of %1 findings: the %2 folded beneath it in the list repeat its story. "
                  "Its decision can be applied to all of them (Apply to family).")
                   .arg(folded.size() + 1)
                   .arg(folded.size());
    }
    family_->setText(line);
    family_->setVisible(!line.isEmpty());
    update_apply();
}

void FindingsPage::update_apply() {
    const int row = selected();
    const FindingView* f = model_->at(row);
    const std::size_t n = f ? tree_->folded_under(row).size() : 0;
    const bool can = n > 0 && f->decision != Decision::Undecided;
    apply_->setEnabled(can);
    apply_button_->setVisible(n > 0);
    apply_button_->setEnabled(can);
    apply_button_->setText(n > 0 ? tr("Apply to family (%1)").arg(n) : tr("Apply to family"));
    if (n > 0 && !can) apply_button_->setToolTip(tr("Decide this lead first; then its decision can be applied to the family."));
    else apply_button_->setToolTip(apply_->toolTip());
}

void FindingsPage::fill_rate_tables(const FindingView& f) {
    pooled_->clear();
    set_headers(pooled_, {tr("Row"), tr("Positives / total"), tr("Value [95% CI]")},
                {QString(), kTipCounts, kTipRate});
    const GroupRow& p = f.pooled;
    pooled_->setRowCount(5 + int(f.more.size()));
    put(pooled_, 0, 0, f.focal + tr(" (focal)"));
    put(pooled_, 0, 1, count_text(p.pos_focal, p.n_focal), false, kTipCounts);
    put(pooled_, 0, 2, format_percent(p.rate_focal), false, kTipRate);
    put(pooled_, 1, 0, f.reference + tr(" (reference)"));
    put(pooled_, 1, 1, count_text(p.pos_reference, p.n_reference), false, kTipCounts);
    put(pooled_, 1, 2, format_percent(p.rate_reference), false, kTipRate);
    put(pooled_, 2, 0, tr("Pooled gap"));
    put(pooled_, 2, 2, format_points(f.crude), false, kTipRd);
    put(pooled_, 3, 0, tr("Selection-rate ratio"));
    put(pooled_, 3, 2, ratio_text(p.selection_ratio), false, kTipRatio);
    put(pooled_, 4, 0, tr("Adjusted gap (Mantel-Haenszel)"));
    put(pooled_, 4, 2, format_points(f.adjusted), false,
        tr("The gap after comparing like with like within strata: Mantel-Haenszel weighted difference in percentage points, Greenland-Robins 95% interval"));
    for (int i = 0; i < int(f.more.size()); ++i) {
        put(pooled_, 5 + i, 0, f.more[std::size_t(i)].name, false, f.more[std::size_t(i)].tip);
        put(pooled_, 5 + i, 2, f.more[std::size_t(i)].value, false, f.more[std::size_t(i)].tip);
    }
    pooled_->resizeColumnsToContents();
    fit_pooled();

    strata_->clear();
    set_headers(strata_,
                {tr("Stratum"), f.focal, tr("Rate [95% CI]"), f.reference, tr("Rate [95% CI]"),
                 tr("Difference, pp [95% CI]"), tr("Ratio"), tr("Note")},
                {tr("Level of %1").arg(f.strata_label()), kTipCounts, kTipRate, kTipCounts, kTipRate, kTipRd, kTipRatio,
                 tr("Why a stratum is left out of the adjusted figures")});
    strata_->setRowCount(int(f.rows.size()));
    for (int i = 0; i < int(f.rows.size()); ++i) {
        const GroupRow& r = f.rows[std::size_t(i)];
        const bool g = !r.informative;
        const QString why = g ? (r.reason.isEmpty() ? tr("left out: a group has no rows here") : r.reason) : QString();
        put(strata_, i, 0, r.level, g, why);
        put(strata_, i, 1, count_text(r.pos_focal, r.n_focal), g, kTipCounts);
        put(strata_, i, 2, format_percent(r.rate_focal), g, kTipRate);
        put(strata_, i, 3, count_text(r.pos_reference, r.n_reference), g, kTipCounts);
        put(strata_, i, 4, format_percent(r.rate_reference), g, kTipRate);
        put(strata_, i, 5, format_points(r.rd), g, kTipRd);
        put(strata_, i, 6, ratio_text(r.selection_ratio), g, kTipRatio);
        put(strata_, i, 7, why, g, why);
        strata_->item(i, 7)->setTextAlignment(Qt::AlignLeft | Qt::AlignVCenter);
    }
    strata_->resizeColumnsToContents();
}

void FindingsPage::fill_slope_tables(const FindingView& f) {
    pooled_->clear();
    set_headers(pooled_, {tr("Estimate"), tr("Value [95% CI]")}, {});
    pooled_->setRowCount(2 + int(f.more.size()));
    for (int i = 0; i < int(f.more.size()); ++i) {
        put(pooled_, 2 + i, 0, f.more[std::size_t(i)].name, false, f.more[std::size_t(i)].tip);
        put(pooled_, 2 + i, 1, f.more[std::size_t(i)].value, false, f.more[std::size_t(i)].tip);
    }
    put(pooled_, 0, 0, tr("Pooled slope"));
    put(pooled_, 0, 1, format_estimate(f.crude), false, tr("Slope of the line fitted to all points together"));
    put(pooled_, 1, 0, f.adjusted_name.isEmpty() ? tr("Within-stratum slope") : f.adjusted_name);
    put(pooled_, 1, 1, format_estimate(f.adjusted), false, tr("Common slope once each stratum has its own level"));
    pooled_->resizeColumnsToContents();
    strata_->clear();
    set_headers(strata_, {tr("Stratum"), tr("n"), tr("Slope [95% CI]"), tr("Intercept")},
                {QString(), tr("Observations in the stratum"), tr("Least-squares slope within the stratum"), QString()});
    strata_->setRowCount(int(f.slope_rows.size()));
    for (int i = 0; i < int(f.slope_rows.size()); ++i) {
        const SlopeRow& r = f.slope_rows[std::size_t(i)];
        put(strata_, i, 0, r.level);
        put(strata_, i, 1, QString::number(r.n, 'f', 0));
        put(strata_, i, 2, format_estimate(r.slope));
        put(strata_, i, 3, std::isfinite(r.intercept) ? QString::number(r.intercept, 'f', 3) : QStringLiteral("—"));
    }
    strata_->resizeColumnsToContents();
}

void FindingsPage::fill_mean_tables(const FindingView& f) {
    const QString tip_mean = tr("Mean of the group with its 95% t interval");
    const QString tip_gap = tr("Focal mean minus reference mean with its 95% Welch interval");
    auto mean_text = [](const Estimate& e, double sd) {
        QString s = format_estimate(e, 1);
        if (std::isfinite(sd)) s += tr("  sd %1").arg(sd, 0, 'f', 1);
        return s;
    };
    pooled_->clear();
    set_headers(pooled_, {tr("Row"), tr("n"), tr("Value [95% CI]")}, {QString(), tr("Observations (weighted)"), tip_mean});
    const GroupRow& p = f.pooled;
    pooled_->setRowCount(4 + int(f.more.size()));
    put(pooled_, 0, 0, f.focal + tr(" (focal)"));
    put(pooled_, 0, 1, QString::number(p.n_focal, 'f', 0));
    put(pooled_, 0, 2, mean_text(p.mean_focal, p.sd_focal), false, tip_mean);
    put(pooled_, 1, 0, f.reference + tr(" (reference)"));
    put(pooled_, 1, 1, QString::number(p.n_reference, 'f', 0));
    put(pooled_, 1, 2, mean_text(p.mean_reference, p.sd_reference), false, tip_mean);
    put(pooled_, 2, 0, tr("Pooled gap (Welch)"));
    put(pooled_, 2, 2, format_estimate(f.crude, 1), false, tip_gap);
    put(pooled_, 3, 0, tr("Within-strata gap (fixed effects, HC1)"));
    put(pooled_, 3, 2, format_estimate(f.adjusted, 1), false,
        tr("The gap after comparing like with like: the group coefficient of a regression on the group and one "
           "indicator per stratum, with a heteroskedasticity-robust (HC1) interval"));
    for (int i = 0; i < int(f.more.size()); ++i) {
        put(pooled_, 4 + i, 0, f.more[std::size_t(i)].name, false, f.more[std::size_t(i)].tip);
        put(pooled_, 4 + i, 2, f.more[std::size_t(i)].value, false, f.more[std::size_t(i)].tip);
    }
    pooled_->resizeColumnsToContents();
    fit_pooled();

    strata_->clear();
    set_headers(strata_,
                {tr("Stratum"), tr("n %1").arg(f.focal), tr("Mean %1 [95% CI]").arg(f.focal), tr("n %1").arg(f.reference),
                 tr("Mean %1 [95% CI]").arg(f.reference), tr("Difference [95% CI]"), tr("Share %1 / %2").arg(f.focal, f.reference),
                 tr("Note")},
                {tr("Level of %1").arg(f.strata_label()), QString(), tip_mean, QString(), tip_mean, tip_gap,
                 tr("The stratum's share of each group's observations"),
                 tr("Why a stratum is left out of the adjusted figures")});
    double nf = 0, nr = 0;
    for (const GroupRow& r : f.rows) nf += r.n_focal, nr += r.n_reference;
    strata_->setRowCount(int(f.rows.size()));
    for (int i = 0; i < int(f.rows.size()); ++i) {
        const GroupRow& r = f.rows[std::size_t(i)];
        const bool g = !r.informative;
        const QString why = g ? (r.reason.isEmpty() ? tr("left out: a group has no rows here") : tr("left out: %1").arg(r.reason)) : QString();
        put(strata_, i, 0, r.level, g, why);
        put(strata_, i, 1, QString::number(r.n_focal, 'f', 0), g);
        put(strata_, i, 2, format_estimate(r.mean_focal, 1), g, tip_mean);
        put(strata_, i, 3, QString::number(r.n_reference, 'f', 0), g);
        put(strata_, i, 4, format_estimate(r.mean_reference, 1), g, tip_mean);
        put(strata_, i, 5, format_estimate(r.rd, 1), g, tip_gap);
        put(strata_, i, 6, QStringLiteral("%1% / %2%").arg(nf > 0 ? 100 * r.n_focal / nf : 0, 0, 'f', 0)
                                .arg(nr > 0 ? 100 * r.n_reference / nr : 0, 0, 'f', 0), g);
        put(strata_, i, 7, why, g, why);
        strata_->item(i, 7)->setTextAlignment(Qt::AlignLeft | Qt::AlignVCenter);
    }
    strata_->resizeColumnsToContents();
}

void FindingsPage::draw_charts(const FindingView& f) {
    for (int i = 0; i < 3; ++i) charts_->setTabVisible(i, !f.slope);
    for (int i = 3; i < 5; ++i) charts_->setTabVisible(i, f.slope);
    charts_->setTabVisible(5, f.mean);
    if (f.slope) {
        charts::draw_scatter(scatter_, f);
        charts::draw_small_multiples(multiples_, f);
        scatter_->replot();
        multiples_->replot();
        if (charts_->currentIndex() < 3) charts_->setCurrentIndex(3);
    } else {
        // One readable row per stratum: many strata make the chart tall and the tab scrolls.
        forest_->setMinimumHeight(std::max(200, 80 + 16 * (int(f.rows.size()) + 3)));
        charts::draw_forest(forest_, f);
        charts::draw_mix(mix_, f);
        charts::draw_decomposition(decomp_, f);
        forest_->replot();
        mix_->replot();
        decomp_->replot();
        if (f.mean) {
            charts::draw_group_means(means_, f);
            means_->replot();
        }
        if (charts_->currentIndex() >= 3 && !(f.mean && charts_->currentIndex() == 5)) charts_->setCurrentIndex(0);
    }
}

void FindingsPage::fit_pooled() {
    // The first time a finding is shown, give the pooled table the width it needs and the
    // per-stratum table the rest; later the reviewer's own sizes (remembered) win.
    if (fitted_) return;
    int need = 2 * pooled_->frameWidth() + 4;
    for (int c = 0; c < pooled_->columnCount(); ++c) need += pooled_->columnWidth(c);
    const int total = tables_split_->width() > 100 ? tables_split_->width() : 900;
    if (need < total * 2 / 3) {
        tables_split_->setSizes({need, total - need});
        fitted_ = true;
    }
}

QCustomPlot* FindingsPage::current_chart() const {
    if (charts_->currentWidget() == forest_scroll_) return forest_;
    return qobject_cast<QCustomPlot*>(charts_->currentWidget());
}

void FindingsPage::copy_table() {
    QTableWidget* t = pooled_->hasFocus() ? pooled_ : strata_;
    QApplication::clipboard()->setText(model_to_tsv(t->model()));
}

void FindingsPage::set_export_context(const QString& stem, const QString& heading) {
    export_stem_ = stem;
    export_heading_ = heading;
}

void FindingsPage::save_chart() {
    QCustomPlot* plot = current_chart();
    const FindingView* f = model_->at(selected());
    if (!plot || !f) return;
    QSettings s;
    // Proposed: AUDIT-STRATA-CHART.png in the last folder; the chosen filter decides the suffix
    // when the typed name has none of the three.
    QString stem = (export_stem_.isEmpty() ? tr("chart") : export_stem_) + QLatin1Char('-') +
                   f->strata.join(QLatin1Char('-')) + QLatin1Char('-') + plot->objectName().remove(QStringLiteral("chart_"));
    stem.replace(QRegularExpression(QStringLiteral("[^\\w.-]+")), QStringLiteral("_"));
    const QStringList filters = {tr("PNG image (*.png)"), tr("SVG drawing (*.svg)"), tr("PDF document (*.pdf)")};
    QString filter = filters.first();
    QString path = QFileDialog::getSaveFileName(this, tr("Save chart"),
                                                QDir(s.value("charts/last_dir").toString()).filePath(stem + QStringLiteral(".png")),
                                                filters.join(QStringLiteral(";;")), &filter);
    if (path.isEmpty()) return;
    path = with_chart_suffix(path, filter);
    s.setValue("charts/last_dir", QFileInfo(path).absolutePath());
    const Status st = charts::save(plot, path, export_heading_);
    if (!st) QMessageBox::warning(this, tr("Save chart"), QString::fromStdString(st.error().to_string()));
}

QString with_chart_suffix(const QString& path, const QString& filter) {
    const QString ext = QFileInfo(path).suffix().toLower();
    if (ext == QLatin1String("png") || ext == QLatin1String("svg") || ext == QLatin1String("pdf")) return path;
    const QRegularExpressionMatch m = QRegularExpression(QStringLiteral("\\*\\.(\\w+)")).match(filter);
    return path + QLatin1Char('.') + (m.hasMatch() ? m.captured(1) : QStringLiteral("png"));
}

void FindingsPage::decide(Decision d) {
    const int r = selected();
    const FindingView* f = model_->at(r);
    if (!f) return;
    if (f->decision != d) {
        // The reviewer's own decision: it no longer comes from the family's lead.
        reviews_->push(new DecisionCommand(model_, {{r, f->decision, d, f->applied_from, QString()}},
                                           tr("mark %1 %2").arg(f->strata_label(), decision_title(d).toLower())));
    }
    if (auto* b = decision_->button(int(d))) b->setChecked(true);
}

int FindingsPage::apply_to_family() {
    const int lead = selected();
    const FindingView* f = model_->at(lead);
    if (!f || f->decision == Decision::Undecided) return 0;
    const std::vector<int> folded = tree_->folded_under(lead);
    if (folded.empty()) return 0;
    const QString label = f->strata_label();
    QStringList differing;
    for (int r : folded) {
        const FindingView* m = model_->at(r);
        if (m->decision != Decision::Undecided && m->decision != f->decision)
            differing << tr("%1: %2%3").arg(m->strata_label(), decision_title(m->decision),
                                            m->applied_from.isEmpty() ? QString() : tr(" (applied from the lead earlier)"));
    }
    OverwriteChoice choice = OverwriteChoice::Overwrite;
    if (!differing.isEmpty()) {
        choice = overwrite_prompt_ ? overwrite_prompt_(label, decision_title(f->decision), differing) : [&] {
            QMessageBox box(QMessageBox::Question, tr("Apply to the family"),
                            tr("%n finding(s) in the family of %1 already have another decision.", nullptr,
                               int(differing.size())).arg(label),
                            QMessageBox::NoButton, this);
            QStringList shown = differing.mid(0, 12);
            if (differing.size() > shown.size()) shown << tr("… and %1 more").arg(differing.size() - shown.size());
            box.setInformativeText(tr("Replace their decisions with the lead's (%1), or apply it only to the findings "
                                      "not decided yet?\n\n%2").arg(decision_title(f->decision), shown.join(QLatin1Char('\n'))));
            QPushButton* all = box.addButton(tr("Replace them"), QMessageBox::AcceptRole);
            QPushButton* keep = box.addButton(tr("Keep their decisions"), QMessageBox::ActionRole);
            box.addButton(QMessageBox::Cancel);
            box.setDefaultButton(keep);
            box.exec();
            return box.clickedButton() == all ? OverwriteChoice::Overwrite
                   : box.clickedButton() == keep ? OverwriteChoice::KeepTheirs
                                                 : OverwriteChoice::Cancel;
        }();
    }
    if (choice == OverwriteChoice::Cancel) return -1;
    std::vector<DecisionCommand::Change> changes;
    for (int r : folded) {
        const FindingView* m = model_->at(r);
        // The same decision already made on its own stays the finding's own.
        if (m->decision == f->decision) continue;
        if (m->decision != Decision::Undecided && choice == OverwriteChoice::KeepTheirs) continue;
        changes.push_back({r, m->decision, f->decision, m->applied_from, label});
    }
    if (changes.empty()) return 0;
    const int n = int(changes.size());
    reviews_->push(new DecisionCommand(model_, std::move(changes),
                                       tr("apply %1 to the family of %2").arg(decision_title(f->decision).toLower(), label)));
    return n;
}

QMenu* FindingsPage::context_menu_for(int row) {
    auto* menu = new QMenu(this);
    const FindingView* f = model_->at(row);
    if (!f) return menu;
    for (Decision d : {Decision::Upheld, Decision::SetAside, Decision::FollowUp, Decision::Undecided}) {
        QAction* a = menu->addAction(d == Decision::Undecided ? tr("Undecided") : decision_title(d));
        a->setCheckable(true);
        a->setChecked(f->decision == d);
        connect(a, &QAction::triggered, this, [this, row, d] {
            if (select(row)) decide(d);
        });
    }
    menu->addSeparator();
    menu->addAction(apply_);
    const QPersistentModelIndex at = filter_->mapFromSource(tree_->index_of(row, 0));
    if (!tree_->folded_under(row).empty() && at.isValid()) {
        const bool open = list_->isExpanded(at);
        connect(menu->addAction(open ? tr("Fold the family\t-") : tr("Unfold the family\t+")), &QAction::triggered, this,
                [this, at, open] { open ? list_->collapse(at) : list_->expand(at); });
    }
    const int lead = tree_->lead_row(row);
    if (lead != row && lead >= 0)
        connect(menu->addAction(tr("Go to the lead, %1").arg(model_->at(lead)->strata_label())), &QAction::triggered, this,
                [this, lead] { select(lead); });
    return menu;
}

}  // namespace foldline::ui
