#pragma once
// A read-only view of a whole file, memory-mapped so large inputs are never copied.
#include <cstddef>
#include <string>
#include <string_view>

#include "core/common/error.h"

namespace foldline {

class MappedFile {
public:
    /// Maps `path` read-only. An empty file gives an empty view (no mapping); a missing file,
    /// a directory or an unreadable file gives an Error naming the path.
    static Result<MappedFile> open(const std::string& path);

    MappedFile() = default;
    MappedFile(MappedFile&& other) noexcept;
    MappedFile& operator=(MappedFile&& other) noexcept;
    MappedFile(const MappedFile&) = delete;
    MappedFile& operator=(const MappedFile&) = delete;
    ~MappedFile();

    /// The file's bytes; empty for an empty file.
    std::string_view bytes() const { return {data_, size_}; }

    /// Drops the whole pages inside [begin, end) from this process's resident memory; they are
    /// read back from the page cache if touched again. No effect for an empty or sub-page range.
    void release(std::size_t begin, std::size_t end) const;

    /// Whether the file changed since it was mapped: it shrank under the mapping (the lost pages
    /// read as zeros instead of raising SIGBUS, see mapping_guard.h), or its size or modification
    /// time differ now. False for an empty file that is still empty.
    bool changed_since_open() const;

private:
    const char* data_ = nullptr;
    std::size_t size_ = 0;
    int fd_ = -1;               ///< kept open to compare the file's status after reading
    long long mtime_ns_ = 0;
};

}  // namespace foldline
