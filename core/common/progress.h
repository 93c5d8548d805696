#pragma once
// Long work (load, scan, bootstrap) reports progress and honours cancellation through these
// two plain types, so core never needs to know about Qt or threads of the caller.
#include <atomic>
#include <functional>
#include <memory>

namespace foldline {

/// Shared cancel flag. Copies share the same flag. A default-constructed token never stops.
class StopToken {
public:
    StopToken() : flag_(std::make_shared<std::atomic<bool>>(false)) {}
    void request_stop() const { flag_->store(true, std::memory_order_relaxed); }
    bool stop_requested() const { return flag_->load(std::memory_order_relaxed); }

private:
    std::shared_ptr<std::atomic<bool>> flag_;
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
