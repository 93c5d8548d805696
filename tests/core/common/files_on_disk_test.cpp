// Files on disk, across every writer that goes through core/common/atomic_file.h and the
// reader's input: an input file is opened read-only and never written (its bytes, size and
// modification time are the same after reading it); a save that fails part-way (a full disk,
// simulated with RLIMIT_FSIZE so write(2) fails as it does with ENOSPC) or into a folder that
// cannot take it gives a clear message naming the file and leaves the previous file as it was,
// with no temporary file left beside it. Covered writers: the project file (save_project), the
// diagram file (write_diagram) and the CSV exports (write_csv_exports). A read-only folder is a
// real one (mode 0555); as root, who ignores permission bits, the save runs in a child that has
// dropped to the unprivileged user 65534 first.
#include "core/causal/diagram_file.h"
#include "core/io/csv_reader.h"
#include "core/audit/project_file.h"
#include "core/report/csv_export.h"

#include <gtest/gtest.h>

#include <csignal>
#include <filesystem>
#include <fstream>
#include <functional>
#include <sstream>
#include <string>

#include <sys/resource.h>
#include <sys/stat.h>
#include <grp.h>
#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;
using namespace foldline;

namespace {

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::stringstream s;
    s << in.rdbuf();
    return s.str();
}

struct TempDir {
    fs::path path = fs::temp_directory_path() / ("foldline-disk-" + std::to_string(::getpid()));
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

// Runs `save` in a child whose files may not grow past `limit` bytes (512 unless given); returns
// whether it reported failure (true) and the failure message was non-empty and named `path`.
bool fails_on_full_disk(const std::function<Status()>& save, const std::string& path, rlim_t limit = 512) {
    int pipefd[2];
    if (::pipe(pipefd) != 0) return false;
    const pid_t pid = ::fork();
    if (pid == 0) {
        ::close(pipefd[0]);
        struct rlimit lim{limit, limit};
        ::signal(SIGXFSZ, SIG_IGN);
        ::setrlimit(RLIMIT_FSIZE, &lim);
        const Status st = save();
        const char verdict = st.ok() ? 'k' : (st.error().to_string().find(path) != std::string::npos ? 'f' : 'u');
        (void)!::write(pipefd[1], &verdict, 1);
        ::_exit(0);
    }
    ::close(pipefd[1]);
    char verdict = 0;
    (void)!::read(pipefd[0], &verdict, 1);
    ::close(pipefd[0]);
    int status = 0;
    ::waitpid(pid, &status, 0);
    return WIFEXITED(status) && verdict == 'f';
}

// What a save reported when run in a child process.
struct ChildSave {
    bool ran = false;     // false: the child could not be set up (privileges not dropped)
    bool ok = false;      // the save reported success
    std::string message;  // Error::to_string() of a failed save
};

// Runs `save` in a child that cannot create files in `dir`: the folder is made read-only (0555)
// for the call and, when the test runs as root, the child first drops to user and group 65534.
ChildSave save_in_read_only_folder(const std::function<Status()>& save, const fs::path& dir) {
    ChildSave out;
    int pipefd[2];
    if (::pipe(pipefd) != 0) return out;
    fs::permissions(dir, fs::perms::owner_read | fs::perms::owner_exec | fs::perms::group_read |
                             fs::perms::group_exec | fs::perms::others_read | fs::perms::others_exec);
    const pid_t pid = ::fork();
    if (pid == 0) {
        ::close(pipefd[0]);
        if (::geteuid() == 0 && (::setgroups(0, nullptr) != 0 || ::setgid(65534) != 0 || ::setuid(65534) != 0)) {
            (void)!::write(pipefd[1], "s", 1);
            ::_exit(0);
        }
        const Status st = save();
        const std::string reply = st.ok() ? std::string("k") : "f" + st.error().to_string();
        (void)!::write(pipefd[1], reply.data(), reply.size());
        ::_exit(0);
    }
    ::close(pipefd[1]);
    std::string reply;
    char buf[512];
    for (ssize_t n; (n = ::read(pipefd[0], buf, sizeof buf)) > 0;) reply.append(buf, static_cast<std::size_t>(n));
    ::close(pipefd[0]);
    int status = 0;
    ::waitpid(pid, &status, 0);
    fs::permissions(dir, fs::perms::owner_all | fs::perms::group_read | fs::perms::group_exec |
                             fs::perms::others_read | fs::perms::others_exec);
    if (!WIFEXITED(status) || reply.empty() || reply[0] == 's') return out;
    out.ran = true;
    out.ok = reply[0] == 'k';
    out.message = reply.substr(1);
    return out;
}

project::Project big_project(const fs::path& data) {
    project::Project p;
    p.data.path = data.string();
    p.question.outcome = "approved";
    p.question.positive = "1";
    p.question.exposure = "group";
    p.question.focal = {"B"};
    p.question.reference = "A";
    p.memo.title = "Quarterly approvals review (invented lender)";
    auto& r = p.review_for({"rate", {"product"}, "B vs A"});
    r.note = std::string(4096, 'n');  // well past the 512-byte limit of the child
    return p;
}

causal::Diagram big_diagram() {
    causal::Diagram d;
    for (int i = 0; i < 200; ++i) d.nodes.push_back({"node_" + std::to_string(i), true, double(i), double(i)});
    return d;
}

}  // namespace

