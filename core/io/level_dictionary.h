#pragma once
// A chunk's dictionary of categorical levels: an open-addressing hash map from the level's
// text to its code, codes given in order of first appearance. Keys are views, so interning a
// cell allocates nothing; text that does not outlive the dictionary is copied once, when new.
// Texts of up to 16 bytes are compared as two machine words held in the slot itself.
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <deque>
#include <string>
#include <string_view>
#include <vector>

namespace foldline {

class LevelDictionary {
public:
    LevelDictionary();

    /// Code of `text`, adding it as level size() when unseen (empty text is a level like any
    /// other). When `stable` is false the text is copied on insertion; otherwise the caller
    /// keeps it alive as long as the dictionary.
    std::uint32_t intern(std::string_view text, bool stable = true);

    /// Same as intern(text, true), for text followed by at least 16 readable bytes (the caller
    /// guarantees it): the key is then read in two unconditional loads. Inline: it runs per cell.
    std::uint32_t intern_padded(std::string_view text) {
        const char* p = text.data();
        const std::size_t n = text.size();
        std::uint64_t a, b;
        std::memcpy(&a, p, 8);
        std::memcpy(&b, p + 8, 8);
        a &= byte_mask(n < 8 ? n : 8);
        b &= byte_mask(n < 8 ? 0 : (n < 16 ? n - 8 : 8));
        const std::uint64_t h = slot_hash(a, b, n > 16 ? long_tail(p, n) : 0, n);
        std::uint64_t i = h & mask_;
        for (;; i = (i + 1) & mask_) {
            const Slot& s = slots_[i];
            if (!s.code1) break;
            if (s.hash == h && s.size == n && s.a == a && s.b == b &&
                (n <= 16 || std::memcmp(levels_[s.code1 - 1].data(), p, n) == 0))
                return s.code1 - 1;
        }
        return insert(i, text, true, a, b, h);
    }

    /// Number of levels; 0 for a new dictionary.
    std::size_t size() const { return levels_.size(); }
    /// Levels in order of first appearance.
    const std::vector<std::string_view>& levels() const { return levels_; }

private:
    struct Slot {
        std::uint64_t a = 0, b = 0;  ///< the text's first 16 bytes, zero-padded
        std::uint32_t size = 0;
        std::uint32_t code1 = 0;  ///< code + 1; 0 = empty slot
        std::uint64_t hash = 0;
    };
    static std::uint64_t byte_mask(std::size_t k) { return k >= 8 ? ~0ull : (1ull << (8 * k)) - 1; }
    static std::uint64_t mix(std::uint64_t a, std::uint64_t b) {
        __extension__ typedef unsigned __int128 u128;
        const u128 r = static_cast<u128>(a) * b;
        return static_cast<std::uint64_t>(r) ^ static_cast<std::uint64_t>(r >> 64);
    }
    /// The key of a text: its first 16 bytes as two zero-padded words (with the length, exact for
    /// texts of up to 16 bytes) and, for longer texts, a digest of the rest mixed into the hash
    /// (equal words then do not prove equal texts, so those are compared in full).
    static std::uint64_t slot_hash(std::uint64_t a, std::uint64_t b, std::uint64_t tail, std::size_t n) {
        return mix(a ^ 0xE7037ED1A0B428DBull ^ tail, b ^ (0x8EBC6AF09C88C6E3ull + n));
    }
    static std::uint64_t long_tail(const char* p, std::size_t n);
    void grow();
    std::uint32_t insert(std::uint64_t slot, std::string_view text, bool stable, std::uint64_t a, std::uint64_t b,
                         std::uint64_t h);

    std::vector<std::string_view> levels_;
    std::vector<Slot> slots_;
    std::uint64_t mask_ = 0;
    std::deque<std::string> owned_;
};

}  // namespace foldline
