#pragma once
// A chunk's dictionary of categorical levels: an open-addressing hash map from the level's
// text to its code, codes given in order of first appearance. Keys are views, so interning a
// cell allocates nothing; text that does not outlive the dictionary is copied once, when new.
// Texts of up to 16 bytes are compared as two machine words held in the slot itself.
#include <cstddef>
#include <cstdint>
#include <deque>
#include <string>
#include <string_view>
#include <vector>

namespace foldline {

class LevelDictionary {
public:
    LevelDictionary();

    /// Code of `text`, adding it as level size() when unseen. When `stable` is false the text
    /// is copied on insertion; otherwise the caller keeps it alive as long as the dictionary.
    std::uint32_t intern(std::string_view text, bool stable = true);

    /// Number of levels; 0 for a new dictionary.
    std::size_t size() const { return levels_.size(); }
    /// Levels in order of first appearance.
    const std::vector<std::string_view>& levels() const { return levels_; }

private:
    struct Slot {
        std::uint64_t a = 0, b = 0;  ///< the text's words (see key_words)
        std::uint32_t size = 0;
        std::uint32_t code1 = 0;  ///< code + 1; 0 = empty slot
    };
    void grow();

    std::vector<std::string_view> levels_;
    std::vector<Slot> slots_;
    std::uint64_t mask_ = 0;
    std::deque<std::string> owned_;
};

}  // namespace foldline
