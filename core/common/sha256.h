#pragma once
// SHA-256 (FIPS 180-4) of files and byte strings: projects and memos record the data's digest so
// a re-run can tell whether the extract changed.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "core/common/error.h"

namespace foldline {

class Sha256 {
public:
    Sha256();
    void update(const void* data, std::size_t size);
    /// Lower-case hex digest; the object must not be updated afterwards.
    std::string hex_digest();

private:
    void block(const std::uint8_t* p);
    std::uint32_t h_[8];
    std::uint8_t buf_[64];
    std::size_t buf_len_ = 0;
    std::uint64_t total_ = 0;
};

/// Hex SHA-256 of a byte string ("" → e3b0c442...b855).
std::string sha256_hex(std::string_view bytes);
/// Hex SHA-256 of a file's contents, read in blocks; an Error names the file if it cannot be read.
Result<std::string> sha256_file(const std::string& path);

}  // namespace foldline
