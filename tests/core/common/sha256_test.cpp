#include "core/common/sha256.h"

#include <gtest/gtest.h>

#include <string>

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
