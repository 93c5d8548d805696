#pragma once
// The part every kind of finding shares: what was stratified, its class, the reversal test and
// its false-discovery-rate q-value, the stability of the class under resampling, and the
// diagram's verdict with the adjusted estimate it points to. RateFinding, SlopeFinding and
// MeanFinding add their own figures beside it, so the memo, the JSON, the CSV, the project keys and the
// workbench render this part once for every kind.
#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/causal/verdict.h"
#include "core/scan/finding_class.h"

namespace foldline {

enum class FindingKind { Rate, Slope, Mean };

/// "rate", "slope" or "mean": the JSON "kind", the project key's kind and the CSV file names use it.
constexpr std::string_view to_string(FindingKind k) {
    switch (k) {
        case FindingKind::Rate: return "rate";
        case FindingKind::Slope: return "slope";
        case FindingKind::Mean: return "mean";
    }
    return "rate";
}

/// How often resampled data kept the finding's class.
struct Stability {
    double share = std::numeric_limits<double>::quiet_NaN();  ///< NaN when not resampled
    int draws = 0;                                            ///< resamples behind `share`; 0 = not run
    bool computed() const { return draws > 0 && std::isfinite(share); }
};

/// The estimate a diagram's verdict says answers the question.
struct AdjustedEstimate {
    enum class View { Pooled, Stratified, Standardised };
    View view = View::Pooled;
    std::vector<std::string> over;  ///< the set adjusted for (empty for the pooled view)
    std::string measure;            ///< "risk_difference", "slope" or "mean_difference"
    double estimate = 0, ci_low = 0, ci_high = 0;  ///< ci NaN when undefined
};

/// "pooled", "stratified" or "standardised".
constexpr std::string_view to_string(AdjustedEstimate::View v) {
    return v == AdjustedEstimate::View::Pooled ? "pooled"
           : v == AdjustedEstimate::View::Stratified ? "stratified"
                                                     : "standardised";
}

/// A diagram's verdict on one finding, computed once (core/audit/verdicts.h) and read by every
/// report and view.
struct FindingVerdict {
    causal::Verdict verdict;
    std::optional<AdjustedEstimate> estimate;  ///< nullopt: not identifiable, or undefined (see problem)
    std::string estimate_problem;              ///< why an estimate over another set could not be computed
};

/// How a finding relates to the other findings of its scan (core/scan/families.h).
enum class FamilyRole { Lead, Member, Proxy };

/// "lead", "member" or "proxy": the JSON and CSV "family_role".
constexpr std::string_view to_string(FamilyRole r) {
    return r == FamilyRole::Lead ? "lead" : r == FamilyRole::Member ? "member" : "proxy";
}

/// The family a finding belongs to: the label of the finding that leads it (for a rate finding,
/// in the same comparison), the finding's role in it, and the reason in plain words.
struct FindingFamily {
    std::string lead;  ///< empty until assign_families: the finding leads its own family
    FamilyRole role = FamilyRole::Lead;
    std::string reason;
};

struct FindingHeader {
    FindingKind kind = FindingKind::Rate;
    std::vector<std::string> strata;  ///< stratifier column names (1, or 2 for a pair)
    FindingClass cls = FindingClass::Stable;
    double p_reversal = std::numeric_limits<double>::quiet_NaN();  ///< intersection-union p; NaN when undefined
    double q_value = std::numeric_limits<double>::quiet_NaN();     ///< BH over the scan; NaN until apply_fdr
    Stability stability;
    std::optional<FindingVerdict> verdict;  ///< with a diagram only
    std::string verdict_problem;            ///< why the diagram could not judge this finding, else empty
    FindingFamily family;                   ///< filled by assign_families (core/scan/families.h)

    /// "product" or "product × branch"; "" when no stratifier is named.
    std::string label() const;
    /// The label of the family's lead: family.lead, or label() before families are assigned.
    std::string family_lead() const { return family.lead.empty() ? label() : family.lead; }
};

}  // namespace foldline
