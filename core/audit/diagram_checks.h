#pragma once
// The diagram against the data: every claim of core/causal/implications.h tested on the rows.
// Categorical pairs (and any pair with a categorical member) by G² over the strata of the
// conditioning set; pairs of numeric columns by partial correlation (Fisher's z) with stratum
// intercepts for the categorical members of the set. Numeric columns that enter a G² test or
// a set of strata are cut as the scan cuts candidates (integer levels, else quantile bins), each
// column once per data set (core/audit/claim_strata.h).
// Rows missing any column of a claim are left out of that claim's test. q-values are
// Benjamini-Hochberg within the diagram's tests.
#include <string>
#include <vector>

#include "core/audit/claim_strata.h"
#include "core/audit/verdicts.h"
#include "core/causal/diagram.h"
#include "core/causal/diagram_check.h"
#include "core/common/error.h"
#include "core/common/progress.h"
#include "core/table/table.h"

namespace foldline::audit {

/// The claims of a validated diagram, untested (method None), in implied_independences order.
std::vector<causal::DiagramCheck> list_claims(const causal::CausalGraph& graph);

/// A key that names a claim (pair and set) for caching its test between edits.
std::string claim_key(const causal::DiagramCheck& check);

/// Tests one claim on `table` (cut by `settings`). Untestable claims are left as they are; a
/// claim that cannot be tested (a column missing, too many cells) gets a note and p NaN.
void test_claim(causal::DiagramCheck& check, const Table& table, const EstimateSettings& settings);

/// The same with the columns cut once for the whole data set: every claim of one diagram (and
/// of later edits of it on the same rows) should share one ClaimStrata.
void test_claim(causal::DiagramCheck& check, ClaimStrata& strata);

/// BH q-values across the tested claims, the contradicted flags and counts at `alpha`, and the
/// sentences. Call after every claim is tested.
void finish_checks(causal::DiagramChecks& checks, double alpha);

/// Everything at once: list, test (progress per claim; a stop leaves the rest untested with a
/// note), finish. An invalid diagram → Error; a diagram whose observed nodes are not all
/// columns → Error naming them.
Result<causal::DiagramChecks> check_diagram(const causal::Diagram& diagram, const Table& table,
                                            const EstimateSettings& settings, const Work& work = {});

}  // namespace foldline::audit
