#pragma once
// Which of a finding's columns a diagram lacks, and the one sentence that says so. The verdict
// code (core/audit/verdicts) records the sentence as the finding's verdict problem, so the JSON,
// the CSV, the memo and the workbench's Diagram step all name the same missing columns.
#include <string>
#include <vector>

#include "core/causal/diagram.h"

namespace foldline::causal {

/// The names of `columns` (the finding's exposure, outcome and stratifiers, in that order) that
/// are not nodes of `d`, each once, in the order given. Empty names are skipped; an empty
/// diagram lacks every column.
std::vector<std::string> missing_columns(const Diagram& d, const std::vector<std::string>& columns);

/// "the diagram lacks the finding's column "a"; add it to the diagram to learn which view
/// answers the question" (plural for several: "columns "a" and "b"; add them"). Names are
/// quoted as everywhere in core/causal (quote_name). Empty `missing` → "".
std::string missing_columns_sentence(const std::vector<std::string>& missing);

}  // namespace foldline::causal
