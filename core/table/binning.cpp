#include "core/table/binning.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>
#include <unordered_map>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace foldline {

std::string format_number(double x) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.6g", x);
    return buf;
}

std::optional<Column> integer_levels(const Column& numeric, std::size_t max_levels) {
    if (!numeric.is_numeric()) return std::nullopt;
    const auto& v = numeric.values;
    double lo = INFINITY, hi = -INFINITY;
    // Blocks of values tested without branches (this pass reads every value of every numeric
    // column): below 2^51 in magnitude, adding and subtracting 1.5 * 2^52 rounds to a whole
    // number, so a value that comes back unchanged is whole. A block holding anything else is
    // tested again exactly: a round trip through an integer, up to 9e15. NaN fails every
    // comparison, so it neither moves the bounds nor fails the test.
    constexpr double kRound = 6755399441055744.0, kFast = 2251799813685248.0;
    constexpr std::size_t kBlock = 1024;
    bool present = false;
    for (std::size_t from = 0; from < v.size(); from += kBlock) {
        const std::size_t to = std::min(v.size(), from + kBlock);
        bool odd = false;
        std::size_t i = from;
#if defined(__SSE2__)
        // Two values at a time; minpd/maxpd keep their second operand when the first is NaN.
        const __m128d round = _mm_set1_pd(kRound), fast = _mm_set1_pd(kFast);
        const __m128d abs_mask = _mm_castsi128_pd(_mm_set1_epi64x(0x7FFFFFFFFFFFFFFFll));
        __m128d vlo = _mm_set1_pd(lo), vhi = _mm_set1_pd(hi), vodd = _mm_setzero_pd(), vany = _mm_setzero_pd();
        for (; i + 2 <= to; i += 2) {
            const __m128d x = _mm_loadu_pd(v.data() + i);
            const __m128d number = _mm_cmpord_pd(x, x);
            const __m128d whole = _mm_and_pd(_mm_cmplt_pd(_mm_and_pd(x, abs_mask), fast),
                                             _mm_cmpeq_pd(_mm_sub_pd(_mm_add_pd(x, round), round), x));
            vodd = _mm_or_pd(vodd, _mm_andnot_pd(whole, number));
            vany = _mm_or_pd(vany, number);
            vlo = _mm_min_pd(x, vlo);
            vhi = _mm_max_pd(x, vhi);
        }
        double l[2], h[2];
        _mm_storeu_pd(l, vlo);
        _mm_storeu_pd(h, vhi);
        lo = std::min(l[0], l[1]);
        hi = std::max(h[0], h[1]);
        odd = _mm_movemask_pd(vodd) != 0;
        present = present || _mm_movemask_pd(vany) != 0;
#endif
        for (; i < to; ++i) {
            const double x = v[i];
            const bool nan = x != x;
            const bool whole = std::fabs(x) < kFast && (x + kRound) - kRound == x;
            odd = odd || (!nan && !whole);
            lo = x < lo ? x : lo;
            hi = x > hi ? x : hi;
            present = present || !nan;
        }
        if (!odd) continue;
        for (std::size_t j = from; j < to; ++j) {
            const double x = v[j];
            if (std::isnan(x)) continue;
            if (!(std::fabs(x) <= 9e15) || static_cast<double>(static_cast<long long>(x)) != x) return std::nullopt;
        }
    }
    if (!present) return std::nullopt;
    std::vector<double> distinct;
    std::vector<std::uint32_t> codes;
    if (hi - lo < 1 << 20) {
        // Small range: direct table from value to code. Counting distinct values while marking
        // them stops a many-valued column (a score, an amount in whole units) within its first
        // rows instead of after a full pass.
        std::vector<std::uint32_t> slot(static_cast<std::size_t>(hi - lo) + 1, 0);
        std::size_t seen = 0;
        for (double x : v) {
            if (std::isnan(x)) continue;
            auto& s = slot[static_cast<std::size_t>(x - lo)];
            if (s) continue;
            s = 1;
            if (++seen > max_levels) return std::nullopt;
        }
        std::uint32_t next = 0;
        for (std::size_t i = 0; i < slot.size(); ++i) {
            if (!slot[i]) continue;
            distinct.push_back(lo + static_cast<double>(i));
            slot[i] = next++;
        }
        const std::uint32_t miss = next;
        std::vector<std::string> labels;
        for (double x : distinct) labels.push_back(format_number(x == 0 ? 0.0 : x));
        // Codes in the narrowest width straight away (no 32-bit copy to narrow afterwards).
        Column col;
        col.name = numeric.name;
        col.type = ColumnType::Categorical;
        col.levels = std::move(labels);
        auto fill = [&](auto tag) {
            using T = decltype(tag);
            std::vector<T> out(v.size());
            std::size_t missing = 0;
            for (std::size_t i = 0; i < v.size(); ++i) {
                const bool nan = std::isnan(v[i]);
                missing += nan;
                out[i] = static_cast<T>(nan ? miss : slot[static_cast<std::size_t>(v[i] - lo)]);
            }
            col.missing_count = missing;
            col.codes = std::move(out);
        };
        if (miss < 0xFFu) fill(std::uint8_t{});
        else if (miss < 0xFFFFu) fill(std::uint16_t{});
        else fill(std::uint32_t{});
        return col;
    } else {
        std::unordered_map<double, std::uint32_t> seen;
        for (double x : v) {
            if (std::isnan(x) || seen.count(x)) continue;
            if (seen.size() >= max_levels) return std::nullopt;
            seen.emplace(x, 0);
            distinct.push_back(x);
        }
        std::sort(distinct.begin(), distinct.end());
        for (std::uint32_t i = 0; i < distinct.size(); ++i) seen[distinct[i]] = i;
        const auto miss = static_cast<std::uint32_t>(distinct.size());
        codes.resize(v.size());
        for (std::size_t i = 0; i < v.size(); ++i) codes[i] = std::isnan(v[i]) ? miss : seen[v[i]];
    }
    std::vector<std::string> labels;
    for (double x : distinct) labels.push_back(format_number(x == 0 ? 0.0 : x));
    return Column::categorical(numeric.name, std::move(labels), codes);
}

