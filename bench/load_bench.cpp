// Load benchmark: parses one CSV file N times with the Foldline reader and prints the median
// throughput and the process's peak resident memory. Not a test; bench/load.sh drives it.
// With --reader any the file goes through read_table (core/io/table_reader.h), which reads
// every format (bench/formats.sh compares them on the same data).
//
// Usage: foldline_load_bench FILE [--repeat N] [--threads T] [--reader csv|any]
// Output (one "key value" per line, for scripts): runs_s, median_s, mb_per_s, rows_per_s,
// cpu_s_per_run (user + system time of all threads, a figure less sensitive to a busy
// machine than wall time), rows, columns, file_bytes, peak_rss_bytes.
#include <sys/resource.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include <sys/stat.h>

#include "core/io/csv_reader.h"
#include "core/io/table_reader.h"

int main(int argc, char** argv) {
    if (argc < 2) {
        std::fprintf(stderr, "usage: %s FILE [--repeat N] [--threads T] [--reader csv|any]\n", argv[0]);
        return 2;
    }
    const std::string path = argv[1];
    int repeat = 5;
    foldline::ReadOptions opts;
    bool any_format = false;  // --reader any: core/io/table_reader.h's entry point, every format
    for (int i = 2; i + 1 < argc; i += 2) {
        if (!std::strcmp(argv[i], "--repeat")) repeat = std::max(1, std::atoi(argv[i + 1]));
        else if (!std::strcmp(argv[i], "--reader")) any_format = !std::strcmp(argv[i + 1], "any");
        else if (!std::strcmp(argv[i], "--threads")) opts.threads = static_cast<unsigned>(std::atoi(argv[i + 1]));
        else {
            std::fprintf(stderr, "unknown option %s\n", argv[i]);
            return 2;
        }
    }
    struct stat st {};
    if (::stat(path.c_str(), &st) != 0) {
        std::fprintf(stderr, "cannot stat %s\n", path.c_str());
        return 3;
    }
    const double bytes = static_cast<double>(st.st_size);
    std::vector<double> secs;
    std::size_t rows = 0, cols = 0;
    auto cpu_seconds = [] {
        struct rusage u {};
        ::getrusage(RUSAGE_SELF, &u);
        return static_cast<double>(u.ru_utime.tv_sec + u.ru_stime.tv_sec) +
               static_cast<double>(u.ru_utime.tv_usec + u.ru_stime.tv_usec) / 1e6;
    };
    const double cpu0 = cpu_seconds();
    for (int r = 0; r < repeat; ++r) {
        const auto t0 = std::chrono::steady_clock::now();
        auto table = any_format ? foldline::read_table(path, opts) : foldline::read_csv(path, opts);
        const auto t1 = std::chrono::steady_clock::now();
        if (!table) {
            std::fprintf(stderr, "%s\n", table.error().to_string().c_str());
            return 3;
        }
        rows = table->rows;
        cols = table->columns.size();
        secs.push_back(std::chrono::duration<double>(t1 - t0).count());
    }
    const double cpu_per_run = (cpu_seconds() - cpu0) / repeat;
    std::printf("runs_s");
    for (double s : secs) std::printf(" %.4f", s);
    std::printf("\n");
    std::vector<double> sorted = secs;
    std::sort(sorted.begin(), sorted.end());
    const double median = sorted[sorted.size() / 2];
    struct rusage ru {};
    ::getrusage(RUSAGE_SELF, &ru);
    std::printf("median_s %.4f\nmb_per_s %.1f\nrows_per_s %.0f\ncpu_s_per_run %.4f\nrows %zu\ncolumns %zu\n"
                "file_bytes %.0f\npeak_rss_bytes %ld\n",
                median, bytes / 1e6 / median, static_cast<double>(rows) / median, cpu_per_run, rows, cols, bytes,
                ru.ru_maxrss * 1024L);
    return 0;
}
