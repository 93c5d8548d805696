#include "core/common/sha256.h"

#include <gtest/gtest.h>

#include <utility>
#include <vector>
#include <filesystem>
#include <fstream>
#include <string>
#include <unistd.h>

using foldline::sha256_hex;

// Expected digests: FIPS 180-2, Appendix B (examples B.1, B.2, B.3) [src].
TEST(Sha256, Fips180Examples) {
    EXPECT_EQ(sha256_hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    EXPECT_EQ(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
              "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    EXPECT_EQ(sha256_hex(std::string(1000000, 'a')),
              "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

// Digest of the empty string: as printed by `sha256sum /dev/null` (GNU coreutils) [calc].
TEST(Sha256, EmptyInput) {
    EXPECT_EQ(sha256_hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

TEST(Sha256, MissingFileIsAnErrorNamingIt) {
    auto r = foldline::sha256_file("/nonexistent/foldline.csv");
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().file, "/nonexistent/foldline.csv");
}

// Files read in more than one 1 MiB block, and one of exactly one block: bytes
// (31 i + 7) mod 251 for i = 0 .. n - 1. Expected digests computed with Python's hashlib and
// GNU coreutils' sha256sum on the same bytes [calc].
TEST(Sha256, FilesLargerThanOneReadBlock) {
    const auto dir = std::filesystem::temp_directory_path();
    for (const auto& [n, want] : std::vector<std::pair<std::size_t, std::string>>{
             {std::size_t{1} << 20, "1c59b8670027384143781a8a8bff2f3b44bd8818d0f53b13b064c2375a1afe38"},
             {(std::size_t{5} << 19) + 123, "0cdd2722ed238f465f4fc20d1e829e855285185b7315fcde1cd911ef9a28d739"}}) {
        std::string bytes(n, '\0');
        for (std::size_t i = 0; i < n; ++i) bytes[i] = static_cast<char>((i * 31 + 7) % 251);
        const auto path = dir / ("foldline-sha256-" + std::to_string(::getpid()) + "-" + std::to_string(n) + ".bin");
        {
            std::ofstream out(path, std::ios::binary);
            out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
            ASSERT_TRUE(out.good());
        }
        auto r = foldline::sha256_file(path.string());
        std::filesystem::remove(path);
        ASSERT_TRUE(r.ok()) << r.error().to_string();
        EXPECT_EQ(*r, want) << n << " bytes";
        EXPECT_EQ(sha256_hex(bytes), want) << n << " bytes in memory";
    }
}

// The incremental interface: any split of the input gives the digest of the whole
// (FIPS 180-2, Appendix B.2, fed in uneven pieces) [src].
TEST(Sha256, UpdatesInPiecesGiveTheDigestOfTheWhole) {
    const std::string msg = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";
    for (std::size_t cut : {std::size_t{0}, std::size_t{1}, std::size_t{55}, msg.size()}) {
        foldline::Sha256 h;
        h.update(msg.data(), cut);
        h.update(msg.data() + cut, msg.size() - cut);
        EXPECT_EQ(h.hex_digest(), "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    }
}
