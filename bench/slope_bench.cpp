// Benchmark of the slope scan (never run by ctest).
//
//   slope_bench [--rows N] [--runs R] [--no-pairs]
//       generates N rows in process (seeded): x, y with a slope reversal by `segment`, and 12
//       categorical candidates with 2..24 levels and about 0.1% empty cells; times scan_slopes
//       over the 12 candidates and (unless --no-pairs) their 66 pairs, R runs, prints the median.
//   slope_bench --csv FILE --x COL --y COL [--runs R] [--no-pairs]
//       loads a CSV with the project's reader and scans the candidates select_candidates picks
//       (categorical columns and integer columns with 2..50 values; other numeric columns are
//       left out, as the peer does), skipping approved and applicant_group — for a side-by-side
//       run with the pandas peer in ../shared/bench/ (see slope_vs_peer.sh).
// Output: one line per measurement, `slope_bench key=value ...`.
#include "core/scan/slope_scan.h"

#include "core/io/csv_reader.h"
#include "core/scan/candidates.h"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <random>
#include <sys/resource.h>
#include <string>

using namespace foldline;

namespace {

// Process CPU time (user + system): on a shared machine the wall time also counts waiting.
double cpu_seconds() {
    rusage u{};
    getrusage(RUSAGE_SELF, &u);
    return static_cast<double>(u.ru_utime.tv_sec + u.ru_stime.tv_sec) +
           1e-6 * static_cast<double>(u.ru_utime.tv_usec + u.ru_stime.tv_usec);
}

double median(std::vector<double> v) {
    std::sort(v.begin(), v.end());
    return v[v.size() / 2];
}

double seconds_since(std::chrono::steady_clock::time_point t0) {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

Table generate(std::size_t rows) {
    std::mt19937_64 rng(42);
    std::normal_distribution<double> n01(0, 1);
    std::uniform_real_distribution<double> u01(0, 1);
    Table t;
    t.rows = rows;
    t.source = "generated";
    std::vector<double> x(rows), y(rows);
    std::vector<std::uint32_t> seg(rows);
    for (std::size_t i = 0; i < rows; ++i) {
        seg[i] = static_cast<std::uint32_t>(rng() % 4);
        const double u = n01(rng);
        x[i] = 585 + 60.0 * seg[i] + 20 * u;
        y[i] = 9000 + 9000.0 * seg[i] - 70 * 20 * u + 2000 * n01(rng);
    }
    t.columns.push_back(Column::numeric("credit_score", x));
    t.columns.push_back(Column::numeric("loan_amount", y));
    t.columns.push_back(Column::categorical("segment", {"s0", "s1", "s2", "s3"}, seg));
    for (int j = 0; j < 11; ++j) {
        const std::uint32_t card = 2 + (7 * j) % 23;
        std::vector<std::string> levels;
        for (std::uint32_t l = 0; l < card; ++l) {
            std::string level = "L";
            level += std::to_string(l);
            levels.push_back(level);
        }
        std::vector<std::uint32_t> codes(rows);
        for (auto& c : codes) c = u01(rng) < 0.001 ? card : static_cast<std::uint32_t>(rng() % card);
        std::string name = "extra_cat_";
        name += std::to_string(j + 1);
        t.columns.push_back(Column::categorical(name, levels, codes));
    }
    return t;
}

}  // namespace

int main(int argc, char** argv) {
    std::size_t rows = 1000000;
    int runs = 5;
    bool pairs = true;
    std::string csv, xcol = "credit_score", ycol = "loan_amount";
    std::vector<std::string> skip = {"approved", "applicant_group"};
    for (int i = 1; i < argc; ++i) {
        const std::string a = argv[i];
        auto next = [&]() -> std::string { return i + 1 < argc ? argv[++i] : ""; };
        if (a == "--rows") rows = std::stoul(next());
        else if (a == "--runs") runs = std::stoi(next());
        else if (a == "--no-pairs") pairs = false;
        else if (a == "--csv") csv = next();
        else if (a == "--x") xcol = next();
        else if (a == "--y") ycol = next();
        else {
            std::fprintf(stderr, "unknown argument %s\n", a.c_str());
            return 1;
        }
    }
    auto t0 = std::chrono::steady_clock::now();
    Table t;
    if (csv.empty()) {
        t = generate(rows);
    } else {
        auto r = read_csv(csv, CsvOptions{}, nullptr);
        if (!r) {
            std::fprintf(stderr, "%s\n", r.error().to_string().c_str());
            return 1;
        }
        t = std::move(r.value());
    }
    const double load = seconds_since(t0);
    skip.push_back(xcol);
    skip.push_back(ycol);
    CandidateOptions copt;
    copt.bins = 0;
    auto selected = select_candidates(t, skip, copt);
    if (!selected) {
        std::fprintf(stderr, "%s\n", selected.error().to_string().c_str());
        return 1;
    }
    std::vector<const Column*> cands;
    for (const auto& c : selected->candidates) cands.push_back(c.column);
    SlopeQuestion q;
    q.x = xcol;
    q.y = ycol;
    std::vector<double> times, cpu;
    std::size_t checks = 0, reversals = 0;
    for (int r = 0; r < runs; ++r) {
        t0 = std::chrono::steady_clock::now();
        const double c0 = cpu_seconds();
        auto res = scan_slopes(t, q, cands, pairs);
        times.push_back(seconds_since(t0));
        cpu.push_back(cpu_seconds() - c0);
        if (!res) {
            std::fprintf(stderr, "%s\n", res.error().to_string().c_str());
            return 1;
        }
        checks = res->size();
        reversals = 0;
        for (const auto& f : *res) reversals += f.reversal;
    }
    std::vector<double> sorted = times;
    std::sort(sorted.begin(), sorted.end());
    std::printf("slope_bench source=%s rows=%zu candidates=%zu checks=%zu reversals=%zu "
                "load_s=%.3f runs=%d scan_median_s=%.4f scan_min_s=%.4f scan_max_s=%.4f "
                "scan_cpu_median_s=%.4f\n",
                csv.empty() ? "generated" : csv.c_str(), t.rows, cands.size(), checks, reversals,
                load, runs, sorted[sorted.size() / 2], sorted.front(), sorted.back(), median(cpu));
    return 0;
}
