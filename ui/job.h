#pragma once
// Runs one piece of long core work on a worker thread with a Work (progress + stop token) and
// brings its progress back to the UI thread at most every 50 ms, so the event loop never floods.
#include <QElapsedTimer>
#include <QObject>
#include <QString>
#include <atomic>
#include <functional>
#include <mutex>

#include "core/common/progress.h"

class QThread;
class QTimer;

namespace foldline::ui {

class Job : public QObject {
    Q_OBJECT
public:
    explicit Job(QObject* parent = nullptr);
    ~Job() override;

    /// Starts `body` on a new thread; false (and nothing started) when a job is still running.
    bool start(std::function<void(const Work&)> body);
    bool running() const { return thread_ != nullptr; }
    /// Asks the running body to stop; returns at once.
    void cancel();
    /// Waits for the body to return (used on shutdown and in tests); true if it finished.
    bool wait(int ms);
    bool cancelled() const { return stop_.stop_requested(); }

signals:
    void progress(double done, double total, const QString& step);
    void finished();

private:
    void poll();
    QThread* thread_ = nullptr;
    QTimer* timer_;
    StopToken stop_;
    std::mutex mutex_;
    double done_ = 0, total_ = 0;
    QString step_;
    bool dirty_ = false;
};

}  // namespace foldline::ui