TEST(FilesOnDisk, ProjectSaveOnAFullDiskKeepsThePreviousFile) {
    TempDir t;
    const std::string file = (t.path / "audit.foldline").string();
    ASSERT_TRUE(project::save_project(project::Project{}, file).ok());
    const std::string before = slurp(file);
    EXPECT_TRUE(fails_on_full_disk([&] { return project::save_project(big_project(t.path / "d.csv"), file); }, file));
    EXPECT_EQ(slurp(file), before);
    EXPECT_EQ(entries(t.path), 1u);  // no temporary file left behind
}

TEST(FilesOnDisk, DiagramSaveOnAFullDiskKeepsThePreviousFile) {
    TempDir t;
    const std::string file = (t.path / "a.diagram.json").string();
    ASSERT_TRUE(causal::write_diagram(causal::Diagram{}, file).ok());
    const std::string before = slurp(file);
    EXPECT_TRUE(fails_on_full_disk([&] { return causal::write_diagram(big_diagram(), file); }, file));
    EXPECT_EQ(slurp(file), before);
    EXPECT_EQ(entries(t.path), 1u);
}

TEST(FilesOnDisk, CsvExportIntoAMissingFolderNamesTheFile) {
    TempDir t;
    const std::string prefix = (t.path / "no_such_folder" / "audit").string();
    const Status st = report::write_csv_exports(ScanResult{}, nullptr, prefix);
    ASSERT_FALSE(st.ok());
    EXPECT_NE(st.error().to_string().find(prefix + "-findings.csv"), std::string::npos) << st.error().to_string();
}

TEST(FilesOnDisk, SavesIntoAReadOnlyFilesystemGiveClearMessages) {
    // /proc is read-only for new files whoever runs the test (root included).
    const std::string project_file = "/proc/foldline_test.foldline";
    const Status a = project::save_project(project::Project{}, project_file);
    ASSERT_FALSE(a.ok());
    EXPECT_NE(a.error().to_string().find(project_file), std::string::npos) << a.error().to_string();
    const Status b = causal::write_diagram(causal::Diagram{}, "/proc/foldline_test.diagram.json");
    ASSERT_FALSE(b.ok());
    EXPECT_FALSE(b.error().message.empty());
}

void spit(const fs::path& p, const std::string& text) { std::ofstream(p, std::ios::binary) << text; }

// A save into a read-only folder: refused with the system's reason, the file named, the
// previous file as it was and nothing left beside it.
void expect_refused_in_read_only_folder(const std::function<Status()>& save, const fs::path& dir,
                                        const std::string& file, const std::string& before) {
    const ChildSave r = save_in_read_only_folder(save, dir);
    if (!r.ran) GTEST_SKIP() << "cannot drop root privileges here, so a read-only folder cannot be made";
    EXPECT_FALSE(r.ok);
    EXPECT_NE(r.message.find(file), std::string::npos) << r.message;
    EXPECT_NE(r.message.find("cannot create a temporary file beside it: Permission denied"), std::string::npos)
        << r.message;
    EXPECT_EQ(slurp(file), before);
}

