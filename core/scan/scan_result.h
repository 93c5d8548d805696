#pragma once
// Everything one scan produced, in plain structs: rate findings and slope findings side by side;
// apply_fdr controls the false discovery rate over both kinds together and rank_findings orders
// each list.
#include <optional>
#include <string>
#include <vector>

#include "core/causal/diagram_check.h"
#include "core/scan/candidates.h"
#include "core/scan/mean_finding.h"
#include "core/scan/families.h"
#include "core/scan/question.h"
#include "core/scan/rate_finding.h"
#include "core/scan/slope_scan.h"

namespace foldline {

struct ScanResult {
    Question question;
    std::vector<std::string> candidates;     ///< stratifier names, with origin in candidate_origin
    std::vector<std::string> candidate_origin;
    std::vector<Exclusion> excluded;
    double rows = 0;                         ///< weighted rows in the table
    std::string rows_filter;                 ///< the rows filter applied (canonical text), empty = every row
    double rows_kept = -1;                   ///< records the filter kept; -1 when not known (no filter, cubes)
    std::vector<RateFinding> rate_findings;  ///< ranked (see rank_findings)
    std::vector<SlopeFinding> slope_findings;  ///< trend checks of the same scan, ranked
    SlopeQuestion slope_question;            ///< what the slope findings answer (x, y empty if none)
    std::vector<MeanFinding> mean_findings;  ///< mean-gap checks of a mean question, ranked
    bool mean_scan = false;                  ///< a mean-gap question: mean_findings answer it
    bool log_outcome = false;                ///< mean question: figures are of log(outcome)
    std::vector<FindingFamilySummary> families;  ///< flagged families in rank order (rank_findings)
    std::optional<LatentFinding> latent;     ///< the hidden-group hint of a trend audit, when asked
    double alpha = 0.05;
    int bootstrap = 0;
    unsigned long long seed = 0;
    bool cancelled = false;                  ///< stopped early: findings are incomplete
    std::optional<causal::DiagramChecks> diagram_checks;  ///< the diagram's claims tested on the rows (with a diagram)
};

/// The one FDR step of every scan: BH q-values over every finding's p_reversal (rate, slope and
/// mean-gap findings together; a NaN p gets no q-value and does not count), then each class recomputed
/// with its q-value and a slope finding's stability re-read for its new class. No-op on an empty
/// result.
void apply_fdr(ScanResult& result);

/// The one ranking of every scan: assigns families (core/scan/families.h), then orders each list
/// (empty lists stay empty) by family — families in the order of their leads, the lead first,
/// then its proxies, then its members — and, among leads and within a family, by class (reversal
/// first), then q-value, then fewer stratifiers (a single before a pair with the same figures),
/// then size of the change (largest first: |crude RD - MH RD| for rates, |pooled - within slope|
/// for slopes, |crude − fixed-effects difference| for mean gaps, adjusted slopes when there are
/// covariates), then label. Fills result.families.
void rank_findings(ScanResult& result);

}  // namespace foldline
