#pragma once
// The rate-reversal scan: for every candidate stratifier (and every pair), one count cube,
// and from it every figure of a RateFinding for each comparison of the question.
//
// Work: progress counts cubes (candidates and pairs) done out of the total; a stop request is
// honoured between cubes (the result then has cancelled = true). Cubes are counted in parallel
// on a small thread pool; each finding can be handed to a callback as soon as it is computed
// (class provisional: decided with its raw p, before the FDR step and the bootstrap).
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/scan/candidates.h"
#include "core/scan/cube.h"
#include "core/scan/question.h"
#include "core/scan/rate_finding.h"
#include "core/scan/scan_result.h"

namespace foldline {

struct RateScanOptions {
    bool pairs = true;                 ///< also every pair of candidates as joint strata
    double alpha = 0.05;               ///< test level, CI level 1 - alpha, and the FDR level
    int bootstrap = 1000;              ///< resamples for the stability of flagged findings; 0 = off
    std::uint64_t seed = 20240601;     ///< bootstrap seed (same seed, same stabilities)
    unsigned threads = 2;              ///< worker threads (0 = hardware concurrency)
};

using RateFindingCallback = std::function<void(const RateFinding&)>;

/// A stratifier whose cubes were counted elsewhere: its name, how its levels were formed (as
/// select_candidates says) and the level labels of its strata, in stratum order.
struct CubeStratifier {
    std::string name;
    std::string origin;
    std::vector<std::string> levels;
};

/// Count cubes of one question counted outside the table scan (a database's GROUPING SETS, a
/// summary file): one cube per stratifier and, for a scan with pairs, one per pair i < j in the
/// order (0,1), (0,2), ..., (1,2), ... whose stratum is level_i * levels_j + level_j. Every cube
/// has the question's exposure slots and excludes missing stratifier values.
struct CubeSet {
    std::vector<CubeStratifier> stratifiers;
    std::vector<CountCube> singles;      ///< one per stratifier
    std::vector<CountCube> pairs;        ///< n (n - 1) / 2 when pairs are scanned, else may be empty
    std::vector<Exclusion> excluded;     ///< columns left out, with their reasons
    double rows = 0;                     ///< weighted rows of the source (every row, as Table::total_weight)
};

/// Every figure of one comparison from its strata (already restricted to strata with rows).
/// `labels[k]` are the per-stratifier labels of stratum k; `strata_names` the stratifier
/// columns. Class decided with the raw reversal p (q_value = p_reversal until apply_fdr).
/// Empty strata give NaN figures and class stable.
RateFinding analyse_strata(const stats::Strata& strata, const std::vector<std::vector<std::string>>& labels,
                           const std::vector<std::string>& strata_names, double alpha);

/// Share of `draws` multinomial resamples of the finding's cube whose class (decided with raw
/// p-values) equals the finding's class. NaN when draws <= 0.
double class_stability(const stats::Strata& strata, FindingClass cls, double alpha, int draws,
                       std::uint64_t seed);

/// Runs the scan. The table, question and candidates must come from the same table. Errors
/// only for inconsistent input (a question or candidate from another table). Findings come
/// back FDR-adjusted, bootstrapped (flagged ones) and ranked. `slope_findings` (optional) are
/// slope checks of the same scan: they join the FDR step and come back in the result.
Result<ScanResult> rate_scan(const Table& table, const Question& question, const CandidateSet& candidates,
                             const RateScanOptions& options = {}, const Work& work = {},
                             const RateFindingCallback& on_finding = {},
                             std::vector<SlopeFinding> slope_findings = {});

/// The same scan from cubes counted elsewhere: every finding, FDR step, bootstrap draw (of the
/// cube) and ranking is the one the table scan gives for a table with these cubes. Errors when
/// a cube does not fit the question or its stratifier's levels, or pair cubes are missing while
/// options.pairs is set (one stratifier: no pairs, no error). No stratifiers: no rate findings.
Result<ScanResult> rate_scan(const CubeSet& cubes, const Question& question, const RateScanOptions& options = {},
                             const Work& work = {}, const RateFindingCallback& on_finding = {},
                             std::vector<SlopeFinding> slope_findings = {});

}  // namespace foldline
