#include "ui/question_page.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QRegularExpressionValidator>
#include <QListWidget>
#include <QPushButton>
#include <QRadioButton>
#include <QSpinBox>
#include <QUndoCommand>
#include <QUndoStack>
#include <QVBoxLayout>

#include "core/table/combined_column.h"
#include "ui/palette.h"

namespace foldline::ui {

namespace {
/// Level with the most rows (weighted); empty for a non-categorical column.
QString most_frequent_level(const Table& t, const Column& c) {
    if (!c.is_categorical() || c.levels.empty()) return {};
    std::vector<double> n(c.levels.size() + 1, 0.0);
    for (std::size_t i = 0; i < t.rows; ++i) n[c.code(i)] += t.weight(i);
    n.back() = -1;
    return QString::fromStdString(c.levels[std::size_t(std::max_element(n.begin(), n.end()) - n.begin())]);
}
bool looks_positive(const QString& s) {
    static const QStringList yes = {"1", "yes", "y", "true", "approved", "positive", "hired", "admitted"};
    return yes.contains(s.toLower());
}
}  // namespace

/// One change of the combined groups: the columns combined and the two groups chosen, before and
/// after. The change is already applied when the command is pushed.
class CombineCommand : public QUndoCommand {
public:
    struct State {
        QStringList order;
        QString focal, reference;
    };
    CombineCommand(QuestionPage* page, State before, State after)
        : page_(page), before_(std::move(before)), after_(std::move(after)) {
        setText(after_.order.size() > before_.order.size() ? QObject::tr("combine the groups with another column")
                                                           : QObject::tr("change the combined groups"));
    }
    void undo() override { page_->apply_combination(before_.order, before_.focal, before_.reference); }
    void redo() override {
        if (first_) {
            first_ = false;
            return;
        }
        page_->apply_combination(after_.order, after_.focal, after_.reference);
    }

private:
    QuestionPage* page_;
    State before_, after_;
    bool first_ = true;
};

QuestionPage::QuestionPage(QWidget* parent) : QWidget(parent) {
    outcome_ = new QComboBox;
    outcome_->setObjectName(QStringLiteral("outcome"));
    outcome_->setToolTip(tr("The yes/no result whose rate is compared between the groups"));
    positive_ = new QComboBox;
    positive_->setObjectName(QStringLiteral("positive"));
    positive_->setToolTip(tr("Which value of the outcome counts as the event (e.g. approved)"));
    exposure_ = new QComboBox;
    exposure_->setObjectName(QStringLiteral("exposure"));
    exposure_->setToolTip(tr("The column whose groups are compared"));
    focal_ = new QComboBox;
    focal_->setObjectName(QStringLiteral("focal"));
    focal_->setToolTip(tr("The group under review; differences are focal minus reference"));
    reference_ = new QComboBox;
    reference_->setObjectName(QStringLiteral("reference"));
    reference_->setToolTip(tr("The group the focal group is compared with (by default the largest)"));
    combine_ = new QListWidget;
    combine_->setObjectName(QStringLiteral("combine_groups"));
    combine_->setToolTip(tr("Tick one or more columns to form the groups from the groups column and these together: "
                            "each combination that occurs is a group (sex with ethnicity gives female+a, male+b, …), "
                            "and the focal and reference groups name combinations. The combined columns never "
                            "stratify; the diagram shows the groups as one node."));
    combine_->setMaximumHeight(combine_->fontMetrics().height() * 6);
    undo_ = new QUndoStack(this);

    rates_ = new QRadioButton(tr("Rates: a yes/no outcome between two groups"));
    rates_->setObjectName(QStringLiteral("kind_rates"));
    rates_->setChecked(true);
    slopes_ = new QRadioButton(tr("Trend: a numeric outcome against a numeric exposure"));
    slopes_->setObjectName(QStringLiteral("kind_slopes"));
    slopes_->setToolTip(tr("Is the slope of the outcome on the exposure different within strata than pooled?"));
    connect(slopes_, &QRadioButton::toggled, this, [this](bool on) { set_kind(on); });
    auto* who = new QGroupBox(tr("What is compared"));
    auto* f = who_form_ = new QFormLayout(who);
    f->addRow(rates_);
    f->addRow(slopes_);
    f->addRow(tr("Outcome"), outcome_);
    f->addRow(tr("Counts as positive"), positive_);
    f->addRow(tr("Groups column"), exposure_);
    f->addRow(tr("Combined with"), combine_);
    f->addRow(tr("Focal group"), focal_);
    f->addRow(tr("Reference group"), reference_);
    rows_ = new QLineEdit;
    rows_->setObjectName(QStringLiteral("rows_filter"));
    rows_->setClearButtonEnabled(true);
    rows_->setPlaceholderText(tr("every row (e.g. year >= 2024 and region in ('north', 'east'))"));
    rows_->setToolTip(tr("Only the rows this filter keeps are scanned. Comparisons =, <>, <, <=, >, >= with "
                         "'text in single quotes' or numbers; in ('a', 'b'); is missing; not, and, or, "
                         "parentheses; \"column names\" in double quotes when they hold spaces. A missing "
                         "cell makes a comparison unknown, so the row is left out unless you ask for it with "
                         "is missing."));
    f->addRow(tr("&Rows to include"), rows_);

    pairs_ = new QCheckBox(tr("Also stratify by every pair of candidates"));
    pairs_->setChecked(true);
    pairs_->setToolTip(tr("Joint strata of two columns can reveal reversals neither shows alone"));
    bins_ = new QSpinBox;
    bins_->setRange(0, project::limits::kMaxBins);
    bins_->setSpecialValueText(tr("off"));
    bins_->setValue(4);
    bins_->setToolTip(tr("Numeric candidates are cut into this many quantile bins"));
    alpha_ = new QDoubleSpinBox;
    alpha_->setDecimals(3);
    alpha_->setRange(0.001, project::limits::kMaxAlpha);
    alpha_->setSingleStep(0.01);
    alpha_->setValue(0.05);
    alpha_->setToolTip(tr("False discovery rate controlled across everything scanned (Benjamini-Hochberg)"));
    bootstrap_ = new QSpinBox;
    bootstrap_->setRange(0, 10000);
    bootstrap_->setSingleStep(100);
    bootstrap_->setValue(200);
    bootstrap_->setObjectName(QStringLiteral("bootstrap"));
    bootstrap_->setToolTip(tr("Resamples used to measure how often a flagged finding keeps its class (0 = skip)"));
    max_levels_ = new QSpinBox;
    max_levels_->setRange(int(project::limits::kMinMaxLevels), int(project::limits::kMaxMaxLevels));
    max_levels_->setValue(50);
    max_levels_->setToolTip(tr("A column with more distinct values than this is left out (numbers are cut into bins instead)"));
    seed_ = new QLineEdit(QStringLiteral("1"));
    seed_->setObjectName(QStringLiteral("seed"));
    seed_->setValidator(new QRegularExpressionValidator(QRegularExpression(QStringLiteral("[0-9]{1,20}")), seed_));
    seed_->setToolTip(tr("Seed of the resampling, so a scan can be repeated exactly (a whole number up to 18446744073709551615)"));
    find_groups_ = new QCheckBox(tr("Also look for hidden groups in the trend (a hint, not a finding)"));
    find_groups_->setObjectName(QStringLiteral("find_groups"));
    find_groups_->setVisible(false);  // rates first: set_kind shows it for trends
    find_groups_->setToolTip(tr("Fits mixtures of the two columns and says when the points fall into overlapping groups whose trends run against the pooled one"));
    auto* how = new QGroupBox(tr("How to scan"));
    auto* h = new QFormLayout(how);
    h->addRow(pairs_);
    h->addRow(tr("Bins for numeric columns"), bins_);
    h->addRow(tr("Most levels of a column"), max_levels_);
    h->addRow(tr("False discovery rate (alpha)"), alpha_);
    h->addRow(tr("Bootstrap resamples"), bootstrap_);
    h->addRow(tr("Seed"), seed_);
    h->addRow(find_groups_);

    candidates_ = new QListWidget;
    candidates_->setObjectName(QStringLiteral("candidates"));
    candidates_->setToolTip(tr("Columns that may explain the gap; those left out say why"));
    auto* all = new QPushButton(tr("All"));
    auto* none = new QPushButton(tr("None"));
    connect(all, &QPushButton::clicked, this, [this] {
        for (int i = 0; i < candidates_->count(); ++i)
            if (candidates_->item(i)->flags() & Qt::ItemIsEnabled) candidates_->item(i)->setCheckState(Qt::Checked);
    });
    connect(none, &QPushButton::clicked, this, [this] {
        for (int i = 0; i < candidates_->count(); ++i) candidates_->item(i)->setCheckState(Qt::Unchecked);
    });
    auto* cand = new QGroupBox(tr("Candidate stratifiers"));
    auto* cl = new QVBoxLayout(cand);
    cl->addWidget(candidates_, 1);
    auto* cb = new QHBoxLayout;
    cb->addWidget(all);
    cb->addWidget(none);
    cb->addStretch();
    cl->addLayout(cb);

    problems_ = new QLabel;
    problems_->setObjectName(QStringLiteral("question_problems"));
    problems_->setWordWrap(true);
    scan_ = new QPushButton(tr("Scan  (F5)"));
    scan_->setObjectName(QStringLiteral("start_scan"));
    scan_->setDefault(true);
    connect(scan_, &QPushButton::clicked, this, [this] {
        if (problems().isEmpty()) emit scan_requested(spec());
    });

    auto* left = new QVBoxLayout;
    left->addWidget(who);
    left->addWidget(how);
    left->addStretch();
    auto* cols = new QHBoxLayout;
    cols->addLayout(left, 1);
    cols->addWidget(cand, 1);
    auto* lay = new QVBoxLayout(this);
    lay->addLayout(cols, 1);
    auto* bottom = new QHBoxLayout;
    bottom->addWidget(problems_, 1);
    bottom->addWidget(scan_, 0, Qt::AlignBottom);
    lay->addLayout(bottom);

    connect(outcome_, &QComboBox::currentTextChanged, this, [this](const QString& c) {
        if (filling_) return;
        fill_levels(positive_, c);
        for (int i = 0; i < positive_->count(); ++i)
            if (looks_positive(positive_->itemText(i))) positive_->setCurrentIndex(i);
        const QStringList before = combine_order_;
        refill_combine();  // the outcome is never part of the groups
        if (before != combine_order_) fill_groups();
        refresh_candidates();
        validate();
    });
    connect(exposure_, &QComboBox::currentTextChanged, this, [this](const QString& c) {
        if (filling_) return;
        combine_order_.removeAll(c);
        refill_combine();
        fill_groups();
        refresh_candidates();
        validate();
    });
    connect(combine_, &QListWidget::itemChanged, this, [this](QListWidgetItem* item) {
        if (filling_) return;
        const QString name = item->data(Qt::UserRole).toString();
        QStringList order = combine_order_;
        order.removeAll(name);
        if (item->checkState() == Qt::Checked) order << name;  // joins the name last
        combine_with(order);
    });
    for (QComboBox* b : {positive_, focal_, reference_})
        connect(b, &QComboBox::currentTextChanged, this, [this] { if (!filling_) validate(); });
    connect(candidates_, &QListWidget::itemChanged, this, [this] {
        if (filling_) return;
        all_candidates_ = false;  // the reviewer chose: the list is theirs now
        validate();
    });
    connect(seed_, &QLineEdit::textChanged, this, [this] { validate(); });
    connect(rows_, &QLineEdit::textChanged, this, [this] { if (!filling_) validate(); });
    connect(alpha_, &QDoubleSpinBox::valueChanged, this, [this] { validate(); });
    // The level limit and the bins decide which columns qualify: offer the list again.
    for (QSpinBox* b : {bins_, max_levels_})
        connect(b, &QSpinBox::valueChanged, this, [this] {
            if (filling_) return;
            refresh_candidates();
            validate();
        });
    set_table(nullptr);
}

QString QuestionPage::groups_name() const {
    QString name = exposure_->currentText();
    if (name.isEmpty() || slopes_->isChecked()) return name;
    for (const QString& c : combine_order_) name += QLatin1Char(kCombineSeparator) + c;
    return name;
}

void QuestionPage::refill_combine() {
    const bool was = filling_;
    filling_ = true;
    combine_->clear();
    combined_.reset();
    const QString main = exposure_->currentText();
    const QString outcome = outcome_->currentText();
    // A column whose name holds the separator cannot be told apart in a combined name.
    auto combinable = [&](const Column& c) {
        const QString n = QString::fromStdString(c.name);
        return c.is_categorical() && c.levels.size() >= 2 && n != main && n != outcome &&
               !n.contains(QLatin1Char(kCombineSeparator));
    };
    QStringList kept;
    if (table_ && !main.contains(QLatin1Char(kCombineSeparator)))
        for (const QString& c : combine_order_)
            if (const Column* col = table_->column(c.toStdString()); col && combinable(*col)) kept << c;
    combine_order_ = kept;
    if (table_ && !main.isEmpty() && !main.contains(QLatin1Char(kCombineSeparator)))
        for (const Column& c : table_->columns) {
            if (!combinable(c)) continue;
            const QString n = QString::fromStdString(c.name);
            auto* item = new QListWidgetItem(n);
            item->setData(Qt::UserRole, n);
            item->setFlags(Qt::ItemIsEnabled | Qt::ItemIsUserCheckable | Qt::ItemIsSelectable);
            item->setCheckState(combine_order_.contains(n) ? Qt::Checked : Qt::Unchecked);
            combine_->addItem(item);
        }
    if (table_ && !combine_order_.isEmpty()) {
        QuestionSpec q;
        q.exposure = groups_name();
        if (auto col = combined_groups_column(*table_, q)) combined_ = std::move(*col);
    }
    filling_ = was;
}

void QuestionPage::fill_groups() {
    const QString name = groups_name();
    fill_levels(focal_, name);
    fill_levels(reference_, name);
    const Column* col = combined_ ? &*combined_ : table_ ? table_->column(name.toStdString()) : nullptr;
    if (!table_ || !col) return;
    const QString ref = most_frequent_level(*table_, *col);
    reference_->setCurrentText(ref);
    for (int i = 0; i < focal_->count(); ++i)
        if (focal_->itemText(i) != ref) {
            focal_->setCurrentIndex(i);
            break;
        }
}

void QuestionPage::apply_combination(const QStringList& order, const QString& focal, const QString& reference) {
    combine_order_ = order;
    refill_combine();
    fill_groups();
    if (!focal.isEmpty() && focal_->findText(focal) >= 0) focal_->setCurrentText(focal);
    if (!reference.isEmpty() && reference_->findText(reference) >= 0) reference_->setCurrentText(reference);
    refresh_candidates();
    validate();
}

void QuestionPage::combine_with(const QStringList& columns, const QString& focal, const QString& reference) {
    CombineCommand::State before{combine_order_, focal_->currentText(), reference_->currentText()};
    apply_combination(columns, focal, reference);
    CombineCommand::State after{combine_order_, focal_->currentText(), reference_->currentText()};
    if (before.order != after.order || before.focal != after.focal || before.reference != after.reference)
        undo_->push(new CombineCommand(this, std::move(before), std::move(after)));
}

void QuestionPage::fill_levels(QComboBox* box, const QString& column) {
    const bool was = filling_;
    filling_ = true;
    box->clear();
    if (table_)
        if (const Column* c = combined_ && column == groups_name() ? &*combined_ : table_->column(column.toStdString())) {
            if (c->is_categorical()) {
                for (const auto& l : c->levels) box->addItem(QString::fromStdString(l));
            } else if (c->is_binary()) {
                std::vector<double> seen;
                for (double v : c->values)
                    if (!std::isnan(v) && std::find(seen.begin(), seen.end(), v) == seen.end()) seen.push_back(v);
                std::sort(seen.begin(), seen.end());
                for (double v : seen) box->addItem(QString::number(v, 'g', 12));
            }
        }
    filling_ = was;
}

void QuestionPage::reset_settings() {
    const bool was = filling_;
    filling_ = true;
    pairs_->setChecked(true);
    bins_->setValue(4);
    max_levels_->setValue(50);
    alpha_->setValue(0.05);
    bootstrap_->setValue(200);
    seed_->setText(QStringLiteral("1"));
    find_groups_->setChecked(false);
    all_candidates_ = false;
    filling_ = was;
}

void QuestionPage::propose_groups(const QString& outcome, const QString& positive, const QString& exposure,
                                  const QString& focal, const QString& reference) {
    if (!table_ || slopes_->isChecked()) return;
    if (outcome_->findText(outcome) >= 0) outcome_->setCurrentText(outcome);
    if (positive_->findText(positive) >= 0) positive_->setCurrentText(positive);
    if (exposure_->findText(exposure) >= 0) exposure_->setCurrentText(exposure);
    if (focal_->findText(focal) >= 0) focal_->setCurrentText(focal);
    if (reference_->findText(reference) >= 0) reference_->setCurrentText(reference);
    validate();
}

void QuestionPage::set_table(std::shared_ptr<const Table> table, bool new_data) {
    table_ = std::move(table);
    covariates_.clear();  // they name columns of the previous data
    if (new_data) {
        reset_settings();
        // A new data set starts from the rates question; the kind follows its columns below.
        if (slopes_->isChecked()) rates_->setChecked(true);  // set_kind refills from the new table
    }
    filling_ = true;
    rows_->clear();       // a filter of the previous data set does not carry over
    combine_order_.clear();  // nor do combined groups, nor their history
    combined_.reset();
    combine_->clear();
    undo_->clear();
    outcome_->clear();
    exposure_->clear();
    positive_->clear();
    focal_->clear();
    reference_->clear();
    if (table_) {
        bool has_binary = false;
        for (const Column& c : table_->columns) has_binary = has_binary || c.is_binary();
        filling_ = false;
        if (!has_binary && !slopes_->isChecked()) slopes_->setChecked(true);  // calls fill_columns
        else fill_columns();
    }
    filling_ = false;
    refresh_candidates();
    validate();
}

void QuestionPage::set_kind(bool slope) {
    who_form_->setRowVisible(positive_, !slope);
    who_form_->setRowVisible(focal_, !slope);
    who_form_->setRowVisible(reference_, !slope);
    who_form_->setRowVisible(combine_, !slope);
    if (find_groups_) find_groups_->setVisible(slope);
    who_form_->labelForField(outcome_)->setProperty("text", slope ? tr("Outcome (y)") : tr("Outcome"));
    who_form_->labelForField(exposure_)->setProperty("text", slope ? tr("Exposure (x)") : tr("Groups column"));
    fill_columns();
}

void QuestionPage::fill_columns() {
    filling_ = true;
    outcome_->clear();
    exposure_->clear();
    positive_->clear();
    focal_->clear();
    reference_->clear();
    if (!table_) {
        filling_ = false;
        return;
    }
    const bool slope = slopes_->isChecked();
    QString outcome_guess, group_guess;
    for (const Column& c : table_->columns) {
        const QString name = QString::fromStdString(c.name);
        if (slope) {
            if (c.is_numeric()) outcome_->addItem(name), exposure_->addItem(name);
            continue;
        }
        if (c.is_binary()) outcome_->addItem(name);
        if (c.is_categorical() && c.levels.size() >= 2) exposure_->addItem(name);
    }
    if (slope) {
        // Default: the last numeric column as y, the first other one as x.
        if (outcome_->count()) outcome_guess = outcome_->itemText(outcome_->count() - 1);
        for (int i = 0; i < exposure_->count() && group_guess.isEmpty(); ++i)
            if (exposure_->itemText(i) != outcome_guess) group_guess = exposure_->itemText(i);
    } else {
        // Default outcome: a binary column with a positive-looking level, else the last one.
        for (int i = 0; i < outcome_->count(); ++i) {
            const Column* c = table_->column(outcome_->itemText(i).toStdString());
            bool pos = c->is_numeric();
            for (const auto& l : c->levels) pos = pos || looks_positive(QString::fromStdString(l));
            if (pos) outcome_guess = outcome_->itemText(i);
        }
        if (outcome_guess.isEmpty() && outcome_->count()) outcome_guess = outcome_->itemText(outcome_->count() - 1);
        for (int i = 0; i < exposure_->count() && group_guess.isEmpty(); ++i) {
            const QString n = exposure_->itemText(i).toLower();
            if (n != outcome_guess.toLower() && (n.contains("group") || n.contains("sex") || n.contains("gender") ||
                                                  n.contains("arm") || n.contains("cohort") || n.contains("treatment")))
                group_guess = exposure_->itemText(i);
        }
        for (int i = 0; i < exposure_->count() && group_guess.isEmpty(); ++i)
            if (exposure_->itemText(i) != outcome_guess) group_guess = exposure_->itemText(i);
    }
    outcome_->setCurrentIndex(-1);
    exposure_->setCurrentIndex(-1);
    filling_ = false;
    outcome_->setCurrentText(outcome_guess);
    exposure_->setCurrentText(group_guess);
    refresh_candidates();
    validate();
}

void QuestionPage::refresh_candidates() {
    const bool was = filling_;
    filling_ = true;
    QStringList previously_off;
    // Only columns the user could untick count as switched off: one shown as the outcome or the
    // groups a moment ago (while a question is being set) is ticked again once it qualifies.
    for (int i = 0; i < candidates_->count(); ++i)
        if ((candidates_->item(i)->flags() & Qt::ItemIsUserCheckable) && candidates_->item(i)->checkState() == Qt::Unchecked)
            previously_off << candidates_->item(i)->data(Qt::UserRole).toString();
    candidates_->clear();
    if (table_) {
        QuestionSpec q;
        q.slope = slopes_->isChecked();
        q.outcome = outcome_->currentText();
        q.exposure = groups_name();
        q.bins = bins_->value();
        q.max_levels = std::uint64_t(max_levels_->value());
        q.covariates = covariates_;
        std::vector<CandidateView> all = propose_candidates(*table_, q, combined_ ? &*combined_ : nullptr);
        std::stable_partition(all.begin(), all.end(), [](const CandidateView& c) { return c.usable; });
        for (const CandidateView& c : all) {
            const QString shown = c.origin.isEmpty() || c.origin == QLatin1String("categorical")
                                      ? c.column : tr("%1  (%2)").arg(c.column, c.origin);
            auto* item = new QListWidgetItem(c.usable ? shown : tr("%1 — left out: %2").arg(c.column, c.reason));
            item->setData(Qt::UserRole, c.column);
            if (c.usable) {
                item->setFlags(Qt::ItemIsEnabled | Qt::ItemIsUserCheckable | Qt::ItemIsSelectable);
                item->setCheckState(previously_off.contains(c.column) ? Qt::Unchecked : Qt::Checked);
            } else {
                item->setFlags(Qt::NoItemFlags);
                item->setToolTip(c.reason);
            }
            candidates_->addItem(item);
        }
    }
    filling_ = was;
}

QuestionSpec QuestionPage::spec() const {
    QuestionSpec q;
    q.slope = slopes_->isChecked();
    q.outcome = outcome_->currentText();
    q.positive = q.slope ? QString() : positive_->currentText();
    q.exposure = groups_name();
    q.focal = q.slope ? QString() : focal_->currentText();
    q.reference = q.slope ? QString() : reference_->currentText();
    for (int i = 0; i < candidates_->count(); ++i)
        if (candidates_->item(i)->checkState() == Qt::Checked) q.candidates << candidates_->item(i)->data(Qt::UserRole).toString();
    q.pairs = pairs_->isChecked();
    q.bins = bins_->value();
    q.max_levels = std::uint64_t(max_levels_->value());
    q.alpha = alpha_->value();
    q.bootstrap = bootstrap_->value();
    bool ok = false;
    q.seed = seed_->text().toULongLong(&ok);
    if (!ok) q.seed = 0;
    q.find_groups = q.slope && find_groups_->isChecked();
    q.rows = rows_->text().trimmed();
    bool every = true;
    for (int i = 0; i < candidates_->count(); ++i)
        if ((candidates_->item(i)->flags() & Qt::ItemIsEnabled) && candidates_->item(i)->checkState() != Qt::Checked)
            every = false;
    q.all_candidates = all_candidates_ && every;
    if (q.slope)
        for (const QString& c : covariates_)
            if (c != q.outcome && c != q.exposure) q.covariates << c;
    return q;
}

void QuestionPage::set_spec(const QuestionSpec& q) {
    if (q.slope != slopes_->isChecked()) (q.slope ? slopes_ : rates_)->setChecked(true);
    covariates_ = q.covariates;
    refresh_candidates();  // covariates are not offered as strata
    outcome_->setCurrentText(q.outcome);
    positive_->setCurrentText(q.positive);
    // Groups formed by several columns (`sex+ethnicity`): the first is the groups column, the
    // others are ticked under "Combined with" in the order of the name.
    QStringList parts;
    if (table_ && !q.slope)
        for (const auto& p : combined_parts(*table_, q.exposure.toStdString())) parts << QString::fromStdString(p);
    if (parts.size() >= 2) {
        exposure_->setCurrentText(parts.front());
        apply_combination(parts.mid(1), q.focal, q.reference);
    } else {
        if (!combine_order_.isEmpty()) {
            combine_order_.clear();
            refill_combine();
            fill_groups();
        }
        exposure_->setCurrentText(q.exposure);
        focal_->setCurrentText(q.focal);
        reference_->setCurrentText(q.reference);
    }
    // No list = every usable column (a saved audit's "auto"), as `foldline run` reads it.
    for (int i = 0; i < candidates_->count(); ++i)
        if (candidates_->item(i)->flags() & Qt::ItemIsEnabled)
            candidates_->item(i)->setCheckState(q.candidates.isEmpty() ||
                                                        q.candidates.contains(candidates_->item(i)->data(Qt::UserRole).toString())
                                                    ? Qt::Checked : Qt::Unchecked);
    pairs_->setChecked(q.pairs);
    bins_->setValue(q.bins);
    max_levels_->setValue(int(std::min<std::uint64_t>(q.max_levels, std::uint64_t(project::limits::kMaxMaxLevels))));
    alpha_->setValue(q.alpha);
    bootstrap_->setValue(q.bootstrap);
    seed_->setText(QString::number(qulonglong(q.seed)));
    find_groups_->setChecked(q.find_groups);
    rows_->setText(q.rows);
    all_candidates_ = q.all_candidates || q.candidates.isEmpty();
    validate();
}

QStringList QuestionPage::problems() const {
    if (!table_) return {tr("Open data first (step 1).")};
    QStringList p = check_question(*table_, spec(), combined_ ? &*combined_ : nullptr);
    if (!scan_available()) p << tr("This build has no scan engine.");
    return p;
}

void QuestionPage::validate() {
    const QStringList p = problems();
    scan_->setEnabled(p.isEmpty());
    if (p.isEmpty()) {
        const QuestionSpec q = spec();
        problems_->setText(tr("Ready: %1 candidate(s)%2%3.")
                               .arg(q.candidates.size())
                               .arg(pairs_->isChecked() ? tr(" and their pairs") : QString())
                               .arg(q.covariates.isEmpty() ? QString()
                                                           : tr("; slopes adjusted for %1").arg(q.covariates.join(QStringLiteral(", ")))));
        problems_->setPalette(palette());
    } else {
        QStringList items;
        for (const QString& s : p) items << QStringLiteral("• ") + s.toHtmlEscaped();
        problems_->setText(items.join(QStringLiteral("<br>")));
        QPalette pal = problems_->palette();
        pal.setColor(QPalette::WindowText, colors::focal());
        problems_->setPalette(pal);
    }
    emit changed();
}

}  // namespace foldline::ui
