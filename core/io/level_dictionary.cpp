#include "core/io/level_dictionary.h"

namespace foldline {

namespace {

inline std::uint64_t load64(const char* p) {
    std::uint64_t v;
    std::memcpy(&v, p, 8);
    return v;
}

}  // namespace

std::uint64_t LevelDictionary::long_tail(const char* p, std::size_t n) {
    std::uint64_t seed = 0x243F6A8885A308D3ull;
    for (std::size_t i = 16; i + 8 <= n; i += 8) seed = mix(load64(p + i) ^ 0xA0761D6478BD642Full, seed);
    return mix(load64(p + n - 8) ^ 0x8EBC6AF09C88C6E3ull, seed ^ n);
}

LevelDictionary::LevelDictionary() : slots_(64), mask_(63) {}

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

std::uint32_t LevelDictionary::insert(std::uint64_t slot, std::string_view text, bool stable, std::uint64_t a,
                                      std::uint64_t b, std::uint64_t h) {
    const auto code = static_cast<std::uint32_t>(levels_.size());
    if (!stable) {
        owned_.emplace_back(text);
        text = owned_.back();
    }
    levels_.push_back(text);
    slots_[slot] = Slot{a, b, static_cast<std::uint32_t>(text.size()), code + 1, h};
    // Sparse while small (few collisions, so the per-cell probe rarely loops), denser when large.
    const std::size_t spread = slots_.size() <= 4096 ? 8 : 2;
    if (levels_.size() * spread > slots_.size()) grow();
    return code;
}

std::uint32_t LevelDictionary::intern(std::string_view text, bool stable) {
    const std::size_t n = text.size();
    char buf[16] = {};
    std::memcpy(buf, text.data(), n < 16 ? n : 16);
    const std::uint64_t a = load64(buf), b = load64(buf + 8);
    const std::uint64_t h = slot_hash(a, b, n > 16 ? long_tail(text.data(), n) : 0, n);
    std::uint64_t i = h & mask_;
    for (;; i = (i + 1) & mask_) {
        const Slot& s = slots_[i];
        if (!s.code1) break;
        if (s.hash == h && s.size == n && s.a == a && s.b == b &&
            (n <= 16 || std::memcmp(levels_[s.code1 - 1].data(), text.data(), n) == 0))
            return s.code1 - 1;
    }
    return insert(i, text, stable, a, b, h);
}

}  // namespace foldline
