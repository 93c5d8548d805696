#include "core/scan/mean_stability.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstddef>
#include <limits>
#include <numeric>
#include <random>

#include "core/common/fnv1a.h"
#include "core/common/run_tasks.h"
#include "core/scan/mean_analysis.h"
#include "core/stats/bootstrap.h"

namespace foldline {

namespace {

// One observed cell: count (frequency weights rounded), mean, plug-in variance css / n.
struct CellStats {
    double n = 0, mean = 0, var = 0;
};

CellStats cell_of(const stats::GroupMean& g) {
    CellStats c;
    c.n = std::isfinite(g.n) && g.n > 0 ? std::round(g.n) : 0.0;
    if (c.n <= 0 || !std::isfinite(g.mean)) return CellStats{};
    c.mean = g.mean;
    // sd² (n − 1) / n: the variance of the cell's own values, which a row bootstrap draws from.
    c.var = c.n > 1 && std::isfinite(g.sd) ? g.sd * g.sd * (c.n - 1) / c.n : 0.0;
    return c;
}

// The group's multinomial over the strata; the sampler needs shares summing to 1.
stats::MultinomialSampler sampler_of(const std::vector<CellStats>& cells, double& total) {
    total = 0;
    for (const auto& c : cells) total += c.n;
    std::vector<double> share(cells.size(), 0.0);
    if (total > 0)
        for (std::size_t k = 0; k < cells.size(); ++k) share[k] = cells[k].n / total;
    return stats::MultinomialSampler(static_cast<std::int64_t>(total), std::move(share));
}

stats::MeanMoments redraw(const CellStats& c, double n, stats::Xoshiro256& rng) {
    if (!(n > 0)) return {};
    const double mean = c.mean + std::sqrt(c.var / n) * rng.normal();
    double css = 0;
    if (n > 1 && c.var > 0) css = c.var * std::gamma_distribution<double>((n - 1) / 2, 2.0)(rng);
    return stats::MeanMoments::from_mean(n, n, mean, css);
}

}  // namespace

double mean_class_stability(const MeanFinding& f, double alpha, int draws, std::uint64_t seed) {
    constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
    if (draws <= 0 || f.strata_table.empty()) return kNaN;
    std::vector<std::size_t> order(f.strata_table.size());
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
        return f.strata_table[a].levels < f.strata_table[b].levels;
    });
    std::vector<CellStats> focal, reference;
    for (auto k : order) {
        focal.push_back(cell_of(f.strata_table[k].focal));
        reference.push_back(cell_of(f.strata_table[k].reference));
    }
    double n1 = 0, n0 = 0;
    auto s1 = sampler_of(focal, n1);
    auto s0 = sampler_of(reference, n0);
    if (!(n1 > 0) || !(n0 > 0)) return kNaN;

    stats::Xoshiro256 rng(seed);
    const std::size_t k = order.size();
    std::vector<double> c1(k), c0(k);
    stats::MeanCells cells(k);
    int hits = 0;
    for (int b = 0; b < draws; ++b) {
        s1.draw(c1.data(), rng);
        s0.draw(c0.data(), rng);
        for (std::size_t z = 0; z < k; ++z) {
            cells[z].focal = redraw(focal[z], c1[z], rng);
            cells[z].reference = redraw(reference[z], c0[z], rng);
        }
        const ClassInputs in = mean_class_inputs(cells, alpha);
        if (classify(in, reversal_p(in), alpha) == f.cls) ++hits;
    }
    return static_cast<double>(hits) / draws;
}

bool resample_mean_findings(std::vector<MeanFinding>& findings, double alpha, int draws, std::uint64_t seed,
                            unsigned threads, const Work& work) {
    if (draws <= 0) return true;
    std::vector<std::size_t> flagged;
    for (std::size_t i = 0; i < findings.size(); ++i)
        if (findings[i].cls != FindingClass::Stable) flagged.push_back(i);
    std::atomic<std::size_t> done{0};
    const double total = static_cast<double>(flagged.size());
    run_tasks(flagged.size(), threads, [&](std::size_t i) {
        if (work.cancelled()) return;
        auto& f = findings[flagged[i]];
        const std::uint64_t s = fnv1a(f.label() + "\x1f" + f.focal, seed * 0x9E3779B97F4A7C15ull + 1);
        const double share = mean_class_stability(f, alpha, draws, s);
        if (work.cancelled()) return;
        f.stability = {share, std::isfinite(share) ? draws : 0};
        work.report(static_cast<double>(done.fetch_add(1) + 1), total, "bootstrap");
    });
    return !work.cancelled();
}

}  // namespace foldline
