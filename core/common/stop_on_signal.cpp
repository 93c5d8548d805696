#include "core/common/stop_on_signal.h"

#include <fcntl.h>
#include <signal.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>

namespace foldline {
namespace {

// The pipe's write end while an instance is alive; -1 otherwise. Lock-free, so the handler
// may read it.
std::atomic<int> g_write_fd{-1};
struct sigaction g_old_int {};
struct sigaction g_old_term {};

constexpr char kSignal = 1;  // a signal arrived: ask the stop
constexpr char kQuit = 0;    // the instance is going away: the reader ends

extern "C" void write_signal_byte(int) {
    const int saved = errno;
    const int fd = g_write_fd.load();
    if (fd >= 0) {
        const char b = kSignal;
        [[maybe_unused]] const ssize_t n = ::write(fd, &b, 1);  // a full pipe already holds a request
    }
    errno = saved;
}

}  // namespace

StopOnSignal::StopOnSignal(StopToken stop) : stop_(std::move(stop)) {
    static_assert(std::atomic<int>::is_always_lock_free, "the signal handler needs a lock-free fd");
    if (g_write_fd.load() >= 0) return;  // another instance is alive
    int fds[2];
    if (::pipe2(fds, O_CLOEXEC) != 0) return;
    read_fd_ = fds[0];
    write_fd_ = fds[1];
    ::fcntl(write_fd_, F_SETFL, ::fcntl(write_fd_, F_GETFL) | O_NONBLOCK);
    reader_ = std::thread([this] {
        for (;;) {
            char b = kQuit;
            const ssize_t n = ::read(read_fd_, &b, 1);
            if (n < 0 && errno == EINTR) continue;
            if (n <= 0 || b == kQuit) return;
            stop_.request_stop();
        }
    });
    g_write_fd.store(write_fd_);
    struct sigaction sa {};
    sa.sa_handler = write_signal_byte;
    sigemptyset(&sa.sa_mask);
    sa.sa_flags = SA_RESTART;
    ::sigaction(SIGINT, &sa, &g_old_int);
    ::sigaction(SIGTERM, &sa, &g_old_term);
    active_ = true;
}

StopOnSignal::~StopOnSignal() {
    if (active_) {
        ::sigaction(SIGINT, &g_old_int, nullptr);
        ::sigaction(SIGTERM, &g_old_term, nullptr);
        g_write_fd.store(-1);
    }
    if (reader_.joinable()) {
        // Blocking write of the quit byte: the reader drains the pipe, so it cannot stay full.
        ::fcntl(write_fd_, F_SETFL, ::fcntl(write_fd_, F_GETFL) & ~O_NONBLOCK);
        const char b = kQuit;
        while (::write(write_fd_, &b, 1) < 0 && errno == EINTR) {
        }
        reader_.join();
    }
    if (read_fd_ >= 0) ::close(read_fd_);
    if (write_fd_ >= 0) ::close(write_fd_);
}

}  // namespace foldline
