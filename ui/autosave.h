#pragma once
// Autosave and crash recovery for the workbench. While an audit is open, its project document
// (the same JSON as NAME.foldline, wrapped with the project file it belongs to) is written to a
// recovery file of this session — never to the project file itself — at most once every
// interval after something changed. A clean save or close removes it; after a crash it is left
// behind, and the next start offers to restore it.
//
// Recovery files live in QStandardPaths::AppDataLocation/recovery/ (set_folder overrides it),
// one per running window: audit-<time>-<pid>.foldline-recovery, held with a QLockFile so a
// second running workbench never offers the first one's live file.
#include "core/audit/project_file.h"  // core before Qt: core headers use `slots` as a name

#include <QDateTime>
#include <QLockFile>
#include <QObject>
#include <QString>
#include <QTimer>
#include <functional>
#include <memory>
#include <optional>

namespace foldline::ui {

/// The recovery file format: {"format": "foldline-recovery", "version": 1, "project_file",
/// "anchor", "written", "project": {a project document}}. `anchor` is the path the project's
/// data path is stored relative to (the project file when there is one).
inline constexpr const char* kRecoveryFormat = "foldline-recovery";

/// A recovery file left by an earlier session.
struct RecoveryOffer {
    QString path;           ///< the recovery file
    QString project_file;   ///< the project it belongs to; empty: never saved
    QDateTime written;      ///< when it was last written (UTC)
    project::Project project;
};

/// The JSON text of a recovery file for `p`, which belongs to `project_file` (empty when never
/// saved); data paths are stored relative to `anchor`. Never fails.
std::string recovery_text(const project::Project& p, const QString& project_file, const QString& anchor,
                          const QDateTime& written);

/// Reads a recovery file. Error for an unreadable file, another format, or a damaged project.
Result<RecoveryOffer> read_recovery(const QString& path);

/// The newest recovery file in `folder` that no running session holds, skipping `own` and
/// removing stale ones (those older than the project file they belong to, or unreadable).
/// nullopt when there is none.
std::optional<RecoveryOffer> find_recovery(const QString& folder, const QString& own = {});

/// The default folder: QStandardPaths::AppDataLocation + "/recovery".
QString default_recovery_folder();

class Autosave : public QObject {
    Q_OBJECT
public:
    /// Returns the document to autosave, or nullopt when there is nothing worth saving yet
    /// (no data file open).
    using Provider = std::function<std::optional<project::Project>()>;

    explicit Autosave(Provider provider, QObject* parent = nullptr);
    ~Autosave() override;

    /// Where recovery files go; empty → default_recovery_folder(). Takes effect for the next
    /// write (a file already written in the old folder is removed).
    void set_folder(const QString& folder);
    QString folder() const { return folder_; }
    /// Milliseconds from the first change to the write (default 30,000); 0 or less → the next
    /// turn of the event loop.
    void set_interval(int ms);
    int interval() const { return timer_.interval(); }
    /// The project file the audit belongs to (recorded in the recovery file); empty: unsaved.
    void set_project_file(const QString& path) { project_file_ = path; }

    /// This session's recovery file (it may not exist yet).
    QString path() const;
    bool pending() const { return dirty_; }

public slots:
    /// Something in the audit changed: write within the interval. Later changes before the
    /// write join it, so a busy session writes at most once per interval.
    void mark_changed();
    /// Writes now when something changed. False when the write failed (the reason is in
    /// last_error()); true when it succeeded or there was nothing to write.
    bool write_now();
    /// A clean save or close: nothing to recover, the file is removed and pending changes
    /// dropped.
    void discard();
    /// Takes over a recovery file being restored: it becomes this session's file (renamed,
    /// locked), so it survives until this session writes, saves or closes cleanly, and a crash
    /// during the restore leaves it to offer again. False (and the file left where it was) when
    /// it cannot be moved.
    bool adopt(const QString& recovery);

public:
    QString last_error() const { return error_; }

signals:
    void written(const QString& path);
    /// A write failed (folder missing or read-only, disk full); `reason` names the file.
    void failed(const QString& reason);

private:
    Provider provider_;
    QTimer timer_;
    QString folder_;
    QString project_file_;
    QString file_name_;
    QString error_;
    std::unique_ptr<QLockFile> lock_;
    bool dirty_ = false;
    bool ensure_folder_and_lock();
};

}  // namespace foldline::ui
