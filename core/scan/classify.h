#pragma once
// The rules that give each comparison its class. Written out in the README ("Finding classes").
//
//   reversal       the crude and the adjusted effect are both significant and on opposite sides
//                  of the null: an intersection-union test whose p-value is the larger of the two
//                  one-sided p-values (crude in its own direction, adjusted in the opposite one);
//                  the class needs the BH q-value of that p at or below alpha (FDR control over
//                  everything scanned) and the adjusted point estimate on the other side.
//   heterogeneous  strata disagree in the sign of their effect and the homogeneity test rejects
//                  at alpha: no single adjusted figure should be quoted.
//   explained      crude effect clearly present (two-sided p <= alpha), adjusted consistent with
//                  none (two-sided p > alpha).
//   masked         crude consistent with none, adjusted clearly present.
//   stable         none of these.
// They are tried in this order; the first that holds is the class.
#include <limits>

#include "core/scan/finding_class.h"

namespace foldline {

struct ClassInputs {
    double crude_effect;     ///< signed crude effect (RD, or slope); sign gives the direction
    double crude_z;          ///< signed z of the crude test
    double adjusted_effect;  ///< signed adjusted effect on a scale where 0 is the null (ln OR, slope)
    double adjusted_z;       ///< signed z of the adjusted test
    bool strata_disagree;    ///< some informative strata point each way
    double p_homogeneity;    ///< homogeneity test p (NaN when it could not be run)
    /// Exact conditional p-values of the adjusted test (core/scan/small_counts.h), used instead
    /// of adjusted_z when not NaN: two-sided, and one-sided towards a larger / smaller odds ratio.
    double adjusted_p_exact = std::numeric_limits<double>::quiet_NaN();
    double adjusted_p_exact_greater = std::numeric_limits<double>::quiet_NaN();
    double adjusted_p_exact_less = std::numeric_limits<double>::quiet_NaN();
};

/// One-sided intersection-union p-value for "crude and adjusted significant in opposite
/// directions": max(P(Z > |z_crude|), P(Z > -sign(crude) z_adjusted)), the second term being
/// the exact one-sided p against the crude direction when the exact test is in use. 1 when the
/// crude effect is 0 or any input is NaN.
double reversal_p(const ClassInputs& in);

/// True when the adjusted point estimate lies on the other side of the null from the crude one.
bool direction_flips(const ClassInputs& in);

/// The class by the rules above, with `reversal_evidence` the figure compared with alpha for a
/// reversal (its q-value in a scan, its raw p inside a bootstrap resample).
FindingClass classify(const ClassInputs& in, double reversal_evidence, double alpha);

}  // namespace foldline
