// First-finding benchmark (never run by ctest): how soon the first finding of a rate scan exists,
// against the whole scan, on the path the workbench takes (read_csv, select_candidates, then
// rate_scan handing each finding to a callback as it is computed; the Scan page shows what the
// callback delivered at its next 50 ms refresh). Prints one `key value` pair per line:
// seconds from the start of the scan to the first finding, to the last one and to the finished
// result (bootstrap and ranking included), and the same measured from the start of the load.
//
//   first_finding_bench FILE [--outcome C=L] [--exposure C=F,R] [--bins N] [--bootstrap B] [--runs N]
#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "core/io/csv_reader.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
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

}  // namespace

int main(int argc, char** argv) {
    if (argc < 2) {
        std::fprintf(stderr, "usage: first_finding_bench FILE [--outcome C=L] [--exposure C=F,R] [--bins N] "
                             "[--bootstrap B] [--runs N]\n");
        return 2;
    }
    std::string path = argv[1], outcome = "approved=1", exposure = "applicant_group=B,A";
    int bins = 0, boot = 1000, runs = 1;
    for (int i = 2; i + 1 < argc; i += 2) {
        if (!std::strcmp(argv[i], "--outcome")) outcome = argv[i + 1];
        else if (!std::strcmp(argv[i], "--exposure")) exposure = argv[i + 1];
        else if (!std::strcmp(argv[i], "--bins")) bins = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--bootstrap")) boot = std::atoi(argv[i + 1]);
        else if (!std::strcmp(argv[i], "--runs")) runs = std::max(1, std::atoi(argv[i + 1]));
    }
    std::vector<double> load_s, first_s, last_s, total_s;
    std::size_t rows = 0, findings = 0, cubes = 0;
    for (int run = 0; run < runs; ++run) {
        const auto t0 = clock_type::now();
        auto table = read_csv(path);
        if (!table) {
            std::fprintf(stderr, "%s\n", table.error().to_string().c_str());
            return 3;
        }
        const auto t1 = clock_type::now();
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
        auto cands = select_candidates(*table, {spec.outcome, spec.exposure}, copt, table->column(spec.exposure));
        if (!cands) {
            std::fprintf(stderr, "%s\n", cands.error().to_string().c_str());
            return 2;
        }
        RateScanOptions o;
        o.bootstrap = boot;
        std::atomic<bool> seen{false};
        clock_type::time_point first{}, last{};
        std::size_t n = 0;
        auto r = rate_scan(*table, *q, *cands, o, {}, [&](const RateFinding&) {
            const auto now = clock_type::now();  // called under the scan's lock: plain writes are safe
            if (!seen.exchange(true)) first = now;
            last = now;
            ++n;
        });
        const auto t2 = clock_type::now();
        if (!r || !seen) {
            std::fprintf(stderr, "the scan gave no finding\n");
            return 1;
        }
        rows = table->rows;
        findings = n;
        cubes = cands->candidates.size() * (cands->candidates.size() + 1) / 2;
        load_s.push_back(seconds(t0, t1));
        first_s.push_back(seconds(t1, first));
        last_s.push_back(seconds(t1, last));
        total_s.push_back(seconds(t1, t2));
    }
    const double load = median(load_s), first = median(first_s), total = median(total_s);
    std::printf("rows %zu\n", rows);
    std::printf("cubes %zu\n", cubes);
    std::printf("findings %zu\n", findings);
    std::printf("runs %d\n", runs);
    std::printf("load_s %.3f\n", load);
    std::printf("scan_first_finding_s %.4f\n", first);
    std::printf("scan_last_finding_s %.3f\n", median(last_s));
    std::printf("scan_total_s %.3f\n", total);
    std::printf("first_over_total %.4f\n", total > 0 ? first / total : 0.0);
    std::printf("from_open_first_finding_s %.3f\n", load + first);
    std::printf("from_open_total_s %.3f\n", load + total);
    return 0;
}
