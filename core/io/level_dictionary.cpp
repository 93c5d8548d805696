#include "core/io/level_dictionary.h"

#include <cstring>

namespace foldline {

namespace {

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

constexpr std::uint64_t kByteMask[9] = {0,
                                        0xFFull,
                                        0xFFFFull,
                                        0xFFFFFFull,
                                        0xFFFFFFFFull,
                                        0xFFFFFFFFFFull,
                                        0xFFFFFFFFFFFFull,
                                        0xFFFFFFFFFFFFFFull,
                                        ~0ull};

// The key of a text: its first 16 bytes as two zero-padded words (with the length, exact for
// texts of up to 16 bytes) and, for longer texts, a digest of the rest mixed into the hash
// (equal words then do not prove equal texts, so those are compared in full).
inline std::uint64_t long_tail(const char* p, std::size_t n) {
    std::uint64_t seed = 0x243F6A8885A308D3ull;
    std::size_t i = 16;
    for (; i + 8 <= n; i += 8) seed = mix(load64(p + i) ^ 0xA0761D6478BD642Full, seed);
    return mix(load64(p + n - 8) ^ 0x8EBC6AF09C88C6E3ull, seed ^ n);
}

inline std::uint64_t slot_hash(std::uint64_t a, std::uint64_t b, std::uint64_t tail, std::size_t n) {
    return mix(a ^ 0xE7037ED1A0B428DBull ^ tail, b ^ (0x8EBC6AF09C88C6E3ull + n));
}

}  // namespace

LevelDictionary::LevelDictionary() : slots_(16), mask_(15) {}

void LevelDictionary::grow() {
    std::vector<Slot> slots(slots_.size() * 2);
    const std::uint64_t mask = slots.size() - 1;
    for (const Slot& s : slots_) {
        if (!s.code1) continue;
        std::uint64_t i = s.hash & mask;
        while (slots[i].code1) i = (i + 1) & mask;
        slots[i] = s;
    }
    slots_ = std::move(slots);
    mask_ = mask;
}

std::uint32_t LevelDictionary::find_or_add(std::string_view text, bool stable, std::uint64_t a, std::uint64_t b,
                                           std::uint64_t tail) {
    const std::size_t n = text.size();
    const std::uint64_t h = slot_hash(a, b, tail, n);
    std::uint64_t i = h & mask_;
    for (;; i = (i + 1) & mask_) {
        const Slot& s = slots_[i];
        if (!s.code1) break;
        if (s.hash == h && s.size == n && s.a == a && s.b == b &&
            (n <= 16 || std::memcmp(levels_[s.code1 - 1].data(), text.data(), n) == 0))
            return s.code1 - 1;
    }
    const auto code = static_cast<std::uint32_t>(levels_.size());
    if (!stable) {
        owned_.emplace_back(text);
        text = owned_.back();
    }
    levels_.push_back(text);
    slots_[i] = Slot{a, b, static_cast<std::uint32_t>(n), code + 1, h};
    if (levels_.size() * 2 > slots_.size()) grow();
    return code;
}

std::uint32_t LevelDictionary::intern(std::string_view text, bool stable) {
    const std::size_t n = text.size();
    char buf[16] = {};
    std::memcpy(buf, text.data(), n < 16 ? n : 16);
    const std::uint64_t tail = n > 16 ? long_tail(text.data(), n) : 0;
    return find_or_add(text, stable, load64(buf), load64(buf + 8), tail);
}

std::uint32_t LevelDictionary::intern_padded(std::string_view text) {
    const char* p = text.data();
    const std::size_t n = text.size();
    const std::size_t n0 = n < 8 ? n : 8;
    const std::size_t n1 = n < 8 ? 0 : (n < 16 ? n - 8 : 8);
    const std::uint64_t a = load64(p) & kByteMask[n0];
    const std::uint64_t b = load64(p + 8) & kByteMask[n1];
    const std::uint64_t tail = n > 16 ? long_tail(p, n) : 0;
    return find_or_add(text, true, a, b, tail);
}

}  // namespace foldline
