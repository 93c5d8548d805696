#pragma once
// One claim of a diagram tested on the data: plain data read by the JSON, the memo, the
// command line and the workbench. Filled by core/audit/diagram_checks.h.
#include <string>
#include <vector>

#include "core/causal/implications.h"
#include "core/stats/conditional_independence.h"

namespace foldline::causal {

enum class CheckMethod { None, GSquared, PartialCorrelation };

/// "none", "g-squared" or "partial-correlation" (the JSON's words).
const char* to_string(CheckMethod m);

struct DiagramCheck {
    std::string a;                    ///< the pair, in the diagram's node order
    std::string b;
    std::vector<std::string> given;   ///< conditioning set, in the diagram's node order
    ClaimForm form = ClaimForm::Parents;
    std::vector<std::string> unobserved;  ///< untestable claims: the unobserved nodes of `given`
    CheckMethod method = CheckMethod::None;
    stats::CiTest test;               ///< statistic, df, p, n (method None: not run)
    double q = 0;                     ///< Benjamini-Hochberg q within the diagram's tests; NaN if untested
    bool contradicted = false;        ///< q < alpha
    std::string note;                 ///< why a claim could not be tested, else empty
    std::string sentence;             ///< the plain sentence shown to the reviewer
};

struct DiagramChecks {
    std::vector<DiagramCheck> checks;
    double alpha = 0.05;   ///< the level q is judged at (the audit's alpha)
    int tested = 0;        ///< claims with a p-value
    int contradicted = 0;  ///< claims with q < alpha
    std::string problem;   ///< why the diagram could not be checked at all, else empty
};

}  // namespace foldline::causal
