#pragma once
// The workbench window: the step strip (Source → Question → Scan → Findings → Diagram → Memo)
// over one page per step, every action in a menu with a shortcut, layout kept between runs.
#include <QHash>
#include <QMainWindow>
#include <memory>

#include "core/table/table.h"
#include "ui/engine.h"

class QAction;
class QMenu;
class QStackedWidget;

namespace foldline::ui {

class DiagramPage;
class FindingsModel;
class FindingsPage;
class MemoPage;
class QuestionPage;
class ScanPage;
class SourcePage;
class StepBar;

class MainWindow : public QMainWindow {
    Q_OBJECT
public:
    enum Step { Source, Question, Scan, Findings, Diagram, Memo, StepCount };
    explicit MainWindow(QWidget* parent = nullptr);
    ~MainWindow() override;

    int step() const;
    StepBar* step_bar() const { return steps_; }
    SourcePage* source_page() const { return source_; }
    QuestionPage* question_page() const { return question_; }
    ScanPage* scan_page() const { return scan_; }
    FindingsPage* findings_page() const { return findings_; }
    DiagramPage* diagram_page() const { return diagram_; }
    MemoPage* memo_page() const { return memo_; }
    FindingsModel* findings_model() const { return model_; }
    /// The action with this object name (e.g. "action_open"), or null.
    QAction* action(const QString& name) const { return actions_.value(name); }

public slots:
    void go_to(int step);
    /// Starts the scan with the question as set; false when it cannot run.
    bool start_scan();
    /// Writes the PDF memo of the last rate scan to `path`; Error when there is none.
    Status export_memo_to(const QString& path);
    void export_memo_dialog();
    /// Writes the audit (data source, question, settings, diagram, decisions; no rows) as a
    /// NAME.foldline project, atomically. Error for a trend audit (the format holds rates).
    Status save_project_to(const QString& path);
    /// Opens a project: loads its data, scans with its question and settings, then restores
    /// the decisions and the diagram. Error when the file cannot be read.
    Status open_project(const QString& path);
    void save_project_dialog();
    void open_project_dialog();

protected:
    void closeEvent(QCloseEvent* e) override;
    void dragEnterEvent(QDragEnterEvent* e) override;
    void dropEvent(QDropEvent* e) override;

private:
    QAction* make_action(const QString& name, const QString& text, const QKeySequence& key, const QString& tip);
    void build_menus();
    void rebuild_recent_menu();
    void save_layout() const;
    void restore_layout();
    void seed_diagram_for(int row);
    void refresh_memo();

    StepBar* steps_;
    QStackedWidget* stack_;
    FindingsModel* model_;
    SourcePage* source_;
    QuestionPage* question_;
    ScanPage* scan_;
    FindingsPage* findings_;
    DiagramPage* diagram_;
    MemoPage* memo_;
    QMenu* recent_menu_ = nullptr;
    QHash<QString, QAction*> actions_;
    QuestionSpec last_question_;
    int seeded_row_ = -1;
    struct PendingProject;
    std::shared_ptr<PendingProject> pending_;  ///< a project being opened (load → scan → restore)
    void restore_pending();
};

}  // namespace foldline::ui