std::optional<Column> quantile_bins(const Column& numeric, int bins, const std::vector<double>& weights) {
    if (!numeric.is_numeric() || bins < 2) return std::nullopt;
    const auto& v = numeric.values;
    std::vector<double> cuts;  // interior cut points, strictly increasing
    double lo = INFINITY, hi = -INFINITY;
    if (weights.empty()) {
        std::vector<double> s;
        s.reserve(v.size());
        for (double x : v)
            if (!std::isnan(x)) s.push_back(x);
        if (s.empty()) return Column::categorical(numeric.name, {}, std::vector<std::uint32_t>(v.size(), 0));
        const auto [mn, mx] = std::minmax_element(s.begin(), s.end());
        lo = *mn;
        hi = *mx;
        // Successive nth_element calls on the shrinking right part: O(n) per cut.
        auto first = s.begin();
        for (int j = 1; j < bins; ++j) {
            const auto pos = static_cast<std::size_t>(
                std::floor(static_cast<double>(j) * static_cast<double>(s.size()) / bins));
            auto nth = s.begin() + static_cast<std::ptrdiff_t>(std::min(pos, s.size() - 1));
            if (nth < first) nth = first;
            std::nth_element(first, nth, s.end());
            cuts.push_back(*nth);
            first = nth;
        }
    } else {
        std::vector<std::pair<double, double>> s;
        double total = 0;
        for (std::size_t i = 0; i < v.size(); ++i)
            if (!std::isnan(v[i]) && weights[i] > 0) {
                s.emplace_back(v[i], weights[i]);
                total += weights[i];
            }
        if (s.empty()) return Column::categorical(numeric.name, {}, std::vector<std::uint32_t>(v.size(), 0));
        std::sort(s.begin(), s.end());
        lo = s.front().first;
        hi = s.back().first;
        double acc = 0;
        int j = 1;
        for (const auto& [x, w] : s) {
            // The value at weighted position j * total / bins (0-based: first value whose
            // cumulative weight exceeds that share).
            while (j < bins && acc + w > total * j / bins) {
                cuts.push_back(x);
                ++j;
            }
            acc += w;
        }
    }
    std::sort(cuts.begin(), cuts.end());
    cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());
    cuts.erase(std::remove_if(cuts.begin(), cuts.end(), [&](double c) { return c <= lo || c > hi; }),
               cuts.end());
    std::vector<double> edges{lo};
    edges.insert(edges.end(), cuts.begin(), cuts.end());
    edges.push_back(hi);
    const std::size_t nb = edges.size() - 1;
    std::vector<std::string> labels;
    auto range = [](double a, double b, bool closed) {
        std::string l(1, '[');
        l.append(format_number(a)).append(", ").append(format_number(b)).push_back(closed ? ']' : ')');
        return l;
    };
    if (lo == hi) {
        labels.push_back(range(lo, hi, true));
    } else {
        for (std::size_t b = 0; b < nb; ++b) labels.push_back(range(edges[b], edges[b + 1], b + 1 == nb));
    }
    const auto miss = static_cast<std::uint32_t>(labels.size());
    std::vector<std::uint32_t> codes(v.size());
    for (std::size_t i = 0; i < v.size(); ++i) {
        const double x = v[i];
        if (std::isnan(x)) {
            codes[i] = miss;
            continue;
        }
        codes[i] = static_cast<std::uint32_t>(std::upper_bound(cuts.begin(), cuts.end(), x) - cuts.begin());
    }
    return Column::categorical(numeric.name, std::move(labels), codes);
}

}  // namespace foldline
