#pragma once
// Step 1, Source: open a CSV/TSV file (dialog, drag-and-drop, recent files) or type in counts;
// load off the UI thread with progress and cancel; preview rows and summarise columns.
#include <QWidget>
#include <map>
#include <memory>
#include <optional>

#include "core/table/table.h"
#include "ui/engine.h"
#include "ui/source_kind.h"

class QComboBox;
class QLabel;
class QLineEdit;
class QProgressBar;
class QPushButton;
class QSplitter;
class QTabWidget;
class QTableView;

namespace foldline::ui {

class ColumnModel;
class CountsGrid;
class DatabaseForm;
class Job;
class TableModel;

class SourcePage : public QWidget {
    Q_OBJECT
public:
    explicit SourcePage(QWidget* parent = nullptr);

    /// Starts loading `path` in the background (ignored while a load is running).
    void open_path(const QString& path);
    /// Starts loading `path` with these reader settings (a saved audit's).
    void open_path(const QString& path, const LoadOptions& options);
    /// The reader settings of the current file.
    LoadOptions options() const { return options_; }
    /// Shows a table as the current source: `kind` says where it came from, `source` is its
    /// path (a file) or display name (a database, typed-in counts).
    void set_table(std::shared_ptr<const Table> table, SourceKind kind, const QString& source);
    std::shared_ptr<const Table> table() const { return table_; }
    QString source() const { return source_; }
    /// Where the current table came from; None when there is none.
    SourceKind kind() const { return table_ ? kind_ : SourceKind::None; }
    bool loading() const;
    QStringList recent_files() const;
    void clear_recent_files();

    QTableView* preview() const { return preview_; }
    QTableView* column_view() const { return columns_; }
    CountsGrid* counts_grid() const { return grid_; }
    QSplitter* splitter() const { return splitter_; }
    QTabWidget* tabs() const { return tabs_; }
    /// Last message shown (errors name file, line and column).
    QString message() const;
    DatabaseForm* database_form() const { return database_; }
    /// The column proposed as the count column of the current file (empty when none is): the
    /// notice above the table offers it until the reviewer uses or declines it.
    QString proposed_count_column() const { return proposed_count_; }
    /// Reads the file again with the proposed count column (what the notice's button does).
    void use_proposed_count_column();
    /// Reads column `column` as `type` (nullopt: as the reader infers it) and loads the file
    /// again; a choice the file cannot be read with is reported and forgotten.
    void read_column_as(const QString& column, std::optional<foldline::ColumnType> type);
    /// The text of the missing-markers field.
    QString missing_markers_text() const;
    /// The database the current table was counted in (masked connection, driver, table or
    /// query, rows, query time); nullopt for a file or typed-in table.
    std::optional<DatabaseRecord> database_record() const { return record_; }

signals:
    void table_loaded(std::shared_ptr<const foldline::Table> table, const QString& source);
    /// The reviewer is done with the columns and asks for the Question step.
    void next_requested();
    void recent_files_changed();

public slots:
    void open_dialog();
    void cancel_load();
    void show_counts_grid();
    /// Counts a database source in the background (ignored while a load is running); progress
    /// shows the query running and Cancel calls the driver's cancel.
    void count_in_database(const foldline::ui::DatabaseRequest& request);

protected:
    void dragEnterEvent(QDragEnterEvent* e) override;
    void dropEvent(QDropEvent* e) override;

private:
    void reload();
    void add_recent(const QString& path);
    void show_message(const QString& text, bool error);
    void column_menu(const QPoint& pos);
    void show_count_proposal();
    void set_missing_field(const QStringList& markers);

    std::shared_ptr<const Table> table_;
    QString source_, path_;
    SourceKind kind_ = SourceKind::None;
    LoadOptions options_;
    std::shared_ptr<Result<Table>> pending_;
    std::shared_ptr<QStringList> pending_notices_;
    Job* job_;
    TableModel* model_;
    ColumnModel* column_model_;
    QTableView *preview_, *columns_;
    QComboBox *recent_, *count_column_, *decimal_;
    QLineEdit *missing_, *sheet_;
    QStringList notices_;  ///< what the last load said about the file (warnings, number readings)
    QProgressBar* progress_;
    QPushButton *cancel_, *reload_, *next_ = nullptr;
    QLabel *message_, *summary_;
    QTabWidget* tabs_;
    QSplitter* splitter_;
    CountsGrid* grid_;
    DatabaseForm* database_;
    bool database_job_ = false;
    QString database_source_;
    std::shared_ptr<DatabaseRecord> pending_record_;
    std::optional<DatabaseRecord> record_;
    QWidget* count_notice_ = nullptr;  ///< "this looks like a pre-counted file" with its buttons
    QLabel* count_notice_text_ = nullptr;
    QString proposed_count_;
    QString count_declined_for_;       ///< the file whose proposal the reviewer declined
    std::optional<LoadOptions> fallback_;  ///< the settings to go back to if a type choice fails
    bool empty_is_missing_ = true;     ///< an empty cell is missing (not shown in the markers field)
    std::map<std::string, foldline::ColumnType> inferred_;  ///< types as read, before overrides
};

}  // namespace foldline::ui
