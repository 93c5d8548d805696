// Scan benchmark (never run by ctest): loads a CSV once, then times the parts of the rate scan
// (median of N runs each) and the floor of issue "speed": one pass that only reads every code
// column once per comparison (singles: one column; pairs: two), summing codes so the compiler
// cannot drop it. Prints one table.
//
//   scan_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs 5] [--bins 0] [--bootstrap 1000]
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <string>
#include <vector>

#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"
#include "core/scan/rate_scan.h"

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

}  // namespace

int main(int argc, char** argv) {
    if (argc < 2) {
        std::fprintf(stderr, "usage: scan_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs N] [--bins N] "
                             "[--bootstrap B]\n");
        return 2;
    }
    std::string path = argv[1], outcome = "approved", exposure = "applicant_group";
    int runs = 5, bins = 4, boot = 1000;
    for (int i = 2; i + 1 < argc; i += 2) {
        if (!std::strcmp(argv[i], "--outcome")) outcome = argv[i + 1];
        else if (!std::strcmp(argv[i], "--exposure")) exposure = argv[i + 1];
        else if (!std::strcmp(argv[i], "--runs")) runs = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--bins")) bins = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--bootstrap")) boot = std::atoi(argv[i + 1]);
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

    // Floor: one pass reading the code columns of each comparison, single-threaded and on two threads.
    unsigned long long sink = 0;
    const double floor1 = time_median(runs, [&] {
        for (std::size_t i = 0; i < cs.size(); ++i) sink += floor_pass(*cs[i].column, nullptr, rows);
        for (std::size_t i = 0; i < cs.size(); ++i)
            for (std::size_t j = i + 1; j < cs.size(); ++j) sink += floor_pass(*cs[i].column, cs[j].column, rows);
    });
    const double cubes1 = time_median(runs, [&] {
        for (std::size_t i = 0; i < cs.size(); ++i) sink += build_cube(*cs[i].column, rows, table->weights).strata;
        for (std::size_t i = 0; i < cs.size(); ++i)
            for (std::size_t j = i + 1; j < cs.size(); ++j)
                sink += build_pair_cube(*cs[i].column, *cs[j].column, rows, table->weights).strata;
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
    std::printf("rows %zu, candidates %zu, checks %zu, reversals %zu (median of %d runs)\n", table->rows, cs.size(),
                r->rate_findings.size(), reversals, runs);
    std::printf("%-44s %8.3f s\n", "load (read_csv)", load);
    std::printf("%-44s %8.3f s\n", "select candidates (binning)", select);
    std::printf("%-44s %8.3f s\n", "encode question", encode);
    std::printf("%-44s %8.3f s\n", "floor: read codes once per check (1 thread)", floor1);
    std::printf("%-44s %8.3f s\n", "count cubes (1 thread)", cubes1);
    std::printf("%-44s %8.3f s\n", "rate scan, no bootstrap (pool)", scan_noboot);
    std::printf("%-44s %8.3f s\n", "rate scan with bootstrap (pool)", scan);
    std::printf("%-44s %8.3f s\n", "JSON text", json);
    std::printf("scan without bootstrap / floor: %.2fx; cubes / floor: %.2fx\n", scan_noboot / floor1, cubes1 / floor1);
    std::printf("(checksum %llu, json %zu bytes)\n", sink, text.size());
    return 0;
}
