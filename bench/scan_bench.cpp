// Scan benchmark (never run by ctest): loads a CSV once, then times the parts of the rate scan
// (median of N runs each) and the floor of issue "speed": one pass that only reads every code
// column once per comparison (singles: one column; pairs: two; each slope check: its code
// column and the x and y values), summing what it reads so the compiler cannot drop it. The
// floor runs on one thread and, like the scan, on the machine's threads (comparisons shared
// out); the printed ratio divides the scan by the floor on the same number of threads.
// Prints one table.
//
//   scan_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs 5] [--bins 0] [--bootstrap 1000]
//              [--trend X:Y]   (default credit_score:loan_amount when both columns exist)
#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <string>
#include <thread>
#include <vector>

#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"
#include "core/scan/rate_scan.h"
#include "core/scan/slope_scan.h"

using namespace foldline;
using clock_type = std::chrono::steady_clock;

namespace {

double seconds(clock_type::time_point a, clock_type::time_point b) {
    return std::chrono::duration<double>(b - a).count();
}

double median(std::vector<double> v) {
    std::sort(v.begin(), v.end());
    return v.empty() ? 0 : v[v.size() / 2];
}

template <typename F>
double time_median(int runs, F&& f) {
    std::vector<double> t;
    for (int i = 0; i < runs; ++i) {
        const auto a = clock_type::now();
        f();
        t.push_back(seconds(a, clock_type::now()));
    }
    return median(t);
}

unsigned long long floor_pass(const Column& a, const Column* b, const RowCells& rows) {
    unsigned long long sum = 0;
    visit_codes(a, [&](const auto& ca) {
        if (!b) {
            for (std::size_t i = 0; i < ca.size(); ++i) sum += ca[i] + rows.cell[i];
            return;
        }
        visit_codes(*b, [&](const auto& cb) {
            for (std::size_t i = 0; i < ca.size(); ++i) sum += ca[i] + cb[i] + rows.cell[i];
        });
    });
    return sum;
}

// The slope floor: the code column and the x, y values, read once.
double slope_floor_pass(const Column& a, const std::vector<double>& x, const std::vector<double>& y) {
    double sum[4] = {0, 0, 0, 0};  // four chains, so the floor is not one long dependency
    visit_codes(a, [&](const auto& ca) {
        std::size_t i = 0;
        for (; i + 4 <= ca.size(); i += 4)
            for (int k = 0; k < 4; ++k) sum[k] += ca[i + k] + x[i + k] + y[i + k];
        for (; i < ca.size(); ++i) sum[0] += ca[i] + x[i] + y[i];
    });
    return sum[0] + sum[1] + sum[2] + sum[3];
}

}  // namespace

