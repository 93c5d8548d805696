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

/// E-value of a standardised mean difference d (a difference of means divided by the outcome's
/// SD) with standard error se, by VanderWeele & Ding's approximate conversion for a continuous
/// outcome (2017, Ann Intern Med 167:268, and its supplement; from memory, as the R package
/// EValue's evalues.MD applies it): RR ≈ exp(0.91 d), interval exp(0.91 (d ∓ z se)), z the
/// normal quantile of 1 − alpha/2 (0.91 × 1.96 ≈ 1.78, the published constant). The conversion
/// assumes a roughly normal outcome; it is a rough guide, not an exact bound.
struct SmdEValue {
    double rr;        ///< exp(0.91 d); NaN when d is NaN
    Interval rr_ci;   ///< NaN limits when se is NaN or <= 0
    EValue e;         ///< E-values of rr and of its CI limit nearer 1
};

/// The conversion above; every figure NaN for a NaN or infinite d.
SmdEValue e_value_smd(double d, double se, double alpha = 0.05);

}  // namespace foldline::stats
