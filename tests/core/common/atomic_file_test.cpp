#include "core/common/atomic_file.h"

#include <gtest/gtest.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <csignal>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>

namespace fs = std::filesystem;
using namespace foldline;

namespace {
std::string slurp(const fs::path& p) {
    std::ifstream in(p);
    std::stringstream s;
    s << in.rdbuf();
    return s.str();
}
struct TempDir {
    fs::path path = fs::temp_directory_path() / ("foldline-atomic-" + std::to_string(::getpid()));
    TempDir() { fs::create_directories(path); }
    ~TempDir() {
        std::error_code ec;
        fs::permissions(path, fs::perms::owner_all, ec);
        fs::remove_all(path, ec);
    }
};
std::size_t entries(const fs::path& dir) {
    return static_cast<std::size_t>(std::distance(fs::directory_iterator(dir), fs::directory_iterator()));
}
}  // namespace

TEST(AtomicFile, WritesAndReplaces) {
    TempDir d;
    auto f = (d.path / "a.foldline").string();
    ASSERT_TRUE(write_file_atomically(f, "one").ok());
    ASSERT_TRUE(write_file_atomically(f, "two").ok());
    EXPECT_EQ(slurp(f), "two");
    EXPECT_EQ(entries(d.path), 1u);  // no temporary left behind
}

TEST(AtomicFile, FailureBeforeRenameLeavesPreviousFileIntact) {
    TempDir d;
    auto f = (d.path / "a.foldline").string();
    ASSERT_TRUE(write_file_atomically(f, "previous").ok());
    set_atomic_write_fault_for_testing(true);
    auto st = write_file_atomically(f, "half-written replacement");
    set_atomic_write_fault_for_testing(false);
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(slurp(f), "previous");
    EXPECT_EQ(entries(d.path), 1u);
}

TEST(AtomicFile, ReadOnlyFolderGivesClearErrorAndKeepsFile) {
    TempDir d;
    auto f = (d.path / "a.foldline").string();
    ASSERT_TRUE(write_file_atomically(f, "previous").ok());
    fs::permissions(d.path, fs::perms::owner_read | fs::perms::owner_exec | fs::perms::group_read |
                                fs::perms::group_exec | fs::perms::others_read | fs::perms::others_exec);
    // Root ignores mode bits (Linux capabilities(7), CAP_DAC_OVERRIDE): as root, write with
    // effective user and group 65534 so the folder is read-only for the writer too.
    const bool root = ::geteuid() == 0;
    if (root && (::setegid(65534) != 0 || ::seteuid(65534) != 0)) {
        (void)!::setegid(0);
        GTEST_SKIP() << "cannot drop root privileges here, so a read-only folder cannot be made";
    }
    auto st = write_file_atomically(f, "new");
    if (root) {
        ASSERT_EQ(::seteuid(0), 0);
        ASSERT_EQ(::setegid(0), 0);
    }
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().file, f);
    EXPECT_NE(st.error().message.find("cannot create a temporary file beside it: Permission denied"), std::string::npos)
        << st.error().message;
    EXPECT_EQ(slurp(f), "previous");
    fs::permissions(d.path, fs::perms::owner_all);
    EXPECT_EQ(entries(d.path), 1u);
}

TEST(AtomicFile, ReadOnlyFilesystemGivesClearError) {
    // /proc is mounted read-only for new files even for root.
    auto st = write_file_atomically("/proc/foldline-test.foldline", "x");
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().file, "/proc/foldline-test.foldline");
    EXPECT_NE(st.error().message.find("cannot create a temporary file"), std::string::npos);
}

TEST(AtomicFile, MissingFolderNamesThePath) {
    auto st = write_file_atomically("/nonexistent-folder/x.foldline", "x");
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().file, "/nonexistent-folder/x.foldline");
    EXPECT_NE(st.error().message.find("temporary"), std::string::npos);
}

// A full disk: RLIMIT_FSIZE makes write(2) fail part-way, as ENOSPC would.
TEST(AtomicFile, FullDiskLeavesPreviousFileIntact) {
    TempDir d;
    auto f = (d.path / "a.foldline").string();
    ASSERT_TRUE(write_file_atomically(f, "previous").ok());
    pid_t pid = ::fork();
    if (pid == 0) {
        struct rlimit lim{1024, 1024};
        ::signal(SIGXFSZ, SIG_IGN);
        ::setrlimit(RLIMIT_FSIZE, &lim);
        auto st = write_file_atomically(f, std::string(1 << 20, 'x'));
        ::_exit(st.ok() ? 1 : 0);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    ASSERT_TRUE(WIFEXITED(status));
    EXPECT_EQ(WEXITSTATUS(status), 0) << "the oversized write should have failed";
    EXPECT_EQ(slurp(f), "previous");
    EXPECT_EQ(entries(d.path), 1u);
}

// A device target is written in place, never replaced: renaming over /dev/null would turn it
// into an ordinary file for every process on the machine.
TEST(AtomicFile, DeviceTargetIsWrittenInPlaceNotReplaced) {
    struct stat before {};
    ASSERT_EQ(::stat("/dev/null", &before), 0);
    ASSERT_TRUE(S_ISCHR(before.st_mode));
    ASSERT_TRUE(write_file_atomically("/dev/null", "discarded").ok());
    struct stat after {};
    ASSERT_EQ(::stat("/dev/null", &after), 0);
    EXPECT_TRUE(S_ISCHR(after.st_mode));
    EXPECT_EQ(before.st_ino, after.st_ino);
}

TEST(AtomicFile, SymbolicLinkKeepsPointingAtTheReplacedFile) {
    TempDir d;
    auto target = d.path / "real.foldline";
    auto link = d.path / "link.foldline";
    ASSERT_TRUE(write_file_atomically(target.string(), "one").ok());
    fs::create_symlink(target, link);
    ASSERT_TRUE(write_file_atomically(link.string(), "two").ok());
    EXPECT_TRUE(fs::is_symlink(link));
    EXPECT_EQ(slurp(target), "two");
}

TEST(AtomicFile, FolderTargetIsRefused) {
    TempDir d;
    auto st = write_file_atomically(d.path.string(), "x");
    ASSERT_FALSE(st.ok());
    EXPECT_NE(st.error().message.find("folder"), std::string::npos);
}
