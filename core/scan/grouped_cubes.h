#pragma once
// From counts grouped elsewhere to a rate scan's count cubes. A database answers one
// GROUP BY GROUPING SETS query with the cells of (outcome, exposure), of (outcome, exposure, s)
// for every stratifier s and of (outcome, exposure, s, t) for every pair; each grouping set
// arrives here as a small pre-counted table. The question is resolved, the candidates chosen
// and their levels formed exactly as a scan of the rows themselves would (the same rules of
// core/scan/candidates.h, applied to each stratifier's own set), so the cubes, and every
// finding computed from them, equal those of the row-level scan.
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/scan/rate_scan.h"
#include "core/table/grouped_counts.h"
#include "core/table/table.h"

namespace foldline {

/// What the rate scan of cubes needs: the checked question and the cubes.
struct GroupedScanInput {
    Question question;
    CubeSet cubes;
    std::vector<Candidate> candidates;  ///< one per cubes.stratifiers entry; points into the counts' singles
    std::vector<std::size_t> sets;      ///< the index in GroupedCounts::singles of each candidate's set
};

/// Resolves `spec` on the pooled cells (resolve_question), selects the stratifiers among the
/// singles' columns (`options.columns` empty = all, in singles order; else in the list's order)
/// with the rules and reasons of select_candidates (shares of missing rows and "one value per
/// row" counted in rows, not cells), and builds each single cube and, when `pairs` is set, each
/// pair cube over the candidates' levels. Errors: those of resolve_question and
/// select_candidates, a named stratifier without its set, a missing pair set, grouping sets whose
/// outcome or exposure levels disagree. No stratifier qualifying gives a CubeSet with none.
Result<GroupedScanInput> cubes_from_groups(const GroupedCounts& counts, const QuestionSpec& spec,
                                           const CandidateOptions& options, bool pairs);

/// Codes of `raw` (values of stratifier i's source column, from another query grouped by it)
/// in the levels of cubes.stratifiers[i]: a text value by its label, a number by the level its
/// value was given in the stratifier's own set; missing values get levels.size(). `counts` must
/// be the counts `input` was built from. Error for a value absent from that set or a column
/// of another type; an empty column gives no codes.
Result<std::vector<std::uint32_t>> stratifier_codes(const GroupedCounts& counts, const GroupedScanInput& input,
                                                    std::size_t i, const Column& raw);

/// Cut points that bin a numeric stratifier in the engine exactly as cubes.stratifiers[i]'s
/// levels do: ascending values c1 < c2 < ... with level k for values in [c_k, c_k+1) (level 0
/// below c1, the last level from the last cut up). Empty when the stratifier is not numeric or
/// its levels do not follow its values in order (then the pair sets keep the values).
std::vector<double> bin_cuts(const GroupedCounts& counts, const GroupedScanInput& input, std::size_t i);

}  // namespace foldline
