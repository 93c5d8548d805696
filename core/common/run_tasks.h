#pragma once
// Every parallel loop of core goes through run_tasks: independent numbered tasks shared out
// over a few threads (the caller's included). Which thread runs which task varies, so callers
// keep one result slot per task index and the outcome never depends on the thread count or on
// scheduling.
#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <thread>
#include <vector>

namespace foldline {

/// The thread count a loop uses for a caller's request: `requested` itself, or the machine's
/// hardware threads when it is 0 (at least 1 when the machine does not say).
inline unsigned resolve_threads(unsigned requested) {
    if (requested != 0) return requested;
    return std::max(1u, std::thread::hardware_concurrency());
}

/// Calls task(i) once for every i in [0, count) on up to resolve_threads(threads) threads,
/// never more than `count`; the caller's thread is one of them, so with one thread (or one
/// task) every task runs on the caller's thread and no thread is started. count == 0 does
/// nothing. The first exception thrown by a task stops the hand-out of further indices and is
/// rethrown here after every thread has joined (tasks already running finish).
template <typename Task>
void run_tasks(std::size_t count, unsigned threads, Task&& task) {
    if (count == 0) return;
    const std::size_t workers = std::min<std::size_t>(resolve_threads(threads), count);
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::atomic<bool> failed{false};
    auto loop = [&] {
        try {
            for (std::size_t i; !failed.load(std::memory_order_relaxed) &&
                                (i = next.fetch_add(1, std::memory_order_relaxed)) < count;)
                task(i);
        } catch (...) {
            if (!failed.exchange(true)) failure = std::current_exception();
        }
    };
    std::vector<std::thread> pool;
    pool.reserve(workers - 1);
    try {
        for (std::size_t t = 1; t < workers; ++t) pool.emplace_back(loop);
    } catch (...) {
        // A thread that cannot be started leaves its share to the threads already running.
    }
    loop();
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
}

}  // namespace foldline
