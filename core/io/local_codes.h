#pragma once
// Per-chunk categorical codes that start one byte wide and widen only when a chunk meets more
// levels than fit, so the usual low-cardinality column costs one byte per cell while parsing.
// The largest value of the current width marks a missing cell.
#include <cstddef>
#include <cstdint>
#include <vector>

namespace foldline {

class LocalCodes {
public:
    static constexpr std::uint32_t kMissing = 0xFFFFFFFFu;

    /// Appends code (must be below the dictionary size); widens when it does not fit. A new
    /// LocalCodes is one byte wide and empty.
    [[gnu::always_inline]] void push(std::uint32_t code) {
        if (width_ == 1) {
            if (code < 0xFFu) {
                c8_.push_back(static_cast<std::uint8_t>(code));
                return;
            }
            widen();
        }
        if (width_ == 2) {
            if (code < 0xFFFFu) {
                c16_.push_back(static_cast<std::uint16_t>(code));
                return;
            }
            widen();
        }
        c32_.push_back(code);
    }
    void push_missing() {
        if (width_ == 1) c8_.push_back(0xFFu);
        else if (width_ == 2) c16_.push_back(0xFFFFu);
        else c32_.push_back(kMissing);
    }
    void reserve(std::size_t n) { c8_.reserve(n); }
    /// Number of cells; 0 when empty.
    std::size_t size() const { return width_ == 1 ? c8_.size() : width_ == 2 ? c16_.size() : c32_.size(); }
    /// Code of cell i, with a missing cell as kMissing.
    std::uint32_t at(std::size_t i) const {
        if (width_ == 1) return c8_[i] == 0xFFu ? kMissing : c8_[i];
        if (width_ == 2) return c16_[i] == 0xFFFFu ? kMissing : c16_[i];
        return c32_[i];
    }
    /// Calls f(const std::vector<uintN_t>&, missing_value) with the stored codes.
    template <typename F>
    void visit(F&& f) const {
        if (width_ == 1) f(c8_, std::uint8_t{0xFFu});
        else if (width_ == 2) f(c16_, std::uint16_t{0xFFFFu});
        else f(c32_, kMissing);
    }
    void clear() {
        *this = LocalCodes{};
    }

private:
    [[gnu::noinline]] void widen() {
        if (width_ == 1) {
            c16_.reserve(c8_.capacity());
            for (auto c : c8_) c16_.push_back(c == 0xFFu ? 0xFFFFu : c);
            c8_ = {};
            width_ = 2;
        } else {
            c32_.reserve(c16_.capacity());
            for (auto c : c16_) c32_.push_back(c == 0xFFFFu ? kMissing : c);
            c16_ = {};
            width_ = 4;
        }
    }

    int width_ = 1;
    std::vector<std::uint8_t> c8_;
    std::vector<std::uint16_t> c16_;
    std::vector<std::uint32_t> c32_;
};

}  // namespace foldline
