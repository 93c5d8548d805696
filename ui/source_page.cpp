#include "core/table/count_column_guess.h"
#include "ui/source_page.h"

#include <algorithm>

#include <QComboBox>
#include <QDragEnterEvent>
#include <QDropEvent>
#include <QFileDialog>
#include <QFileInfo>
#include <QFrame>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QMenu>
#include <QMimeData>
#include <QProgressBar>
#include <QPushButton>
#include <QSettings>
#include <QSplitter>
#include <QTabWidget>
#include <QTableView>
#include <QVBoxLayout>

#include "ui/column_model.h"
#include "ui/counts_grid.h"
#include "ui/database_form.h"
#include "ui/job.h"
#include "ui/table_model.h"

namespace foldline::ui {

namespace {
constexpr int kMaxRecent = 8;
const char* kRecentKey = "source/recent";
}  // namespace

SourcePage::SourcePage(QWidget* parent)
    : QWidget(parent), job_(new Job(this)), model_(new TableModel(this)), column_model_(new ColumnModel(this)) {
    setAcceptDrops(true);

    auto* open = new QPushButton(tr("Open data file…"));
    open->setObjectName(QStringLiteral("open_file"));
    open->setToolTip(tr("Open a data file: CSV/TSV, SAS (.xpt, .sas7bdat), SPSS (.sav, .zsav), Stata (.dta) "
                        "or a workbook (.xlsx, .xls) (Ctrl+O); you can also drop a file on this window"));
    connect(open, &QPushButton::clicked, this, &SourcePage::open_dialog);
    recent_ = new QComboBox;
    recent_->setMinimumContentsLength(30);
    recent_->setSizeAdjustPolicy(QComboBox::AdjustToMinimumContentsLengthWithIcon);
    recent_->setPlaceholderText(tr("Recent files"));
    recent_->setToolTip(tr("Files opened before"));
    connect(recent_, &QComboBox::activated, this, [this](int i) { open_path(recent_->itemData(i).toString()); });

    count_column_ = new QComboBox;
    count_column_->setToolTip(tr("For a pre-counted file: the column that says how many observations each row stands for"));
    count_column_->setObjectName(QStringLiteral("count_column"));
    connect(count_column_, &QComboBox::activated, this, [this](int) {
        options_.count_column = count_column_->currentData().toString();
        if (options_.count_column.isEmpty()) count_declined_for_ = path_;  // the reviewer chose "none"
        reload();
    });
    missing_ = new QLineEdit;
    missing_->setObjectName(QStringLiteral("missing_markers"));
    missing_->setPlaceholderText(tr("reader defaults"));
    missing_->setToolTip(tr("Cell texts that mean \"missing\", separated by commas (e.g. NA, n/a, -); an empty cell is always missing"));
    sheet_ = new QLineEdit;
    sheet_->setObjectName(QStringLiteral("sheet"));
    sheet_->setPlaceholderText(tr("first sheet"));
    sheet_->setToolTip(tr("Workbooks (.xlsx, .xls): the name of the sheet to read; empty reads the first sheet"));
    connect(sheet_, &QLineEdit::returnPressed, this, [this] {
        options_.sheet = sheet_->text().trimmed();
        reload();
    });
    decimal_ = new QComboBox;
    decimal_->setObjectName(QStringLiteral("decimal_mark"));
    decimal_->addItem(tr("automatic"), int(DecimalMark::Auto));
    decimal_->addItem(tr("point (1,234.5)"), int(DecimalMark::Point));
    decimal_->addItem(tr("comma (1.234,5)"), int(DecimalMark::Comma));
    decimal_->setToolTip(tr("Decimal mark of numbers written as text. Automatic reads a column written consistently "
                            "with decimal commas as numbers and lists the columns it could not decide"));
    connect(decimal_, &QComboBox::activated, this, [this](int) {
        options_.decimal = static_cast<DecimalMark>(decimal_->currentData().toInt());
        reload();
    });
    reload_ = new QPushButton(tr("Reload"));
    reload_->setToolTip(tr("Read the file again with these settings"));
    connect(reload_, &QPushButton::clicked, this, [this] {
        // An empty field means the reader's defaults; typed markers come after the empty cell,
        // which the field never shows (it would read as a leading comma).
        options_.missing_markers.clear();
        for (const QString& m : missing_->text().split(QLatin1Char(','), Qt::SkipEmptyParts))
            if (!m.trimmed().isEmpty()) options_.missing_markers << m.trimmed();
        if (!options_.missing_markers.isEmpty() && empty_is_missing_) options_.missing_markers.prepend(QString());
        options_.sheet = sheet_->text().trimmed();
        reload();
    });

    auto* bar = new QHBoxLayout;
    bar->addWidget(open);
    bar->addWidget(recent_, 1);
    bar->addSpacing(12);
    bar->addWidget(new QLabel(tr("Count column")));
    bar->addWidget(count_column_);
    bar->addWidget(new QLabel(tr("Missing markers")));
    bar->addWidget(missing_);
    bar->addWidget(new QLabel(tr("Sheet")));
    bar->addWidget(sheet_);
    bar->addWidget(new QLabel(tr("Decimal mark")));
    bar->addWidget(decimal_);
    bar->addWidget(reload_);

    progress_ = new QProgressBar;
    progress_->setTextVisible(true);
    cancel_ = new QPushButton(tr("Cancel"));
    cancel_->setObjectName(QStringLiteral("cancel_load"));
    connect(cancel_, &QPushButton::clicked, this, &SourcePage::cancel_load);
    auto* prow = new QHBoxLayout;
    prow->addWidget(progress_, 1);
    prow->addWidget(cancel_);
    progress_->hide();
    cancel_->hide();

    message_ = new QLabel;
    message_->setWordWrap(true);
    message_->setTextInteractionFlags(Qt::TextSelectableByMouse);
    message_->setObjectName(QStringLiteral("source_message"));
    summary_ = new QLabel(tr("No data yet. Open a file, drop one here, or type in a table of counts."));
    summary_->setWordWrap(true);

    preview_ = new QTableView;
    preview_->setModel(model_);
    preview_->verticalHeader()->setSectionResizeMode(QHeaderView::Fixed);
    preview_->verticalHeader()->setDefaultSectionSize(preview_->fontMetrics().height() + 6);
    preview_->horizontalHeader()->setSectionResizeMode(QHeaderView::Interactive);
    preview_->horizontalHeader()->setDefaultSectionSize(120);
    preview_->setWordWrap(false);
    preview_->setAlternatingRowColors(true);
    columns_ = new QTableView;
    columns_->setModel(column_model_);
    columns_->verticalHeader()->hide();
    columns_->horizontalHeader()->setStretchLastSection(true);
    columns_->setSelectionBehavior(QAbstractItemView::SelectRows);
    columns_->setContextMenuPolicy(Qt::CustomContextMenu);
    columns_->setToolTip(tr("Right-click a column to read it as another type"));
    connect(columns_, &QTableView::customContextMenuRequested, this, &SourcePage::column_menu);

    splitter_ = new QSplitter(Qt::Horizontal);
    splitter_->setObjectName(QStringLiteral("source_splitter"));
    splitter_->addWidget(preview_);
    splitter_->addWidget(columns_);
    splitter_->setStretchFactor(0, 3);
    splitter_->setStretchFactor(1, 2);

    grid_ = new CountsGrid;
    connect(grid_, &CountsGrid::table_ready, this,
            [this](std::shared_ptr<const Table> t) { set_table(std::move(t), SourceKind::TypedIn, typed_in_source_name()); });
    tabs_ = new QTabWidget;
    tabs_->addTab(splitter_, tr("Rows and columns"));
    tabs_->addTab(grid_, tr("Type in counts"));
    database_ = new DatabaseForm;
    connect(database_, &DatabaseForm::count_requested, this, &SourcePage::count_in_database);
    const int db_tab = tabs_->addTab(database_, tr("Database"));
    if (!database_available()) {
        // Plainly off in a build without ODBC, saying why, rather than a form that cannot count.
        tabs_->setTabEnabled(db_tab, false);
        tabs_->setTabToolTip(db_tab, tr("This build has no database support (it needs unixODBC)."));
    }

    // A file that looks pre-counted: the notice proposes its count column.
    count_notice_ = new QFrame;
    count_notice_->setObjectName(QStringLiteral("count_notice"));
    static_cast<QFrame*>(count_notice_)->setFrameShape(QFrame::StyledPanel);
    count_notice_text_ = new QLabel;
    count_notice_text_->setWordWrap(true);
    auto* use_count = new QPushButton(tr("Use as count column"));
    use_count->setObjectName(QStringLiteral("use_count_column"));
    connect(use_count, &QPushButton::clicked, this, &SourcePage::use_proposed_count_column);
    auto* keep_rows = new QPushButton(tr("No, one row per observation"));
    keep_rows->setObjectName(QStringLiteral("decline_count_column"));
    connect(keep_rows, &QPushButton::clicked, this, [this] {
        count_declined_for_ = path_;
        proposed_count_.clear();
        count_notice_->hide();
    });
    auto* nl = new QHBoxLayout(count_notice_);
    nl->addWidget(count_notice_text_, 1);
    nl->addWidget(use_count);
    nl->addWidget(keep_rows);
    count_notice_->hide();

    next_ = new QPushButton(tr("Next: the question  →"));
    next_->setObjectName(QStringLiteral("source_next"));
    next_->setToolTip(tr("Done reviewing the columns: choose the outcome and the groups (Ctrl+2)"));
    next_->setEnabled(false);
    connect(next_, &QPushButton::clicked, this, &SourcePage::next_requested);
    auto* summary_row = new QHBoxLayout;
    summary_row->addWidget(summary_, 1);
    summary_row->addWidget(next_);

    auto* lay = new QVBoxLayout(this);
    lay->addLayout(bar);
    lay->addLayout(prow);
    lay->addLayout(summary_row);
    lay->addWidget(count_notice_);
    lay->addWidget(message_);
    lay->addWidget(tabs_, 1);

    connect(job_, &Job::progress, this, [this](double done, double total, const QString& step) {
        progress_->setRange(0, 1000);
        progress_->setValue(total > 0 ? int(1000 * done / total) : 0);
        progress_->setFormat(step.isEmpty() ? tr("Reading… %p%") : step + QStringLiteral(" %p%"));
    });
    connect(job_, &Job::finished, this, [this] {
        progress_->hide();
        cancel_->hide();
        auto result = std::move(pending_);
        if (auto notices = std::move(pending_notices_)) notices_ = *notices;
        if (database_job_) {
            database_job_ = false;
            database_->set_busy(false);
            auto record = std::move(pending_record_);
            if (job_->cancelled()) {
                show_message(tr("The query was cancelled in the database; nothing was loaded."), false);
                return;
            }
            if (!result || !result->ok()) {
                show_message(result ? QString::fromStdString(result->error().to_string()) : tr("Counting failed."), true);
                return;
            }
            set_table(std::make_shared<const Table>(std::move(*result).value()), SourceKind::Database, database_source_);
            record_ = *record;
            return;
        }
        if (job_->cancelled()) {
            show_message(tr("Loading %1 was cancelled.").arg(path_), false);
            return;
        }
        if (!result || !result->ok()) {
            QString why = result ? QString::fromStdString(result->error().to_string()) : tr("Loading failed.");
            if (fallback_ && table_ && kind_ == SourceKind::File) {
                // A type the file cannot be read with is not remembered: the table stays as it was.
                options_ = *fallback_;
                why += tr(" The column keeps the type it had.");
            }
            fallback_.reset();
            show_message(why, true);
            return;
        }
        fallback_.reset();
        add_recent(path_);
        set_table(std::make_shared<const Table>(std::move(*result).value()), SourceKind::File, path_);
        // Say how the file was read (columns read with a decimal comma, ambiguous columns left as
        // text, reader warnings), so nothing is guessed silently.
        if (!notices_.isEmpty()) show_message(notices_.join(QLatin1Char('\n')), false);
    });

    QStringList recent = recent_files();
    for (const QString& r : recent) recent_->addItem(QFileInfo(r).fileName() + QStringLiteral("  —  ") + r, r);
    count_column_->addItem(tr("none (one row per observation)"), QString());
}

bool SourcePage::loading() const { return job_->running(); }

QString SourcePage::message() const { return message_->text(); }

void SourcePage::open_dialog() {
    const QString dir = QSettings().value("source/last_dir").toString();
    const QString path = QFileDialog::getOpenFileName(this, tr("Open data file"), dir,
                                                      tr("Data files (*.csv *.tsv *.txt *.xpt *.sas7bdat *.sav *.zsav *.dta *.xlsx *.xls);;"
                                                         "Delimited text (*.csv *.tsv *.txt);;"
                                                         "SAS, SPSS and Stata files (*.xpt *.sas7bdat *.sav *.zsav *.dta);;"
                                                         "Workbooks (*.xlsx *.xls);;All files (*)"));
    if (path.isEmpty()) return;
    QSettings().setValue("source/last_dir", QFileInfo(path).absolutePath());
    if (path != path_) {
        options_ = LoadOptions{};
        missing_->clear();
        empty_is_missing_ = true;
        sheet_->clear();
        decimal_->setCurrentIndex(0);
    }
    open_path(path);
}

QString SourcePage::missing_markers_text() const { return missing_->text(); }

void SourcePage::set_missing_field(const QStringList& markers) {
    // The empty marker has no text of its own: shown, it would be a leading comma.
    empty_is_missing_ = markers.isEmpty() || markers.contains(QString());
    QStringList shown;
    for (const QString& m : markers)
        if (!m.isEmpty()) shown << m;
    missing_->setText(shown.join(QStringLiteral(", ")));
}

void SourcePage::open_path(const QString& path) {
    if (job_->running()) return;
    if (path != path_) options_.count_column.clear(), options_.type_overrides.clear();
    path_ = path;
    reload();
}

void SourcePage::open_path(const QString& path, const LoadOptions& options) {
    if (job_->running()) return;
    path_ = path;
    options_ = options;
    set_missing_field(options.missing_markers);
    sheet_->setText(options.sheet);
    decimal_->setCurrentIndex(std::max(0, decimal_->findData(int(options.decimal))));
    reload();
}

void SourcePage::reload() {
    if (path_.isEmpty() || job_->running()) return;
    if (!QFileInfo(path_).isFile()) {
        show_message(tr("%1: no such file").arg(path_), true);
        return;
    }
    show_message(tr("Reading %1…").arg(QFileInfo(path_).fileName()), false);
    progress_->setRange(0, 0);
    progress_->show();
    cancel_->show();
    auto result = std::make_shared<Result<Table>>(make_error("not run"));
    pending_ = result;
    const QString path = path_;
    const LoadOptions opts = options_;
    notices_.clear();
    auto notices = std::make_shared<QStringList>();
    pending_notices_ = notices;
    job_->start([result, notices, path, opts](const Work& work) { *result = load_table(path, opts, work, notices.get()); });
}

void SourcePage::cancel_load() { job_->cancel(); }

void SourcePage::count_in_database(const DatabaseRequest& request) {
    if (job_->running()) return;
    database_source_ = tr("database %1, %2")
                           .arg(masked_connection(request.connection),
                                request.table.isEmpty() ? tr("query") : tr("table %1").arg(request.table));
    show_message(tr("Counting in the database…"), false);
    progress_->setRange(0, 0);  // busy until the engine reports a step
    progress_->show();
    cancel_->show();
    database_->set_busy(true);
    database_job_ = true;
    auto result = std::make_shared<Result<Table>>(make_error("not run"));
    auto record = std::make_shared<DatabaseRecord>();
    pending_ = result;
    pending_record_ = record;
    job_->start([result, record, request](const Work& work) { *result = load_database(request, work, record.get()); });
}

void SourcePage::show_counts_grid() { tabs_->setCurrentWidget(grid_); }

void SourcePage::set_table(std::shared_ptr<const Table> table, SourceKind kind, const QString& source) {
    record_.reset();  // set again by a database load right after
    table_ = std::move(table);
    kind_ = table_ ? kind : SourceKind::None;
    source_ = source;
    model_->set_table(table_);
    column_model_->set_table(table_);
    columns_->resizeColumnsToContents();
    if (table_) {
        const QString counts = table_->weighted()
                                   ? tr(", weighted by \"%1\" (%2 observations)")
                                         .arg(QString::fromStdString(table_->weight_column))
                                         .arg(table_->total_weight(), 0, 'f', 0)
                                   : QString();
        summary_->setText(tr("<b>%1</b>: %L2 rows, %3 columns%4")
                              .arg(source.toHtmlEscaped())
                              .arg(qulonglong(table_->rows))
                              .arg(table_->columns.size())
                              .arg(counts.toHtmlEscaped()));
        // Offer numeric columns as the count column (the current one stays listed).
        count_column_->clear();
        count_column_->addItem(tr("none (one row per observation)"), QString());
        for (const Column& c : table_->columns)
            if (c.is_numeric()) count_column_->addItem(QString::fromStdString(c.name), QString::fromStdString(c.name));
        if (table_->weighted()) {
            const QString w = QString::fromStdString(table_->weight_column);
            count_column_->addItem(w, w);
            count_column_->setCurrentIndex(count_column_->count() - 1);
        }
        if (kind_ != SourceKind::TypedIn) tabs_->setCurrentIndex(0);  // typed-in counts stay in their grid
        show_message(QString(), false);
        if (kind_ == SourceKind::File) {
            std::map<std::string, ColumnType> inferred;
            for (const Column& c : table_->columns) {
                const auto it = inferred_.find(c.name);
                inferred[c.name] = options_.type_overrides.count(c.name) && it != inferred_.end() ? it->second : c.type;
            }
            inferred_ = std::move(inferred);
        } else {
            inferred_.clear();
        }
    } else {
        inferred_.clear();
    }
    next_->setEnabled(table_ != nullptr);
    show_count_proposal();
    emit table_loaded(table_, source_);
}

void SourcePage::show_count_proposal() {
    proposed_count_.clear();
    if (table_ && kind_ == SourceKind::File && !table_->weighted() && count_declined_for_ != path_)
        if (const auto g = guess_count_column(*table_)) {
            proposed_count_ = QString::fromStdString(g->column);
            count_notice_text_->setText(
                tr("<b>This looks like a pre-counted file.</b> Column <b>%1</b> holds whole numbers and every "
                   "combination of the other columns appears once, so each row may stand for <b>%1</b> "
                   "observations (%L2 in all, against %L3 rows). Read it as the count column?")
                    .arg(proposed_count_.toHtmlEscaped())
                    .arg(g->total, 0, 'f', 0)
                    .arg(qulonglong(table_->rows)));
        }
    count_notice_->setVisible(!proposed_count_.isEmpty());
}

void SourcePage::use_proposed_count_column() {
    if (proposed_count_.isEmpty() || job_->running()) return;
    options_.count_column = proposed_count_;
    proposed_count_.clear();
    count_notice_->hide();
    reload();
}

void SourcePage::read_column_as(const QString& column, std::optional<ColumnType> type) {
    if (kind() != SourceKind::File || path_.isEmpty() || job_->running()) return;
    fallback_ = options_;
    if (type) options_.type_overrides[column.toStdString()] = *type;
    else options_.type_overrides.erase(column.toStdString());
    reload();
}

QStringList SourcePage::recent_files() const { return QSettings().value(kRecentKey).toStringList(); }

void SourcePage::clear_recent_files() {
    QSettings().remove(kRecentKey);
    recent_->clear();
    emit recent_files_changed();
}

void SourcePage::add_recent(const QString& path) {
    const QString abs = QFileInfo(path).absoluteFilePath();
    QStringList recent = recent_files();
    recent.removeAll(abs);
    recent.prepend(abs);
    while (recent.size() > kMaxRecent) recent.removeLast();
    QSettings().setValue(kRecentKey, recent);
    recent_->clear();
    for (const QString& r : recent) recent_->addItem(QFileInfo(r).fileName() + QStringLiteral("  —  ") + r, r);
    emit recent_files_changed();
}

void SourcePage::show_message(const QString& text, bool error) {
    message_->setText(text);
    QPalette p = message_->palette();
    p.setColor(QPalette::WindowText, error ? QColor(0xD55E00) : palette().color(QPalette::WindowText));
    message_->setPalette(p);
    message_->setVisible(!text.isEmpty());
    if (error) message_->setText(QStringLiteral("⚠ ") + text);
}

void SourcePage::column_menu(const QPoint& pos) {
    const QModelIndex idx = columns_->indexAt(pos);
    if (!idx.isValid() || kind() != SourceKind::File || path_.isEmpty()) return;
    const Column& c = table_->columns[std::size_t(idx.row())];
    const QString name = QString::fromStdString(c.name);
    const auto over = options_.type_overrides.find(c.name);
    const auto inferred = inferred_.find(c.name);
    auto type_name = [](ColumnType t) { return t == ColumnType::Numeric ? tr("numeric") : tr("categorical"); };
    // Every type, the one the reader inferred included; the current reading is checked.
    QMenu menu(this);
    menu.addSection(tr("Read \"%1\"").arg(name));
    QAction* as_read = menu.addAction(inferred != inferred_.end() ? tr("As read (%1)").arg(type_name(inferred->second))
                                                                   : tr("As read"));
    QAction* as_cat = menu.addAction(tr("As categorical"));
    QAction* as_num = menu.addAction(tr("As numeric"));
    for (QAction* a : {as_read, as_cat, as_num}) a->setCheckable(true);
    if (over == options_.type_overrides.end()) as_read->setChecked(true);
    else (over->second == ColumnType::Numeric ? as_num : as_cat)->setChecked(true);
    QAction* chosen = menu.exec(columns_->viewport()->mapToGlobal(pos));
    if (chosen == as_read && over != options_.type_overrides.end()) read_column_as(name, std::nullopt);
    else if (chosen == as_cat && (over == options_.type_overrides.end() || over->second != ColumnType::Categorical))
        read_column_as(name, ColumnType::Categorical);
    else if (chosen == as_num && (over == options_.type_overrides.end() || over->second != ColumnType::Numeric))
        read_column_as(name, ColumnType::Numeric);
}

void SourcePage::dragEnterEvent(QDragEnterEvent* e) {
    if (e->mimeData()->hasUrls() && !e->mimeData()->urls().isEmpty() && e->mimeData()->urls().first().isLocalFile())
        e->acceptProposedAction();
}

void SourcePage::dropEvent(QDropEvent* e) {
    const auto urls = e->mimeData()->urls();
    if (!urls.isEmpty() && urls.first().isLocalFile()) {
        e->acceptProposedAction();
        open_path(urls.first().toLocalFile());
    }
}

}  // namespace foldline::ui
