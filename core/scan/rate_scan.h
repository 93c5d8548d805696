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

}  // namespace foldline
