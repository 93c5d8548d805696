#include "core/io/delimiter_detect.h"

#include <array>
#include <cstddef>
#include <vector>

namespace foldline {

char detect_delimiter(std::string_view text) {
    constexpr std::array<char, 4> kCandidates = {',', '\t', ';', '|'};
    constexpr std::size_t kSampleBytes = 64u << 10;
    constexpr std::size_t kSampleRecords = 50;
    const bool truncated = text.size() > kSampleBytes;
    if (truncated) text = text.substr(0, kSampleBytes);

    std::vector<std::array<std::size_t, 4>> records;
    std::array<std::size_t, 4> cur{};
    bool in_quotes = false, any = false;
    for (std::size_t i = 0; i < text.size() && records.size() < kSampleRecords; ++i) {
        const char c = text[i];
        if (c == '"') {
            in_quotes = !in_quotes;
            any = true;
        } else if (c == '\n' && !in_quotes) {
            if (any) records.push_back(cur);
            cur = {};
            any = false;
        } else if (c != '\r') {
            any = true;
            if (!in_quotes)
                for (std::size_t k = 0; k < kCandidates.size(); ++k) cur[k] += c == kCandidates[k];
        }
    }
    if (any && !truncated && records.size() < kSampleRecords) records.push_back(cur);
    if (records.empty()) return ',';

    int best = -1;
    std::size_t best_count = 0;
    for (std::size_t k = 0; k < kCandidates.size(); ++k) {
        const std::size_t n = records[0][k];
        if (n == 0) continue;
        bool consistent = true;
        for (const auto& r : records) consistent = consistent && r[k] == n;
        if (consistent && n > best_count) {
            best = static_cast<int>(k);
            best_count = n;
        }
    }
    if (best >= 0) return kCandidates[static_cast<std::size_t>(best)];
    for (std::size_t k = 0; k < kCandidates.size(); ++k) {
        if (records[0][k] > best_count) {
            best = static_cast<int>(k);
            best_count = records[0][k];
        }
    }
    return best >= 0 ? kCandidates[static_cast<std::size_t>(best)] : ',';
}

}  // namespace foldline