int main(int argc, char** argv) {
    if (argc < 2) {
        std::fprintf(stderr, "usage: scan_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs N] [--bins N] "
                             "[--bootstrap B]\n");
        return 2;
    }
    std::string path = argv[1], outcome = "approved", exposure = "applicant_group";
    std::string trend = "credit_score:loan_amount";
    int runs = 5, bins = 4, boot = 1000;
    for (int i = 2; i + 1 < argc; i += 2) {
        if (!std::strcmp(argv[i], "--outcome")) outcome = argv[i + 1];
        else if (!std::strcmp(argv[i], "--exposure")) exposure = argv[i + 1];
        else if (!std::strcmp(argv[i], "--runs")) runs = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--bins")) bins = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--bootstrap")) boot = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--trend")) trend = argv[i + 1];
    }
    Result<Table> table = make_error("not loaded");
    const double load = time_median(runs, [&] { table = read_csv(path); });
    if (!table) {
        std::fprintf(stderr, "%s\n", table.error().to_string().c_str());
        return 3;
    }
    QuestionSpec spec;
    parse_outcome_arg(outcome, spec);
    parse_exposure_arg(exposure, spec);
    auto q = resolve_question(*table, spec);
    if (!q) {
        std::fprintf(stderr, "%s\n", q.error().to_string().c_str());
        return 2;
    }
    CandidateOptions copt;
    copt.bins = bins;
    Result<CandidateSet> cands = make_error("none");
    const double select = time_median(runs, [&] {
        cands = select_candidates(*table, {spec.outcome, spec.exposure}, copt, table->column(spec.exposure));
    });
    const auto& cs = cands->candidates;
    RowCells rows;
    const double encode = time_median(runs, [&] { rows = encode_rows(*table, *q); });

    // Slope checks of y on x within each single candidate (skipped when the columns are absent).
    SlopeQuestion sq;
    std::vector<const Column*> slope_cols;
    if (const auto colon = trend.find(':'); colon != std::string::npos) {
        sq.x = trend.substr(0, colon);
        sq.y = trend.substr(colon + 1);
        const Column* xc = table->column(sq.x);
        const Column* yc = table->column(sq.y);
        if (xc && yc && xc->is_numeric() && yc->is_numeric())
            for (const auto& c : cs)
                if (c.name != sq.x && c.name != sq.y) slope_cols.push_back(c.column);
    }
    const std::vector<double>* xv = slope_cols.empty() ? nullptr : &table->column(sq.x)->values;
    const std::vector<double>* yv = slope_cols.empty() ? nullptr : &table->column(sq.y)->values;

    // Floor: one pass reading the columns of each comparison, on one thread and on `threads`.
    struct Comparison {
        const Column* a;
        const Column* b;
        bool slope;
    };
    std::vector<Comparison> comparisons;
    for (std::size_t i = 0; i < cs.size(); ++i) comparisons.push_back({cs[i].column, nullptr, false});
    for (std::size_t i = 0; i < cs.size(); ++i)
        for (std::size_t j = i + 1; j < cs.size(); ++j) comparisons.push_back({cs[i].column, cs[j].column, false});
    for (const Column* c : slope_cols) comparisons.push_back({c, nullptr, true});
    auto floor_of = [&](const Comparison& c) -> double {
        if (c.slope) return slope_floor_pass(*c.a, *xv, *yv);
        return static_cast<double>(floor_pass(*c.a, c.b, rows));
    };
    double sink = 0;
    const double floor1 = time_median(runs, [&] {
        for (const auto& c : comparisons) sink += floor_of(c);
    });
    const unsigned threads = std::max(1u, std::thread::hardware_concurrency());
    // Comparisons [from, to) shared over the threads.
    auto floor_threads = [&](std::size_t from, std::size_t to) {
        return time_median(runs, [&] {
            std::atomic<std::size_t> next{from};
            std::vector<double> part(threads, 0.0);
            auto work = [&](unsigned k) {
                for (std::size_t i; (i = next.fetch_add(1)) < to;) part[k] += floor_of(comparisons[i]);
            };
            std::vector<std::thread> pool;
            for (unsigned k = 1; k < threads; ++k) pool.emplace_back(work, k);
            work(0);
            for (auto& t : pool) t.join();
            for (double p : part) sink += p;
        });
    };
    const std::size_t nrate = comparisons.size() - slope_cols.size();
    const double floor_t = floor_threads(0, comparisons.size());
    const double floor_rate_t = floor_threads(0, nrate);
    const double floor_slope_t = floor_threads(nrate, comparisons.size());
    const double floor_rate1 = time_median(runs, [&] {
        for (std::size_t i = 0; i < nrate; ++i) sink += floor_of(comparisons[i]);
    });
    const double cubes1 = time_median(runs, [&] {
        for (std::size_t i = 0; i < cs.size(); ++i) sink += build_cube(*cs[i].column, rows, table->weights).strata;
        for (std::size_t i = 0; i < cs.size(); ++i)
            for (std::size_t j = i + 1; j < cs.size(); ++j)
                sink += build_pair_cube(*cs[i].column, *cs[j].column, rows, table->weights).strata;
    });
    std::size_t slope_checks = 0;
    const double slopes = time_median(runs, [&] {
        if (slope_cols.empty()) return;
        auto s = scan_slopes(*table, sq, slope_cols, false);
        slope_checks = s ? s->size() : 0;
    });
    RateScanOptions o;
    o.bootstrap = 0;
    Result<ScanResult> r = make_error("none");
    const double scan_noboot = time_median(runs, [&] { r = rate_scan(*table, *q, *cands, o); });
    o.bootstrap = boot;
    const double scan = time_median(runs, [&] { r = rate_scan(*table, *q, *cands, o); });
    std::string text;
    const double json = time_median(runs, [&] { text = scan_json_text(*r, DataInfo{path, "", double(table->rows)}); });
    std::size_t reversals = 0;
    for (const auto& f : r->rate_findings) reversals += f.reversal();
    std::printf("rows %zu, candidates %zu, rate checks %zu, slope checks %zu, reversals %zu (median of %d runs, "
                "%u threads)\n",
                table->rows, cs.size(), r->rate_findings.size(), slope_checks, reversals, runs, threads);
    std::printf("%-44s %8.3f s\n", "load (read_csv)", load);
    std::printf("%-44s %8.3f s\n", "select candidates (binning)", select);
    std::printf("%-44s %8.3f s\n", "encode question", encode);
    std::printf("%-44s %8.3f s\n", "floor: read codes once per check (1 thread)", floor1);
    std::printf("%-44s %8.3f s\n", "floor: the same shared over the threads", floor_t);
    std::printf("%-44s %8.3f s\n", "  of which rate checks (threads)", floor_rate_t);
    std::printf("%-44s %8.3f s\n", "  of which slope checks (threads)", floor_slope_t);
    std::printf("%-44s %8.3f s\n", "count cubes (1 thread)", cubes1);
    std::printf("%-44s %8.3f s\n", "rate scan, no bootstrap (pool)", scan_noboot);
    std::printf("%-44s %8.3f s\n", "rate scan with bootstrap (pool)", scan);
    std::printf("%-44s %8.3f s\n", "slope checks (x, y within each candidate)", slopes);
    std::printf("%-44s %8.3f s\n", "JSON text", json);
    std::printf("scan (rate without bootstrap + slope) / floor on %u threads: %.2fx (target 3x)\n", threads,
                (scan_noboot + slopes) / floor_t);
    std::printf("scan (rate with bootstrap + slope) / floor on %u threads: %.2fx\n", threads, (scan + slopes) / floor_t);
    std::printf("rate scan without bootstrap / its floor: %.2fx; slope checks / their floor: %.2fx\n",
                scan_noboot / floor_rate_t, slopes / floor_slope_t);
    std::printf("cubes / rate floor, both on 1 thread: %.2fx\n", cubes1 / floor_rate1);
    std::printf("(checksum %.6g, json %zu bytes)\n", sink, text.size());
    return 0;
}
