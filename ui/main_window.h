#pragma once
// The workbench window: the step strip (Source → Question → Scan → Findings → Diagram → Memo)
// over one page per step, every action in a menu with a shortcut, layout kept between runs.
#include "core/audit/project_file.h"  // core before Qt (see DEVELOPERS.md)
#include "core/table/table.h"
#include "ui/autosave.h"
#include "ui/engine.h"
#include "ui/recovery_dialog.h"

#include <QDateTime>
#include <QHash>
#include <QMainWindow>
#include <functional>
#include <memory>
#include <optional>

class QAction;
class QMenu;
class QStackedWidget;
class QUndoGroup;

namespace foldline::ui {

class DiagramPage;
class Job;
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
    /// Width in pixels of the Memo step's page-1 preview.
    static constexpr int kMemoPreviewWidth = 520;
    FindingsModel* findings_model() const { return model_; }
    /// The action with this object name (e.g. "action_open"), or null.
    QAction* action(const QString& name) const { return actions_.value(name); }
    /// The autosave of this window (interval, folder and recovery file; see ui/autosave.h).
    Autosave* autosave() const { return autosave_; }
    /// The project file the audit was opened from or last saved to; empty when never saved.
    QString project_path() const { return project_path_; }
    /// What changed in the data file since the opened project was saved (rows, columns,
    /// digest), as shown in the status bar; empty when unchanged or no project was opened.
    QString data_change() const { return data_change_; }

    /// The audit as a project document (data source, question, settings, diagram, decisions,
    /// notes, memo settings; no rows). Error when no data file is open (typed-in counts have
    /// no file to point to).
    /// The data file's digest is computed on a worker when the file is loaded, never on the
    /// GUI thread, and cached by (path, size, modification time). Until it is known, the
    /// project is still produced, with an empty digest (autosave never waits; the
    /// recovery copy is written again when the digest arrives); an explicit save and the memo
    /// wait for it instead (wait_for_data_digest), so neither ever records an empty or stale one.
    Result<project::Project> current_project() const;
    /// The data file's SHA-256 when known for the file as it is now; nullopt while the worker
    /// computes it, or when the source is not a file.
    std::optional<std::string> data_digest() const;
    /// Returns once the data file's digest is known (at once when it is): the worker computes
    /// it while this runs the event loop without user input, so the window keeps painting.
    /// Ok when the source is not a file; Error naming the data file when it cannot be read.
    Status wait_for_data_digest();

    /// Asks what to do with a recovery file; the default shows RecoveryDialog. Tests inject
    /// their own answer so no modal dialog blocks them.
    using RecoveryPrompt = std::function<RecoveryChoice(const RecoveryOffer&)>;
    void set_recovery_prompt(RecoveryPrompt prompt) { prompt_ = std::move(prompt); }

    /// What to do with unsaved changes when the window closes.
    enum class CloseChoice { Save, Discard, Cancel };
    /// Asks it; the default is a Save / Discard / Cancel box. Tests inject their own answer.
    using ClosePrompt = std::function<CloseChoice()>;
    void set_close_prompt(ClosePrompt prompt) { close_prompt_ = std::move(prompt); }
    /// True when the audit has changes that no save has written yet.
    bool unsaved() const { return unsaved_; }
    /// Saves to the audit's own file, or asks for one (save_project_dialog); true when written.
    bool save_project_now();
    /// Audits opened or saved, most recent first (the Open recent menu lists them first).
    QStringList recent_audits() const;

signals:
    /// The data file's digest is known (data_digest) or failed (wait_for_data_digest says why).
    void data_digest_done();

public slots:
    void go_to(int step);
    /// Starts the scan with the question as set; false when it cannot run.
    bool start_scan();
    /// Writes the PDF memo of the last scan (rates or a trend) to `path`, with the audit as it
    /// would be saved (current_project); Error naming `path` when there is no finished scan.
    Status export_memo_to(const QString& path);
    /// Page 1 of that memo, `width_px` wide (the Memo step's preview); null without a scan.
    QImage memo_preview_image(int width_px) const;
    void export_memo_dialog();
    /// Writes the audit (data source, question, settings, diagram, decisions; no rows) as a
    /// NAME.foldline project, atomically; rate and trend audits alike. On success the recovery
    /// file is removed. Error when no data file is open or the file cannot be written.
    Status save_project_to(const QString& path);
    /// Opens a project: loads its data, scans with its question and settings, then restores
    /// the decisions and the diagram. Error when the file cannot be read.
    Status open_project(const QString& path);
    /// Opens a project already in memory that belongs to `path` (empty: never saved), as
    /// open_project does after reading the file.
    void open_project_document(const project::Project& p, const QString& path);
    /// Looks in the autosave folder for an audit a session left without saving (newer than its
    /// project file) and asks the recovery prompt: Restore opens it and removes the file,
    /// Discard removes it, Later keeps it. Returns the answer, or nullopt when there was none.
    std::optional<RecoveryChoice> check_recovery();
    /// Opens `path` as a saved audit when it ends in .foldline, else loads it as data on the
    /// Source step (the command line's FILE, a dropped file). A project that cannot be read is
    /// reported in a message box.
    void open_file(const QString& path);
    void save_project_dialog();
    /// The name save dialogs propose: the audit file's base name, else the data file's.
    QString audit_name() const;
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
    /// Calls `use` with the memo request of the current audit; Error when no scan has finished.
    Status with_memo_request(const std::function<void(const MemoRequest&)>& use) const;

    StepBar* steps_;
    QStackedWidget* stack_;
    QUndoGroup* undo_group_ = nullptr;  ///< Undo and Redo follow the step on screen
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
    project::AuditSpec last_spec_;  ///< the audit the last scan ran (core/audit), for verdicts
    int seeded_row_ = -1;  ///< the finding the Diagram step judges; -1 until the audit's diagram exists
    struct PendingProject;
    std::shared_ptr<PendingProject> pending_;  ///< a project being opened (load → scan → restore)
    void restore_pending();
    Autosave* autosave_ = nullptr;
    RecoveryPrompt prompt_;
    ClosePrompt close_prompt_;
    bool unsaved_ = false;
    /// Marks the audit changed (the title shows it) or saved, and names the window after it.
    void set_unsaved(bool unsaved);
    void add_recent_audit(const QString& path);
    QString project_path_;
    QString last_source_;  ///< the data last loaded: reading it again is not new data
    QString data_change_;
    std::optional<project::Project> base_;  ///< the opened project: what the workbench does not edit
    struct Digest {
        QString path;
        qint64 size = -1;
        QDateTime modified;
        std::string sha256;
    };
    Digest digest_;  ///< the data file's SHA-256, computed once per version of the file
    Job* digest_job_ = nullptr;  ///< computes digest_ off the GUI thread
    struct DigestRun {
        Digest of;                                 ///< the file as it was when hashing started
        std::optional<Result<std::string>> sha256;  ///< set by the worker
    };
    std::shared_ptr<DigestRun> digest_run_;
    std::optional<Error> digest_error_;  ///< why the current file's digest failed
    bool digest_again_ = false;          ///< another file (or version) was loaded while hashing
    bool recovery_lacks_digest_ = false; ///< the last recovery copy was written before the digest
    /// Starts hashing the current data file on the worker unless its digest is known.
    void start_digest();
    void digest_finished();
    /// With the opened project's data, the table and the digest all known: what changed.
    void check_data_change();
    std::optional<project::DataSource> saved_data_;  ///< the opened project's data, until checked
};

}  // namespace foldline::ui
