// Benchmark of the slope scan (never run by ctest).
//
//   slope_bench [--rows N] [--runs R] [--no-pairs]
//       generates N rows in process (seeded): x, y with a slope reversal by `segment`, and 12
//       categorical candidates with 2..24 levels and about 0.1% empty cells; times scan_slopes
//       over the 12 candidates and (unless --no-pairs) their 66 pairs, R runs, prints the median.
//   slope_bench --csv FILE --x COL --y COL [--runs R] [--no-pairs]
//       loads a CSV (simple comma-separated, no quoted fields; columns whose cells are all
//       numbers are numeric, the rest categorical) and scans every categorical column with at
//       most 50 levels — for a side-by-side run with the pandas peer in ../shared/bench/.
// Output: one line per measurement, `slope_bench key=value ...`.
#include "core/scan/slope_scan.h"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <random>
#include <sys/resource.h>
#include <sstream>
#include <string>
#include <unordered_map>

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

// Bench-only loader for the peer's generated file (no quoting, no escapes).
Table load_csv(const std::string& path) {
    std::ifstream in(path);
    if (!in) {
        std::fprintf(stderr, "cannot open %s\n", path.c_str());
        std::exit(1);
    }
    std::string line;
    std::getline(in, line);
    std::vector<std::string> names;
    {
        std::stringstream ss(line);
        for (std::string f; std::getline(ss, f, ',');) names.push_back(f);
    }
    const std::size_t m = names.size();
    std::vector<std::vector<std::string>> cells(m);
    std::size_t rows = 0;
    while (std::getline(in, line)) {
        std::size_t start = 0, j = 0;
        for (; j < m; ++j) {
            const std::size_t end = std::min(line.find(',', start), line.size());
            cells[j].emplace_back(line, start, end - start);
            start = end + 1;
        }
        ++rows;
    }
    Table t;
    t.rows = rows;
    t.source = path;
    for (std::size_t j = 0; j < m; ++j) {
        std::vector<double> v(rows);
        bool numeric = true;
        for (std::size_t i = 0; i < rows && numeric; ++i) {
            const std::string& s = cells[j][i];
            if (s.empty()) {
                v[i] = std::nan("");
                continue;
            }
            char* end = nullptr;
            v[i] = std::strtod(s.c_str(), &end);
            numeric = end && *end == '\0';
        }
        std::unordered_map<std::string, std::uint32_t> index;
        std::vector<std::string> levels;
        if (numeric) {
            // Integer columns with few values are categorical, as in the peer.
            bool integral = true;
            for (double d : v)
                if (!std::isnan(d) && d != std::floor(d)) integral = false;
            if (integral)
                for (std::size_t i = 0; i < rows && levels.size() <= 50; ++i)
                    if (!cells[j][i].empty() && index.emplace(cells[j][i], 0).second)
                        levels.push_back(cells[j][i]);
            if (!integral || levels.size() > 50) {
                t.columns.push_back(Column::numeric(names[j], std::move(v)));
                continue;
            }
            index.clear();
            levels.clear();
        }
        std::vector<std::uint32_t> codes(rows);
        std::vector<std::uint32_t> missing_rows;
        for (std::size_t i = 0; i < rows; ++i) {
            const std::string& s = cells[j][i];
            if (s.empty()) {
                missing_rows.push_back(static_cast<std::uint32_t>(i));
                continue;
            }
            auto [it, fresh] = index.emplace(s, static_cast<std::uint32_t>(levels.size()));
            if (fresh) levels.push_back(s);
            codes[i] = it->second;
        }
        for (auto i : missing_rows) codes[i] = static_cast<std::uint32_t>(levels.size());
        t.columns.push_back(Column::categorical(names[j], std::move(levels), codes));
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
    Table t = csv.empty() ? generate(rows) : load_csv(csv);
    const double load = seconds_since(t0);
    std::vector<const Column*> cands;
    for (const auto& c : t.columns)
        if (c.is_categorical() && c.levels.size() <= 50 &&
            std::find(skip.begin(), skip.end(), c.name) == skip.end())
            cands.push_back(&c);
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
