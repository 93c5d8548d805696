// Tests of the stop token (core/common/progress.h) and of signals as stop requests
// (core/common/stop_on_signal.h).
#include "core/common/stop_on_signal.h"

#include <gtest/gtest.h>

#include <signal.h>

#include <atomic>
#include <chrono>
#include <stop_token>
#include <thread>

namespace foldline {
namespace {

bool stops_within(const StopToken& t, std::chrono::milliseconds limit) {
    const auto end = std::chrono::steady_clock::now() + limit;
    while (!t.stop_requested()) {
        if (std::chrono::steady_clock::now() > end) return false;
        std::this_thread::sleep_for(std::chrono::milliseconds(1));
    }
    return true;
}

TEST(StopToken, CopiesShareTheRequestAndCallbacksRunOnce) {
    Work work;
    EXPECT_FALSE(work.cancelled());
    const Work copy = work;
    int calls = 0;
    {
        std::stop_callback cb(copy.stop.token(), [&] { ++calls; });
        EXPECT_EQ(calls, 0);
        work.stop.request_stop();
        work.stop.request_stop();
        EXPECT_EQ(calls, 1);
    }
    EXPECT_TRUE(copy.cancelled());
    // A callback registered after the request runs at once, on the registering thread.
    std::stop_callback late(copy.stop.token(), [&] { ++calls; });
    EXPECT_EQ(calls, 2);
    // A fresh token is not stopped.
    EXPECT_FALSE(StopToken{}.stop_requested());
}

std::atomic<int> g_previous_calls{0};
extern "C" void previous_handler(int) { g_previous_calls.fetch_add(1); }

TEST(StopOnSignal, SignalsAskTheStopWhileAliveAndThePreviousHandlerComesBack) {
    struct sigaction mine {}, saved {};
    mine.sa_handler = previous_handler;
    sigemptyset(&mine.sa_mask);
    ASSERT_EQ(::sigaction(SIGINT, &mine, &saved), 0);
    ASSERT_EQ(::sigaction(SIGTERM, &mine, nullptr), 0);

    for (int sig : {SIGINT, SIGTERM}) {
        StopToken stop;
        int callbacks = 0;
        std::stop_callback cb(stop.token(), [&] { ++callbacks; });
        {
            StopOnSignal on_signal(stop);
            ASSERT_TRUE(on_signal.active());
            StopOnSignal second(stop);  // one instance at a time
            EXPECT_FALSE(second.active());
            ::raise(sig);
            EXPECT_TRUE(stops_within(stop, std::chrono::seconds(10))) << sig;
            ::raise(sig);  // a second signal is harmless
        }
        EXPECT_EQ(callbacks, 1);
        EXPECT_EQ(g_previous_calls.load(), 0);
    }
    // Gone: the previous handler is back.
    ::raise(SIGINT);
    EXPECT_EQ(g_previous_calls.load(), 1);
    ::sigaction(SIGINT, &saved, nullptr);
    ::signal(SIGTERM, SIG_DFL);
}

}  // namespace
}  // namespace foldline
