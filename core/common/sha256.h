#pragma once
// SHA-256 (FIPS 180-4) of files and byte strings: projects and memos record the data's digest so
// a re-run can tell whether the extract changed. Computed by OpenSSL's libcrypto (EVP), which
// picks the machine's SHA instructions itself.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "core/common/error.h"

struct evp_md_ctx_st;  // OpenSSL's EVP_MD_CTX

namespace foldline {

class Sha256 {
public:
    Sha256();
    ~Sha256();
    Sha256(const Sha256&) = delete;
    Sha256& operator=(const Sha256&) = delete;
    void update(const void* data, std::size_t size);
    /// Lower-case hex digest; the object must not be updated afterwards. "" when ok() is false.
    std::string hex_digest();
    /// False when libcrypto could not set up or run the digest (no SHA-256 in its providers).
    bool ok() const { return ok_; }

private:
    evp_md_ctx_st* ctx_ = nullptr;
    bool ok_ = false;
};

/// Hex SHA-256 of a byte string ("" → e3b0c442...b855).
std::string sha256_hex(std::string_view bytes);
/// Hex SHA-256 of a file's contents, read in 1 MiB blocks; an Error names the file if it cannot
/// be read (or libcrypto cannot digest).
Result<std::string> sha256_file(const std::string& path);

}  // namespace foldline
