#pragma once
// Long work (load, scan, bootstrap) reports progress and honours cancellation through these
// two plain types, so core never needs to know about Qt or threads of the caller.
#include <functional>
#include <stop_token>

namespace foldline {

/// Shared cancel flag: a thin wrapper over std::stop_source. Copies share the same state; a
/// default-constructed token has its own state and never stops until asked. Code that must act
/// the moment a stop is asked (a database driver's cancel) registers a std::stop_callback on
/// token(); the callback runs on the thread that calls request_stop, so request_stop is not
/// for signal handlers (core/common/stop_on_signal.h bridges signals to it).
class StopToken {
public:
    void request_stop() const { source_.request_stop(); }
    bool stop_requested() const { return source_.stop_requested(); }
    std::stop_token token() const { return source_.get_token(); }

private:
    mutable std::stop_source source_;
};

/// Progress callback: done and total in the caller's units (bytes, candidates, draws), plus a
/// short label of the current step. May be called from worker threads; keep it cheap.
using ProgressFn = std::function<void(double done, double total, const char* step)>;

/// Everything a long operation needs from its caller. Both members may be left empty.
struct Work {
    ProgressFn progress;
    StopToken stop;
    void report(double done, double total, const char* step) const {
        if (progress) progress(done, total, step);
    }
    bool cancelled() const { return stop.stop_requested(); }
};

}  // namespace foldline
