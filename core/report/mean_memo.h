#pragma once
// The memo's content for a mean-gap question (core/report/memo_content.h calls it for a result
// whose mean_scan is set): the question, the summary, the findings table, one section per
// chosen finding (lead, figures, per-stratum means, decomposition, E-value, pay-gap figures)
// and the method notes. A pay review's memo carries its own caution beside the common one.
#include "core/report/memo_content.h"

namespace foldline::report {

/// Whether a mean-gap finding gets a section (keyed by project::mean_key), by the rule of
/// included_in_memo.
bool included_in_memo(const MeanFinding& f, const project::Project* project);

/// Fills question, summary, findings, findings_note, sections, method_notes and caution of `m`
/// (title, facts and data warning are already there) for a mean-gap scan. The "Question" fact
/// is replaced. No-op when input.scan is null or not a mean scan.
void fill_mean_memo(MemoContent& m, const MemoInput& input);

}  // namespace foldline::report
