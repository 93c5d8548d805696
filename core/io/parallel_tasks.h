#pragma once
// Runs independent numbered tasks on a few threads. Which thread runs which task varies;
// callers keep results per task index so the outcome never depends on scheduling.
#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <thread>
#include <vector>

namespace foldline {

/// Calls task(i) once for every i in [0, count) using up to `threads` threads (the caller's
/// included). count == 0 does nothing; threads == 0 counts as 1. An exception thrown by a task
/// is rethrown here after all threads have joined.
template <typename Task>
void run_tasks(std::size_t count, unsigned threads, Task&& task) {
    if (count == 0) return;
    const std::size_t workers = std::min<std::size_t>(std::max(1u, threads), count);
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
    for (std::size_t t = 1; t < workers; ++t) pool.emplace_back(loop);
    loop();
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
}

}  // namespace foldline
