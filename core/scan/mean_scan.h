#pragma once
// The mean-gap scan: is the pooled difference in a numeric outcome between two groups reversed,
// explained, masked or split within the strata of a stratifier (or a pair of them)?
//
// One pass over the rows builds each check's per-cell sufficient statistics (stratum × group:
// Σw and the sums of y about an origin near the cell's mean, the shifted-data form of the
// centred sums, turned into core/stats/mean_gap.h's MeanMoments); a candidate's pairs are summed
// in batches of one pass each. Row-level data without weights go through core/scan/mean_cells.h
// (codes read in place, fixed origins, an exact second pass for a check that would lose digits). Every figure and the class of a finding come from those cells
// (core/scan/mean_analysis.h).
// Rows are used when the outcome is present (and, with log_outcome, positive), the row is in
// one of the compared groups and its weight is positive; a missing stratifier value leaves the
// row out of that check, as in the rate scan. Strata where one group is absent are listed and
// kept in the finding but left out of the adjusted figures.
//
// Medians are not mergeable sums: with pay_gap set, the rows are sorted once by the outcome and
// each check walks them in that order to read every cell's median (core/stats/median.h).
#include <cstddef>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/scan/candidates.h"
#include "core/scan/mean_finding.h"
#include "core/scan/question.h"
#include "core/table/table.h"

namespace foldline {

struct MeanQuestion {
    std::string outcome;          ///< numeric outcome y
    QuestionSpec groups;          ///< exposure, focal and reference (outcome fields unused)
    bool log_outcome = false;     ///< analyse log(y); every used y must be > 0
    bool pay_gap = false;         ///< pay-gap conventions: % of the reference mean, medians, 5% flags
    double alpha = 0.05;
    bool pairs = true;            ///< also every pair of candidates as joint strata
    unsigned threads = 2;         ///< worker threads (0 = hardware concurrency)
};

struct MeanScan {
    Question groups;                   ///< the resolved groups (reference, focal list)
    std::vector<MeanFinding> findings; ///< per check and focal group, singles first; class provisional (raw p)
    bool cancelled = false;            ///< stopped early: findings of the finished checks only
};

/// Checks the question against the table: the outcome exists, differs from the exposure and is
/// numeric; the groups resolve (resolve_groups); with log_outcome no used row has y <= 0 (the
/// error names the first such data row, counted from 1 after the header, and its value).
Result<Question> check_mean_question(const Table& table, const MeanQuestion& q);

/// Every check for the candidates: each alone and, if q.pairs, every pair (i < j), in candidate
/// order, one finding per focal group. q-values are the raw p until an FDR step. Errors as
/// check_mean_question, or a candidate from another table. A stop request gives the findings of
/// the checks finished so far with cancelled set.
Result<MeanScan> scan_means(const Table& table, const MeanQuestion& q, const CandidateSet& candidates,
                            const Work& work = {});

}  // namespace foldline
