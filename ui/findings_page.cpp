#include "ui/findings_page.h"

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
#include <QMessageBox>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QScrollArea>
#include <QSettings>
#include <QSplitter>
#include <QTabWidget>
#include <QTableView>
#include <QTableWidget>
#include <QToolButton>
#include <QVBoxLayout>
#include <qcustomplot.h>

#include "ui/caution_band.h"
#include "ui/charts.h"
#include "ui/findings_model.h"
#include "ui/mean_charts.h"
#include "ui/mean_view.h"
#include "ui/palette.h"
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

const QString kTipRate = QObject::tr("Share of the group with the positive outcome, with its 95% Wilson score interval");
const QString kTipRd = QObject::tr("Risk difference in percentage points: focal rate minus reference rate, with its 95% Newcombe interval");
const QString kTipRatio = QObject::tr("Selection-rate ratio: focal rate divided by reference rate; below 0.8 is the common four-fifths flag");
const QString kTipCounts = QObject::tr("Positives out of the group's total");

}  // namespace

FindingsPage::FindingsPage(FindingsModel* model, QWidget* parent)
    : QWidget(parent), model_(model), filter_(new FindingsFilter(this)) {
    filter_->setSourceModel(model_);

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

    list_ = new QTableView;
    list_->setObjectName(QStringLiteral("findings_list"));
    // Arrows move inside the list; Tab leaves it for the decision buttons and the note.
    list_->setTabKeyNavigation(false);
    list_->setModel(filter_);
    list_->setSortingEnabled(true);
    list_->sortByColumn(FindingsModel::Class, Qt::AscendingOrder);
    list_->setSelectionBehavior(QAbstractItemView::SelectRows);
    list_->setSelectionMode(QAbstractItemView::SingleSelection);
    list_->verticalHeader()->hide();
    // Every column fits its contents and the strata take what is left, so class, strata, gaps,
    // q-value and decision are all in view without scrolling sideways.
    list_->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
    list_->horizontalHeader()->setSectionResizeMode(FindingsModel::Strata, QHeaderView::Stretch);
    list_->horizontalHeader()->setStretchLastSection(false);
    list_->setTextElideMode(Qt::ElideRight);  // a pair keeps its first column readable
    list_->setTextElideMode(Qt::ElideMiddle);
    list_->setAlternatingRowColors(true);
    list_->setWordWrap(false);
    connect(model_, &QAbstractItemModel::rowsInserted, this, &FindingsPage::update_chips);
    connect(model_, &QAbstractItemModel::modelReset, this, &FindingsPage::update_chips);
    update_chips();
    connect(list_->selectionModel(), &QItemSelectionModel::currentRowChanged, this,
            [this](const QModelIndex& cur) { show_finding(cur.isValid() ? filter_->mapToSource(cur).row() : -1); });

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
    pl->addWidget(new QLabel(tr("<b>Pooled and adjusted</b> (rates pooled over all strata, gaps adjusted within them, tests)")));
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

    connect(model_, &QAbstractItemModel::modelReset, this, [this] { show_finding(-1); });
}

int FindingsPage::selected() const {
    const QModelIndex cur = list_->selectionModel()->currentIndex();
    return cur.isValid() ? filter_->mapToSource(cur).row() : -1;
}

bool FindingsPage::select(int row) {
    const QModelIndex p = filter_->mapFromSource(model_->index(row, 0));
    if (!p.isValid()) return false;
    list_->selectionModel()->setCurrentIndex(p, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
    list_->scrollTo(p);
    return true;
}

int FindingsPage::select_top() {
    if (filter_->rowCount() == 0) return -1;
    const QModelIndex p = filter_->index(0, 0);
    list_->selectionModel()->setCurrentIndex(p, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
    return filter_->mapToSource(p).row();
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
    detail_->setVisible(f != nullptr);
    empty_->setVisible(f == nullptr);
    if (!f) {
        emit finding_selected(-1);
        return;
    }
    showing_ = true;
    heading_->setText(QStringLiteral("<span style='font-size:large'><b>%1 %2</b> — stratified by <b>%3</b></span>")
                          .arg(class_glyph(f->cls), class_title(f->cls), f->strata_label().toHtmlEscaped()));
    QString detail = class_meaning(f->cls);
    if (std::isfinite(f->q_value)) detail += tr("  q-value %1").arg(f->q_value, 0, 'g', 3);
    if (std::isfinite(f->stability)) detail += tr("; kept its class in %1% of resamples").arg(100 * f->stability, 0, 'f', 0);
    meaning_->setText(detail);
    if (auto* b = decision_->button(int(f->decision))) b->setChecked(true);
    else {
        decision_->setExclusive(false);
        for (auto* b2 : decision_->buttons()) b2->setChecked(false);
        decision_->setExclusive(true);
    }
    note_->setPlainText(f->note);
    pay_caution_->setVisible(f->mean);
    if (f->slope) fill_slope_tables(*f);
    else if (f->mean) fill_mean_tables(*f);
    else fill_rate_tables(*f);
    draw_charts(*f);
    showing_ = false;
    emit finding_selected(row);
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
    if (r < 0) return;
    model_->set_decision(r, d, note_->toPlainText());
    if (auto* b = decision_->button(int(d))) b->setChecked(true);
}

}  // namespace foldline::ui
