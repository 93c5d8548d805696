#include "ui/counts_grid.h"

#include "core/table/typed_table.h"
#include "ui/source_kind.h"

#include <QApplication>
#include <QClipboard>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QKeyEvent>
#include <QLabel>
#include <QLineEdit>
#include <QPushButton>
#include <QTableWidget>
#include <QVBoxLayout>

namespace foldline::ui {

namespace {
enum GridCol { kStratum, kPosF, kNF, kPosR, kNR, kCols };

bool parse_count(const QString& s, double* out) {
    bool ok = false;
    const double v = s.trimmed().toDouble(&ok);
    if (!ok || v < 0 || !std::isfinite(v)) return false;
    *out = v;
    return true;
}
}  // namespace

CountsGrid::CountsGrid(QWidget* parent) : QWidget(parent) {
    auto* names = new QFormLayout;
    stratum_ = new QLineEdit(tr("stratum"));
    focal_ = new QLineEdit(tr("focal"));
    reference_ = new QLineEdit(tr("reference"));
    outcome_ = new QLineEdit(tr("positive"));
    stratum_->setObjectName(QStringLiteral("typed_stratum"));
    focal_->setObjectName(QStringLiteral("typed_focal"));
    reference_->setObjectName(QStringLiteral("typed_reference"));
    outcome_->setObjectName(QStringLiteral("typed_outcome"));
    stratum_->setToolTip(tr("Name of the column that holds the stratum labels"));
    focal_->setToolTip(tr("Label of the group under review"));
    reference_->setToolTip(tr("Label of the group it is compared with"));
    outcome_->setToolTip(tr("Name of the yes/no outcome counted as positives (e.g. recovered); the rest are \"not recovered\""));
    auto* names_row = new QHBoxLayout;
    names->addRow(tr("Stratum column"), stratum_);
    names->addRow(tr("Outcome"), outcome_);
    auto* names2 = new QFormLayout;
    names2->addRow(tr("Focal group"), focal_);
    names2->addRow(tr("Reference group"), reference_);
    names_row->addLayout(names);
    names_row->addLayout(names2);

    grid_ = new QTableWidget(4, kCols, this);
    grid_->setHorizontalHeaderLabels({tr("Stratum"), tr("Focal positives"), tr("Focal total"),
                                      tr("Reference positives"), tr("Reference total")});
    grid_->horizontalHeader()->setSectionResizeMode(QHeaderView::Stretch);
    grid_->installEventFilter(this);
    grid_->setToolTip(tr("One stratum per row. Paste from a spreadsheet with Ctrl+V."));

    auto* add = new QPushButton(tr("Add stratum"));
    auto* remove = new QPushButton(tr("Remove stratum"));
    auto* paste = new QPushButton(tr("Paste tab-separated"));
    auto* use = new QPushButton(tr("Use this table"));
    use->setDefault(true);
    use->setObjectName(QStringLiteral("use_counts"));
    connect(add, &QPushButton::clicked, this, [this] { grid_->insertRow(grid_->rowCount()); });
    connect(remove, &QPushButton::clicked, this, [this] {
        const int r = grid_->currentRow() >= 0 ? grid_->currentRow() : grid_->rowCount() - 1;
        if (r >= 0) grid_->removeRow(r);
    });
    connect(paste, &QPushButton::clicked, this, &CountsGrid::paste_from_clipboard);
    connect(use, &QPushButton::clicked, this, &CountsGrid::use_table);
    auto* buttons = new QHBoxLayout;
    buttons->addWidget(add);
    buttons->addWidget(remove);
    buttons->addWidget(paste);
    buttons->addStretch();
    buttons->addWidget(use);

    message_ = new QLabel(this);
    message_->setWordWrap(true);
    message_->setTextInteractionFlags(Qt::TextSelectableByMouse);

    auto* lay = new QVBoxLayout(this);
    auto* intro = new QLabel(tr("Type or paste counts already aggregated elsewhere: for each stratum, "
                                "how many in each group had the outcome (positives) out of how many (total)."));
    intro->setWordWrap(true);
    lay->addWidget(intro);
    lay->addLayout(names_row);
    lay->addWidget(grid_, 1);
    lay->addLayout(buttons);
    lay->addWidget(message_);
}

QString CountsGrid::stratum_name() const { return stratum_->text().trimmed(); }
QString CountsGrid::focal_name() const { return focal_->text().trimmed(); }
QString CountsGrid::reference_name() const { return reference_->text().trimmed(); }
QString CountsGrid::outcome_name() const { return outcome_->text().trimmed(); }
QString CountsGrid::group_column_name() const { return tr("group"); }
QString CountsGrid::positive_label() const { return outcome_name(); }
QString CountsGrid::negative_label() const { return tr("not %1").arg(outcome_name()); }

void CountsGrid::set_rows(const QList<QStringList>& rows) {
    grid_->clearContents();
    grid_->setRowCount(int(rows.size()));
    for (int r = 0; r < rows.size(); ++r)
        for (int c = 0; c < kCols && c < rows[r].size(); ++c)
            grid_->setItem(r, c, new QTableWidgetItem(rows[r][c]));
}

int CountsGrid::paste_tsv(const QString& text) {
    QStringList lines = text.split(QLatin1Char('\n'));
    while (!lines.isEmpty() && lines.last().trimmed().isEmpty()) lines.removeLast();
    if (lines.isEmpty()) return 0;
    // A header line: its count cells are not numbers.
    const QStringList first = lines.first().split(QLatin1Char('\t'));
    double dummy = 0;
    if (first.size() > 1 && !parse_count(first[1], &dummy)) lines.removeFirst();
    const int r0 = std::max(0, grid_->currentRow());
    const int c0 = std::max(0, grid_->currentColumn());
    for (int i = 0; i < lines.size(); ++i) {
        QString line = lines[i];
        if (line.endsWith(QLatin1Char('\r'))) line.chop(1);
        const QStringList cells = line.split(QLatin1Char('\t'));
        if (r0 + i >= grid_->rowCount()) grid_->setRowCount(r0 + i + 1);
        for (int j = 0; j < cells.size() && c0 + j < kCols; ++j)
            grid_->setItem(r0 + i, c0 + j, new QTableWidgetItem(cells[j].trimmed()));
    }
    message_->setText(tr("Pasted %n row(s).", nullptr, int(lines.size())));
    return int(lines.size());
}

void CountsGrid::paste_from_clipboard() { paste_tsv(QApplication::clipboard()->text()); }

bool CountsGrid::eventFilter(QObject* watched, QEvent* event) {
    if (watched == grid_ && event->type() == QEvent::KeyPress) {
        auto* ke = static_cast<QKeyEvent*>(event);
        if (ke->matches(QKeySequence::Paste)) {
            paste_from_clipboard();
            return true;
        }
    }
    return QWidget::eventFilter(watched, event);
}

Result<Table> CountsGrid::to_table() const {
    const QString source = typed_in_source_name();
    const QString headers[kCols] = {tr("Stratum"), tr("Focal positives"), tr("Focal total"),
                                    tr("Reference positives"), tr("Reference total")};
    if (stratum_name().isEmpty() || focal_name().isEmpty() || reference_name().isEmpty() ||
        outcome_name().isEmpty())
        return make_error(tr("every name (stratum column, outcome, focal and reference group) must be filled in").toStdString(),
                          source.toStdString());
    if (focal_name() == reference_name())
        return make_error(tr("the focal and reference groups need different labels").toStdString(), source.toStdString());

    std::vector<TypedStratum> strata;
    for (int r = 0; r < grid_->rowCount(); ++r) {
        auto text = [&](int c) { return grid_->item(r, c) ? grid_->item(r, c)->text().trimmed() : QString(); };
        bool blank = true;
        for (int c = 0; c < kCols; ++c) blank = blank && text(c).isEmpty();
        if (blank) continue;
        double v[kCols] = {0, 0, 0, 0, 0};
        for (int c = kPosF; c < kCols; ++c)
            if (!parse_count(text(c), &v[c]))
                return make_error(tr("%1: expected a count (a number ≥ 0), found \"%2\"").arg(headers[c], text(c)).toStdString(),
                                  source.toStdString(), std::size_t(r + 1), std::size_t(c + 1));
        if (v[kPosF] > v[kNF])
            return make_error(tr("focal positives exceed the focal total").toStdString(), source.toStdString(),
                              std::size_t(r + 1), std::size_t(kPosF + 1));
        if (v[kPosR] > v[kNR])
            return make_error(tr("reference positives exceed the reference total").toStdString(), source.toStdString(),
                              std::size_t(r + 1), std::size_t(kPosR + 1));
        QString label = text(kStratum);
        if (label.isEmpty()) label = tr("stratum %1").arg(r + 1);
        for (const TypedStratum& s : strata)
            if (s.level == label.toStdString())
                return make_error(tr("stratum \"%1\" appears twice").arg(label).toStdString(), source.toStdString(),
                                  std::size_t(r + 1), std::size_t(kStratum + 1));
        strata.push_back({label.toStdString(), v[kPosF], v[kNF], v[kPosR], v[kNR]});
    }
    if (strata.empty()) return make_error(tr("the table has no strata yet").toStdString(), source.toStdString());
    // The outcome's levels are the label the reviewer typed and its negation, so the question
    // reads "recovered" rather than "1".
    auto t = table_from_counts(strata, stratum_name().toStdString(), group_column_name().toStdString(),
                               outcome_name().toStdString(), focal_name().toStdString(), reference_name().toStdString(),
                               positive_label().toStdString(), negative_label().toStdString());
    if (!t) {
        Error e = t.error();
        if (e.file.empty()) e.file = source.toStdString();
        return e;
    }
    t->source = source.toStdString();
    return t;
}

void CountsGrid::use_table() {
    auto t = to_table();
    if (!t) {
        message_->setText(QString::fromStdString(t.error().to_string()));
        return;
    }
    message_->setText(tr("Built a table of %1 strata.").arg(t->columns[0].levels.size()));
    emit table_ready(std::make_shared<const Table>(std::move(t).value()));
}

}  // namespace foldline::ui
