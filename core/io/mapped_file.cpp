#include "core/io/mapped_file.h"

#include "core/io/mapping_guard.h"

#include <cerrno>
#include <cstring>
#include <utility>

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

namespace foldline {

Result<MappedFile> MappedFile::open(const std::string& path) {
    const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) return make_error(std::string("cannot open for reading: ") + std::strerror(errno), path);
    struct stat st {};
    if (::fstat(fd, &st) != 0) {
        const int e = errno;
        ::close(fd);
        return make_error(std::string("cannot read file status: ") + std::strerror(e), path);
    }
    if (S_ISDIR(st.st_mode)) {
        ::close(fd);
        return make_error("is a directory, expected a CSV file", path);
    }
    if (!S_ISREG(st.st_mode)) {
        ::close(fd);
        return make_error("is not a regular file, expected a CSV file", path);
    }
    MappedFile f;
    f.size_ = static_cast<std::size_t>(st.st_size);
    if (f.size_ > 0) {
        void* p = ::mmap(nullptr, f.size_, PROT_READ, MAP_PRIVATE, fd, 0);
        if (p == MAP_FAILED) {
            const int e = errno;
            ::close(fd);
            return make_error(std::string("cannot map file into memory: ") + std::strerror(e), path);
        }
        ::madvise(p, f.size_, MADV_SEQUENTIAL);
        f.data_ = static_cast<const char*>(p);
        guard_mapping(p, f.size_);
    }
    f.fd_ = fd;  // kept to notice a change after reading
    f.mtime_ns_ = static_cast<long long>(st.st_mtim.tv_sec) * 1000000000LL + st.st_mtim.tv_nsec;
    return f;
}

MappedFile::MappedFile(MappedFile&& other) noexcept
    : data_(std::exchange(other.data_, nullptr)), size_(std::exchange(other.size_, 0)),
      fd_(std::exchange(other.fd_, -1)), mtime_ns_(other.mtime_ns_) {}

MappedFile& MappedFile::operator=(MappedFile&& other) noexcept {
    if (this != &other) {
        if (data_) {
            unguard_mapping(data_);
            ::munmap(const_cast<char*>(data_), size_);
        }
        if (fd_ >= 0) ::close(fd_);
        data_ = std::exchange(other.data_, nullptr);
        size_ = std::exchange(other.size_, 0);
        fd_ = std::exchange(other.fd_, -1);
        mtime_ns_ = other.mtime_ns_;
    }
    return *this;
}

MappedFile::~MappedFile() {
    if (data_) {
        unguard_mapping(data_);
        ::munmap(const_cast<char*>(data_), size_);
    }
    if (fd_ >= 0) ::close(fd_);
}

bool MappedFile::changed_since_open() const {
    if (data_ && mapping_faulted(data_)) return true;
    if (fd_ < 0) return false;
    struct stat st {};
    if (::fstat(fd_, &st) != 0) return true;
    const long long mtime = static_cast<long long>(st.st_mtim.tv_sec) * 1000000000LL + st.st_mtim.tv_nsec;
    return static_cast<std::size_t>(st.st_size) != size_ || mtime != mtime_ns_;
}

void MappedFile::release(std::size_t begin, std::size_t end) const {
    if (!data_ || end > size_ || begin >= end) return;
    static const std::size_t page = static_cast<std::size_t>(::sysconf(_SC_PAGESIZE));
    const std::size_t b = (begin + page - 1) / page * page;  // whole pages only
    const std::size_t e = end == size_ ? size_ : end / page * page;
    if (b >= e) return;
    ::madvise(const_cast<char*>(data_) + b, e - b, MADV_DONTNEED);
}

}  // namespace foldline
