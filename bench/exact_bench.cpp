// Exact-test benchmark (never run by ctest): the cost of the small-count rules and of the exact
// tests on every rate finding of a file, and on published small tables. Prints one row per file.
//
//   exact_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs 5] [--bins 4]
//   exact_bench --tables [--runs 5]          published tables (R's rabbits, UCBAdmissions)
//
// Per file, medians of RUNS runs: the rate scan without bootstrap (its small-count rules
// included); the small-count rules alone over every finding's strata, as the scan runs them; the
// exact conditional test (with MLE and interval) and Zelen's test forced on every finding, with
// how many were computed and how many fell back above the limits (core/stats/exact_*.h).
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <string>
#include <vector>

#include "core/io/csv_reader.h"
#include "core/scan/rate_scan.h"
#include "core/scan/small_counts.h"
#include "core/stats/exact_homogeneity.h"
#include "core/stats/exact_stratified.h"

using namespace foldline;
using clock_type = std::chrono::steady_clock;

namespace {

double median_of(int runs, const auto& f) {
    std::vector<double> t;
    for (int i = 0; i < runs; ++i) {
        const auto a = clock_type::now();
        f();
        t.push_back(std::chrono::duration<double>(clock_type::now() - a).count());
    }
    std::sort(t.begin(), t.end());
    return t[t.size() / 2];
}

stats::Strata strata_of(const RateFinding& f) {
    stats::Strata s;
    for (const auto& r : f.strata_table)
        s.push_back({r.pos_focal, r.n_focal - r.pos_focal, r.pos_reference, r.n_reference - r.pos_reference});
    return s;
}

void tables(int runs) {
    const stats::Strata rabbits{{0, 6, 0, 5}, {3, 3, 0, 6}, {6, 0, 2, 4}, {5, 1, 6, 0}, {2, 0, 5, 0}};
    // R datasets::UCBAdmissions by department: male admitted, rejected; female admitted, rejected.
    const stats::Strata ucb{{512, 313, 89, 19},   {353, 207, 17, 8},    {120, 205, 202, 391},
                            {138, 279, 131, 244}, {53, 138, 94, 299},   {22, 351, 24, 317}};
    std::printf("| table | exact test + MLE + interval | Zelen | support | Zelen tables |\n|---|---|---|---|---|\n");
    for (const auto& [name, s] : {std::pair{"rabbits (R help page)", rabbits}, std::pair{"UCBAdmissions (R datasets)", ucb}}) {
        stats::ExactCommonOr e;
        stats::ZelenTest z;
        const double te = median_of(runs, [&] { e = stats::exact_common_odds_ratio(s); });
        const double tz = median_of(runs, [&] { z = stats::zelen_exact(s); });
        std::printf("| %s | %.3f ms (%s) | %.3f ms (%s) | %.0f | %.3g |\n", name, 1e3 * te,
                    std::string(to_string(e.status)).c_str(), 1e3 * tz, std::string(to_string(z.status)).c_str(),
                    e.support, z.tables);
    }
}

}  // namespace

int main(int argc, char** argv) {
    int runs = 5, bins = 4;
    std::string path, outcome = "approved", exposure = "applicant_group";
    bool published = false;
    for (int i = 1; i < argc; ++i) {
        if (!std::strcmp(argv[i], "--tables")) published = true;
        else if (i + 1 < argc && !std::strcmp(argv[i], "--outcome")) outcome = argv[++i];
        else if (i + 1 < argc && !std::strcmp(argv[i], "--exposure")) exposure = argv[++i];
        else if (i + 1 < argc && !std::strcmp(argv[i], "--runs")) runs = std::atoi(argv[++i]);
        else if (i + 1 < argc && !std::strcmp(argv[i], "--bins")) bins = std::atoi(argv[++i]);
        else path = argv[i];
    }
    if (published) {
        tables(runs);
        return 0;
    }
    if (path.empty()) {
        std::fprintf(stderr, "usage: exact_bench FILE --outcome C[=L] --exposure C[=F[,R]] [--runs N] | --tables\n");
        return 2;
    }
    auto table = read_csv(path);
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
    auto cands = select_candidates(*table, {spec.outcome, spec.exposure}, copt, table->column(spec.exposure));
    RateScanOptions o;
    o.bootstrap = 0;
    Result<ScanResult> r = make_error("none");
    const double scan = median_of(runs, [&] { r = rate_scan(*table, *q, *cands, o); });
    std::vector<stats::Strata> all;
    std::vector<double> psi;
    std::size_t flagged = 0;
    for (const auto& f : r->rate_findings) {
        all.push_back(strata_of(f));
        psi.push_back(f.adjusted.mh_or.estimate);
        flagged += f.small_counts.flagged();
    }
    const double rules = median_of(runs, [&] {
        for (std::size_t i = 0; i < all.size(); ++i) (void)assess_small_counts(all[i], psi[i], 0.05);
    });
    std::size_t computed = 0, too_large = 0, zelen_ok = 0, zelen_many = 0;
    double slowest = 0;
    const double forced = median_of(runs, [&] {
        computed = too_large = 0;
        for (const auto& s : all) {
            const auto a = clock_type::now();
            const auto e = stats::exact_common_odds_ratio(s);
            slowest = std::max(slowest, std::chrono::duration<double>(clock_type::now() - a).count());
            computed += e.status == stats::ExactStatus::Computed;
            too_large += e.status == stats::ExactStatus::TooLarge;
        }
    });
    const double zelen = median_of(runs, [&] {
        zelen_ok = zelen_many = 0;
        for (const auto& s : all) {
            const auto z = stats::zelen_exact(s);
            zelen_ok += z.status == stats::HomogeneityStatus::Computed;
            zelen_many += z.status == stats::HomogeneityStatus::TooManyTables;
        }
    });
    std::printf("| %zu | %zu | %zu | %.3f s | %.2f ms | %.3f s (%zu computed, %zu above limits; slowest %.1f ms) | "
                "%.3f s (%zu computed, %zu too many tables) |\n",
                table->rows, all.size(), flagged, scan, 1e3 * rules, forced, computed, too_large, 1e3 * slowest, zelen,
                zelen_ok, zelen_many);
    return 0;
}
