// Tests of core/common/run_tasks.h: every index runs exactly once, a task's exception reaches
// the caller, one thread means the caller's thread, and 0 threads means the machine's.
#include "core/common/run_tasks.h"

#include <gtest/gtest.h>

#include <atomic>
#include <chrono>
#include <mutex>
#include <set>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

using foldline::resolve_threads;
using foldline::run_tasks;

TEST(RunTasks, EveryIndexRunsExactlyOnce) {
    for (unsigned threads : {0u, 1u, 2u, 3u, 8u, 64u}) {
        for (std::size_t count : {std::size_t{0}, std::size_t{1}, std::size_t{2}, std::size_t{7}, std::size_t{1000}}) {
            std::vector<std::atomic<int>> runs(count);
            run_tasks(count, threads, [&](std::size_t i) { runs[i].fetch_add(1); });
            for (std::size_t i = 0; i < count; ++i)
                EXPECT_EQ(runs[i].load(), 1) << "index " << i << " of " << count << " on " << threads << " threads";
        }
    }
}

TEST(RunTasks, OneThreadRunsEveryTaskOnTheCallersThreadInOrder) {
    const auto caller = std::this_thread::get_id();
    std::vector<std::size_t> order;
    bool elsewhere = false;
    run_tasks(50, 1, [&](std::size_t i) {
        elsewhere |= std::this_thread::get_id() != caller;
        order.push_back(i);  // no lock: with one thread nothing runs beside the caller
    });
    EXPECT_FALSE(elsewhere);
    ASSERT_EQ(order.size(), 50u);
    for (std::size_t i = 0; i < order.size(); ++i) EXPECT_EQ(order[i], i);

    // A single task never starts a thread, whatever the count asked for.
    bool single_elsewhere = true;
    run_tasks(1, 16, [&](std::size_t) { single_elsewhere = std::this_thread::get_id() != caller; });
    EXPECT_FALSE(single_elsewhere);
}

TEST(RunTasks, UsesAtMostTheThreadsAskedFor) {
    // Tasks wait for each other briefly so that every worker gets a share; the set of thread
    // ids can never exceed the count asked for, and always includes the caller.
    for (unsigned threads : {2u, 3u}) {
        std::mutex m;
        std::set<std::thread::id> ids;
        run_tasks(64, threads, [&](std::size_t) {
            std::this_thread::sleep_for(std::chrono::microseconds(200));
            std::lock_guard<std::mutex> lock(m);
            ids.insert(std::this_thread::get_id());
        });
        EXPECT_LE(ids.size(), threads);
        EXPECT_EQ(ids.count(std::this_thread::get_id()), 1u);
    }
}

TEST(RunTasks, AnExceptionInATaskReachesTheCaller) {
    for (unsigned threads : {1u, 2u, 4u}) {
        std::atomic<int> ran{0};
        try {
            run_tasks(100, threads, [&](std::size_t i) {
                ran.fetch_add(1);
                if (i == 10) throw std::runtime_error("task 10 failed");
            });
            ADD_FAILURE() << "no exception on " << threads << " threads";
        } catch (const std::runtime_error& e) {
            EXPECT_EQ(std::string(e.what()), "task 10 failed");
        }
        // Indices after the failure are no longer handed out (one thread stops right there).
        if (threads == 1) {
            EXPECT_EQ(ran.load(), 11);
        }
        EXPECT_LE(ran.load(), 100);
    }
}

TEST(RunTasks, OnlyTheFirstOfSeveralExceptionsIsRethrown) {
    // Every task throws: exactly one exception comes back, and it is one of theirs.
    try {
        run_tasks(20, 4, [](std::size_t i) { throw std::out_of_range("task " + std::to_string(i)); });
        ADD_FAILURE() << "no exception";
    } catch (const std::out_of_range& e) {
        EXPECT_EQ(std::string(e.what()).rfind("task ", 0), 0u);
    }
}

TEST(RunTasks, ZeroThreadsMeansTheMachinesThreads) {
    EXPECT_EQ(resolve_threads(1), 1u);
    EXPECT_EQ(resolve_threads(5), 5u);
    const unsigned hw = std::thread::hardware_concurrency();
    EXPECT_EQ(resolve_threads(0), hw == 0 ? 1u : hw);
    EXPECT_GE(resolve_threads(0), 1u);
}
