#pragma once
// Step 3, Scan: runs the scan on a worker thread, counts candidates in a progress bar, lets the
// reviewer cancel, and adds findings to the shared model as they arrive (in batches every
// 50 ms, so a fast scan cannot flood the event loop).
#include <QElapsedTimer>
#include <QWidget>
#include <memory>
#include <mutex>
#include <vector>

#include "core/table/table.h"
#include "ui/engine.h"

class QLabel;
class QProgressBar;
class QPushButton;
class QTableView;
class QTimer;

namespace foldline::ui {

class FindingsModel;
class Job;

class ScanPage : public QWidget {
    Q_OBJECT
public:
    ScanPage(FindingsModel* model, QWidget* parent = nullptr);
    ~ScanPage() override;

    /// Starts a scan of `table` (replacing the findings); false when one is running.
    /// Starts the audit `spec` (core/audit) on `table`; `q` words the question above the progress.
    bool start(std::shared_ptr<const Table> table, const QuestionSpec& q, const project::AuditSpec& spec);
    bool running() const;
    /// Waits up to `ms` for the worker (tests and shutdown).
    bool wait(int ms);
    QString status() const;
    /// Seconds the last scan took, or the time so far.
    double elapsed_seconds() const;
    /// The engine's result of the last completed rate scan (null otherwise).
    std::shared_ptr<const ScanResult> scan_result() const { return scan_result_; }
    /// The rows the last completed scan read (the rows filter applied); null before one.
    std::shared_ptr<const Table> scanned_table() const { return scanned_table_; }

signals:
    void scan_finished(bool completed, int findings);

public slots:
    void cancel();

private:
    void flush();

    FindingsModel* model_;
    Job* job_;
    QTimer* flush_timer_;
    std::mutex mutex_;
    std::vector<FindingView> inbox_;
    std::shared_ptr<Result<ScanOutcome>> result_;
    std::shared_ptr<const Table> table_;
    std::shared_ptr<const ScanResult> scan_result_;
    std::shared_ptr<const Table> scanned_table_;
    QElapsedTimer clock_;
    double seconds_ = 0;
    QLabel *question_, *status_;
    QProgressBar* progress_;
    QPushButton* cancel_;
    QTableView* live_;
};

}  // namespace foldline::ui
