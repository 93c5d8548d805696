#pragma once
// E-value (VanderWeele & Ding 2017, Ann Intern Med 167:268): the minimum strength of
// association, on the risk-ratio scale, that an unmeasured confounder would need with both the
// exposure and the outcome to explain away an observed risk ratio.
#include "core/stats/proportions.h"

namespace foldline::stats {

struct EValue {
    double estimate;  ///< E-value of the point estimate
    double ci_limit;  ///< E-value of the CI limit nearer 1 (1 when the CI contains 1)
};

/// E-value of a risk ratio: RR + sqrt(RR (RR - 1)) for RR >= 1, the same on 1/RR for RR < 1.
/// NaN for RR <= 0, NaN or infinite.
double e_value(double rr);

/// E-values of an RR and of its CI limit nearer 1. ci_limit NaN when the CI is NaN.
EValue e_value(double rr, Interval ci);

}  // namespace foldline::stats
