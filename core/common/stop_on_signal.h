#pragma once
// Ctrl-C (SIGINT) and SIGTERM as a stop request. A signal handler may only do
// async-signal-safe things, while StopToken::request_stop runs the stop callbacks (a database
// driver's cancel, which allocates and talks to the server) on the calling thread. So the
// handler only writes a byte to a pipe, and a thread of this object reads it and asks the
// stop there.
#include <thread>

#include "core/common/progress.h"

namespace foldline {

/// While alive, SIGINT and SIGTERM ask `stop` to stop instead of ending the process; the
/// previous handlers come back on destruction. One instance at a time (a second one installs
/// nothing). When the pipe cannot be made, nothing is installed and the signals keep their
/// previous handling.
class StopOnSignal {
public:
    explicit StopOnSignal(StopToken stop);
    ~StopOnSignal();
    StopOnSignal(const StopOnSignal&) = delete;
    StopOnSignal& operator=(const StopOnSignal&) = delete;
    /// True when the handlers are installed.
    bool active() const { return active_; }

private:
    StopToken stop_;
    int read_fd_ = -1;
    int write_fd_ = -1;
    bool active_ = false;
    std::thread reader_;
};

}  // namespace foldline
