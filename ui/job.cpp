#include "ui/job.h"

#include <QThread>
#include <QTimer>

namespace foldline::ui {

Job::Job(QObject* parent) : QObject(parent), timer_(new QTimer(this)) {
    timer_->setInterval(50);
    connect(timer_, &QTimer::timeout, this, &Job::poll);
}

Job::~Job() {
    if (thread_) {
        cancel();
        thread_->wait();
        delete thread_;
    }
}

bool Job::start(std::function<void(const Work&)> body) {
    if (thread_) return false;
    stop_ = StopToken{};
    Work work;
    work.stop = stop_;
    work.progress = [this](double done, double total, const char* step) {
        std::lock_guard<std::mutex> lock(mutex_);
        done_ = done;
        total_ = total;
        if (step) step_ = QString::fromUtf8(step);
        dirty_ = true;
    };
    thread_ = QThread::create([body = std::move(body), work] { body(work); });
    connect(thread_, &QThread::finished, this, [this] {
        timer_->stop();
        poll();
        thread_->deleteLater();
        thread_ = nullptr;
        emit finished();
    });
    timer_->start();
    thread_->start(QThread::LowPriority);
    return true;
}

void Job::cancel() { stop_.request_stop(); }

bool Job::wait(int ms) {
    if (!thread_) return true;
    return thread_->wait(QDeadlineTimer(ms));
}

void Job::poll() {
    double d, t;
    QString s;
    {
        std::lock_guard<std::mutex> lock(mutex_);
        if (!dirty_) return;
        dirty_ = false;
        d = done_;
        t = total_;
        s = step_;
    }
    emit progress(d, t, s);
}

}  // namespace foldline::ui
