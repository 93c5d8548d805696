#pragma once
// Everything one scan produced, in plain structs. Rate findings live here; slope findings are
// added beside them by the slope scan, and apply_fdr/rank_findings then treat both kinds alike.
#include <string>
#include <vector>

#include "core/scan/candidates.h"
#include "core/scan/question.h"
#include "core/scan/rate_finding.h"

namespace foldline {

struct ScanResult {
    Question question;
    std::vector<std::string> candidates;     ///< stratifier names, with origin in candidate_origin
    std::vector<std::string> candidate_origin;
    std::vector<Exclusion> excluded;
    double rows = 0;                         ///< weighted rows in the table
    std::vector<RateFinding> rate_findings;  ///< ranked (see rank_findings)
    double alpha = 0.05;
    int bootstrap = 0;
    unsigned long long seed = 0;
    bool cancelled = false;                  ///< stopped early: findings are incomplete
};

/// BH q-values over every finding's p_reversal, then each class recomputed with its q-value.
/// No-op on an empty result.
void apply_fdr(ScanResult& result);

/// Orders findings by class (reversal first), then q-value, then size of the change (largest
/// first), then label for a stable order.
void rank_findings(ScanResult& result);

}  // namespace foldline