TEST(FilesOnDisk, ProjectSaveIntoAReadOnlyFolderKeepsThePreviousFile) {
    TempDir t;
    const std::string file = (t.path / "audit.foldline").string();
    ASSERT_TRUE(project::save_project(project::Project{}, file).ok());
    const std::string before = slurp(file);
    expect_refused_in_read_only_folder([&] { return project::save_project(big_project(t.path / "d.csv"), file); },
                                       t.path, file, before);
    EXPECT_EQ(entries(t.path), 1u);
}

TEST(FilesOnDisk, DiagramSaveIntoAReadOnlyFolderKeepsThePreviousFile) {
    TempDir t;
    const std::string file = (t.path / "a.diagram.json").string();
    ASSERT_TRUE(causal::write_diagram(causal::Diagram{}, file).ok());
    const std::string before = slurp(file);
    expect_refused_in_read_only_folder([&] { return causal::write_diagram(big_diagram(), file); }, t.path, file,
                                       before);
    EXPECT_EQ(entries(t.path), 1u);
}

TEST(FilesOnDisk, CsvExportOnAFullDiskKeepsThePreviousFiles) {
    TempDir t;
    const std::string prefix = (t.path / "audit").string();
    spit(prefix + "-findings.csv", "previous findings\r\n");
    spit(prefix + "-strata.csv", "previous strata\r\n");
    // 16 bytes: shorter than the findings header, so the first file already fails.
    EXPECT_TRUE(fails_on_full_disk([&] { return report::write_csv_exports(ScanResult{}, nullptr, prefix); },
                                   prefix + "-findings.csv", 16));
    EXPECT_EQ(slurp(prefix + "-findings.csv"), "previous findings\r\n");
    EXPECT_EQ(slurp(prefix + "-strata.csv"), "previous strata\r\n");
    EXPECT_EQ(entries(t.path), 2u);
}

TEST(FilesOnDisk, CsvExportIntoAReadOnlyFolderKeepsThePreviousFiles) {
    TempDir t;
    const std::string prefix = (t.path / "audit").string();
    spit(prefix + "-findings.csv", "previous findings\r\n");
    spit(prefix + "-strata.csv", "previous strata\r\n");
    expect_refused_in_read_only_folder([&] { return report::write_csv_exports(ScanResult{}, nullptr, prefix); },
                                       t.path, prefix + "-findings.csv", "previous findings\r\n");
    EXPECT_EQ(slurp(prefix + "-strata.csv"), "previous strata\r\n");
    EXPECT_EQ(entries(t.path), 2u);
}

TEST(FilesOnDisk, ReadingAnInputLeavesItUntouched) {
    TempDir t;
    const fs::path data = t.path / "input.csv";
    std::ofstream(data) << "group,approved,product\nA,1,car\nB,0,home\nA,0,home\nB,1,car\n";
    ::chmod(data.c_str(), 0444);
    struct stat before {};
    ASSERT_EQ(::stat(data.c_str(), &before), 0);
    const std::string bytes = slurp(data);
    ::usleep(20000);  // a write would move the modification time past this
    for (int i = 0; i < 3; ++i) {
        auto r = read_csv(data.string());
        ASSERT_TRUE(r.ok()) << r.error().to_string();
    }
    struct stat after {};
    ASSERT_EQ(::stat(data.c_str(), &after), 0);
    EXPECT_EQ(slurp(data), bytes);
    EXPECT_EQ(after.st_size, before.st_size);
    EXPECT_EQ(after.st_mtim.tv_sec, before.st_mtim.tv_sec);
    EXPECT_EQ(after.st_mtim.tv_nsec, before.st_mtim.tv_nsec);
    EXPECT_EQ(after.st_ctim.tv_nsec, before.st_ctim.tv_nsec);  // not even chmod-ed or renamed over
    EXPECT_EQ(after.st_ino, before.st_ino);
    EXPECT_EQ(after.st_mode & 0777, 0444u);
}
