#include "core/common/atomic_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <vector>

namespace foldline {
namespace {

std::atomic<bool> g_fail_before_rename{false};

std::string folder_of(const std::string& path) {
    auto slash = path.find_last_of('/');
    if (slash == std::string::npos) return ".";
    if (slash == 0) return "/";
    return path.substr(0, slash);
}

Error sys_error(const std::string& path, const char* what, int err) {
    return make_error(std::string(what) + ": " + std::strerror(err), path);
}

}  // namespace

void set_atomic_write_fault_for_testing(bool fail_before_rename) {
    g_fail_before_rename = fail_before_rename;
}

// A target that is not a regular file (/dev/null, /dev/stdout, a named pipe) cannot be replaced
// by a rename without destroying it: write to it in place instead.
Status write_in_place(const std::string& path, std::string_view bytes) {
    int fd = ::open(path.c_str(), O_WRONLY | O_CLOEXEC);
    if (fd < 0) return sys_error(path, "cannot open for writing", errno);
    std::size_t off = 0;
    while (off < bytes.size()) {
        ssize_t n = ::write(fd, bytes.data() + off, bytes.size() - off);
        if (n < 0) {
            if (errno == EINTR) continue;
            int err = errno;
            ::close(fd);
            return sys_error(path, "cannot write", err);
        }
        off += static_cast<std::size_t>(n);
    }
    ::close(fd);
    return Ok{};
}

Status write_file_atomically(const std::string& requested, std::string_view bytes) {
    std::string path = requested;
    struct stat st {};
    if (::stat(requested.c_str(), &st) == 0) {
        if (S_ISDIR(st.st_mode)) return make_error("is a folder, not a file", requested);
        if (!S_ISREG(st.st_mode)) return write_in_place(requested, bytes);
        // Replace what a symbolic link points to, not the link itself.
        if (char* real = ::realpath(requested.c_str(), nullptr)) {
            path = real;
            std::free(real);
        }
    }
    std::string tmpl = path + ".tmp-XXXXXX";
    std::vector<char> name(tmpl.begin(), tmpl.end());
    name.push_back('\0');
    int fd = ::mkstemp(name.data());
    if (fd < 0) return sys_error(requested, "cannot create a temporary file beside it", errno);
    const std::string tmp(name.data());
    auto abandon = [&](const char* what, int err) {
        ::close(fd);
        ::unlink(tmp.c_str());
        return Status(sys_error(requested, what, err));
    };
    std::size_t off = 0;
    while (off < bytes.size()) {
        ssize_t n = ::write(fd, bytes.data() + off, bytes.size() - off);
        if (n < 0) {
            if (errno == EINTR) continue;
            return abandon("cannot write", errno);
        }
        off += static_cast<std::size_t>(n);
    }
    if (::fsync(fd) != 0) return abandon("cannot flush to disk", errno);
    ::fchmod(fd, 0644);
    if (::close(fd) != 0) {
        int err = errno;
        ::unlink(tmp.c_str());
        return sys_error(requested, "cannot close", err);
    }
    if (g_fail_before_rename) {
        ::unlink(tmp.c_str());
        return make_error("simulated failure before rename", requested);
    }
    if (::rename(tmp.c_str(), path.c_str()) != 0) {
        int err = errno;
        ::unlink(tmp.c_str());
        return sys_error(requested, "cannot replace", err);
    }
    // Make the rename itself durable.
    int dfd = ::open(folder_of(path).c_str(), O_RDONLY | O_DIRECTORY);
    if (dfd >= 0) {
        ::fsync(dfd);
        ::close(dfd);
    }
    return Ok{};
}

}  // namespace foldline
