#include "core/common/sha256.h"

#include <openssl/evp.h>

#include <cerrno>
#include <cstring>
#include <fstream>
#include <vector>

namespace foldline {
namespace {

/// SHA-256 from libcrypto's default providers, fetched once per process (never freed: it
/// stays valid for every later digest).
const EVP_MD* sha256_md() {
    static EVP_MD* const md = EVP_MD_fetch(nullptr, "SHA256", nullptr);
    return md;
}

}  // namespace

Sha256::Sha256() : ctx_(EVP_MD_CTX_new()) {
    ok_ = ctx_ && sha256_md() && EVP_DigestInit_ex(ctx_, sha256_md(), nullptr) == 1;
}

Sha256::~Sha256() { EVP_MD_CTX_free(ctx_); }

void Sha256::update(const void* data, std::size_t size) {
    if (ok_ && size > 0) ok_ = EVP_DigestUpdate(ctx_, data, size) == 1;
}

std::string Sha256::hex_digest() {
    unsigned char digest[EVP_MAX_MD_SIZE];
    unsigned int len = 0;
    if (!ok_ || EVP_DigestFinal_ex(ctx_, digest, &len) != 1 || len != 32) {
        ok_ = false;
        return {};
    }
    static const char* hex = "0123456789abcdef";
    std::string out;
    out.reserve(2 * len);
    for (unsigned int i = 0; i < len; ++i) {
        out += hex[digest[i] >> 4];
        out += hex[digest[i] & 0xF];
    }
    return out;
}

std::string sha256_hex(std::string_view bytes) {
    Sha256 h;
    h.update(bytes.data(), bytes.size());
    return h.hex_digest();
}

Result<std::string> sha256_file(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) return make_error(std::string("cannot open for reading: ") + std::strerror(errno), path);
    Sha256 h;
    std::vector<char> buf(std::size_t{1} << 20);
    while (in) {
        in.read(buf.data(), static_cast<std::streamsize>(buf.size()));
        if (in.gcount() > 0) h.update(buf.data(), static_cast<std::size_t>(in.gcount()));
    }
    if (in.bad()) return make_error("read error while hashing", path);
    std::string digest = h.hex_digest();
    if (!h.ok()) return make_error("cannot compute SHA-256 (OpenSSL's libcrypto has no usable SHA-256)", path);
    return digest;
}

}  // namespace foldline
