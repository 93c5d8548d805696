#include "core/io/level_dictionary.h"

#include <cstring>

namespace foldline {

namespace {

inline std::uint64_t load32(const char* p) {
    std::uint32_t v;
    std::memcpy(&v, p, 4);
    return v;
}
inline std::uint64_t load64(const char* p) {
    std::uint64_t v;
    std::memcpy(&v, p, 8);
    return v;
}

__extension__ typedef unsigned __int128 u128;

inline std::uint64_t mix(std::uint64_t a, std::uint64_t b) {
    const u128 r = static_cast<u128>(a) * b;
    return static_cast<std::uint64_t>(r) ^ static_cast<std::uint64_t>(r >> 64);
}

// Two words that, together with the length, identify a text of up to 16 bytes exactly (every
// byte is read by some load, and loads never leave the text). Longer texts also get a digest
// of the rest, but then equal words do not prove equal texts.
inline void key_words(const char* p, std::size_t n, std::uint64_t& a, std::uint64_t& b) {
    if (n <= 3) {
        a = n == 0 ? 0
                   : (static_cast<std::uint64_t>(static_cast<unsigned char>(p[0])) << 16) |
                         (static_cast<std::uint64_t>(static_cast<unsigned char>(p[n >> 1])) << 8) |
                         static_cast<unsigned char>(p[n - 1]);
        b = 0;
    } else if (n <= 8) {
        a = load32(p) | (load32(p + n - 4) << 32);
        b = 0;
    } else if (n <= 16) {
        a = load64(p);
        b = load64(p + n - 8);
    } else {
        std::uint64_t seed = 0x243F6A8885A308D3ull;
        for (std::size_t i = 0; i + 16 < n; i += 16)
            seed = mix(load64(p + i) ^ 0xA0761D6478BD642Full, load64(p + i + 8) ^ seed);
        a = load64(p + n - 16) ^ seed;
        b = load64(p + n - 8);
    }
}

inline std::uint64_t slot_hash(std::uint64_t a, std::uint64_t b, std::size_t n) {
    return mix(a ^ 0xE7037ED1A0B428DBull, b ^ (0x8EBC6AF09C88C6E3ull + n));
}

}  // namespace

LevelDictionary::LevelDictionary() : slots_(16), mask_(15) {}

void LevelDictionary::grow() {
    std::vector<Slot> slots(slots_.size() * 2);
    const std::uint64_t mask = slots.size() - 1;
    for (const Slot& s : slots_) {
        if (!s.code1) continue;
        std::uint64_t i = slot_hash(s.a, s.b, s.size) & mask;
        while (slots[i].code1) i = (i + 1) & mask;
        slots[i] = s;
    }
    slots_ = std::move(slots);
    mask_ = mask;
}

std::uint32_t LevelDictionary::intern(std::string_view text, bool stable) {
    const std::size_t n = text.size();
    std::uint64_t a, b;
    key_words(text.data(), n, a, b);
    std::uint64_t i = slot_hash(a, b, n) & mask_;
    for (;; i = (i + 1) & mask_) {
        const Slot& s = slots_[i];
        if (!s.code1) break;
        if (s.size == n && s.a == a && s.b == b &&
            (n <= 16 || std::memcmp(levels_[s.code1 - 1].data(), text.data(), n) == 0))
            return s.code1 - 1;
    }
    const auto code = static_cast<std::uint32_t>(levels_.size());
    if (!stable) {
        owned_.emplace_back(text);
        text = owned_.back();
    }
    levels_.push_back(text);
    slots_[i] = Slot{a, b, static_cast<std::uint32_t>(n), code + 1};
    if (levels_.size() * 2 > slots_.size()) grow();
    return code;
}

}  // namespace foldline
