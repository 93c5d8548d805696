#include "core/io/mapping_guard.h"

#include <atomic>
#include <csignal>
#include <cstdint>
#include <mutex>

#include <sys/mman.h>
#include <unistd.h>

namespace foldline {
namespace {

constexpr int kSlots = 64;

// Lock-free table read by the signal handler; a slot is live while base != 0.
std::atomic<std::uintptr_t> g_base[kSlots];
std::atomic<std::size_t> g_length[kSlots];
std::atomic<bool> g_faulted[kSlots];
std::mutex g_slots_mutex;  // serialises guard/unguard (never taken by the handler)
struct sigaction g_previous {};
std::once_flag g_install_once;

void forward_to_previous(int sig, siginfo_t* info, void* context) {
    if (g_previous.sa_flags & SA_SIGINFO) {
        if (g_previous.sa_sigaction) {
            g_previous.sa_sigaction(sig, info, context);
            return;
        }
    } else if (g_previous.sa_handler != SIG_DFL && g_previous.sa_handler != SIG_IGN) {
        g_previous.sa_handler(sig);
        return;
    }
    // Default action: restore it and return; the faulting access repeats and ends the process.
    struct sigaction dfl {};
    dfl.sa_handler = SIG_DFL;
    sigemptyset(&dfl.sa_mask);
    ::sigaction(SIGBUS, &dfl, nullptr);
}

void on_sigbus(int sig, siginfo_t* info, void* context) {
    const auto addr = reinterpret_cast<std::uintptr_t>(info ? info->si_addr : nullptr);
    for (int i = 0; i < kSlots; ++i) {
        const std::uintptr_t base = g_base[i].load(std::memory_order_acquire);
        if (base == 0) continue;
        const std::size_t length = g_length[i].load(std::memory_order_acquire);
        if (addr < base || addr >= base + length) continue;
        const auto page = static_cast<std::uintptr_t>(::sysconf(_SC_PAGESIZE));
        void* at = reinterpret_cast<void*>(addr / page * page);
        // mmap is a plain system call here; replacing the lost page with zeros lets the read go on.
        if (::mmap(at, page, PROT_READ, MAP_PRIVATE | MAP_ANONYMOUS | MAP_FIXED, -1, 0) == MAP_FAILED)
            break;
        g_faulted[i].store(true, std::memory_order_release);
        return;
    }
    forward_to_previous(sig, info, context);
}

void install() {
    struct sigaction sa {};
    sa.sa_sigaction = on_sigbus;
    sa.sa_flags = SA_SIGINFO | SA_ONSTACK;
    sigemptyset(&sa.sa_mask);
    ::sigaction(SIGBUS, &sa, &g_previous);
}

int find_slot(const void* base) {
    const auto b = reinterpret_cast<std::uintptr_t>(base);
    for (int i = 0; i < kSlots; ++i)
        if (b != 0 && g_base[i].load(std::memory_order_acquire) == b) return i;
    return -1;
}

}  // namespace

bool guard_mapping(const void* base, std::size_t length) {
    if (!base || length == 0) return false;
    std::call_once(g_install_once, install);
    std::lock_guard<std::mutex> lock(g_slots_mutex);
    for (int i = 0; i < kSlots; ++i) {
        if (g_base[i].load(std::memory_order_relaxed) != 0) continue;
        g_faulted[i].store(false, std::memory_order_relaxed);
        g_length[i].store(length, std::memory_order_relaxed);
        g_base[i].store(reinterpret_cast<std::uintptr_t>(base), std::memory_order_release);
        return true;
    }
    return false;
}

bool unguard_mapping(const void* base) {
    std::lock_guard<std::mutex> lock(g_slots_mutex);
    const int i = find_slot(base);
    if (i < 0) return false;
    const bool faulted = g_faulted[i].load(std::memory_order_acquire);
    g_base[i].store(0, std::memory_order_release);
    g_length[i].store(0, std::memory_order_relaxed);
    return faulted;
}

bool mapping_faulted(const void* base) {
    const int i = find_slot(base);
    return i >= 0 && g_faulted[i].load(std::memory_order_acquire);
}

}  // namespace foldline
