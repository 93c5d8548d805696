#pragma once
// FNV-1a, 64-bit (Fowler, Noll & Vo): a stable hash of a name, used to seed each finding's
// resampling from its label so the draws do not depend on the order of the findings.
#include <cstdint>
#include <string_view>

namespace foldline {

inline std::uint64_t fnv1a(std::string_view s, std::uint64_t h = 1469598103934665603ull) {
    for (unsigned char ch : s) {
        h ^= ch;
        h *= 1099511628211ull;
    }
    return h;
}

}  // namespace foldline
