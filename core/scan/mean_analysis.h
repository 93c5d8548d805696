#pragma once
// Every figure and the class of one mean-gap comparison from its cells.
//
// The class comes from the one classifier (core/scan/classify.h), with the same rules and order
// as rates and slopes:
//   reversal       intersection-union test of the Welch crude difference and the fixed-effects
//                  difference (HC1 SE, t on N − K − 1 df) in opposite directions;
//   heterogeneous  informative strata disagree in the sign of their difference and the group ×
//                  stratum interaction F test rejects;
//   explained / masked / stable  by the two-sided tests of the same two figures.
// ClassInputs takes normal z values: each t statistic enters as the z with the same one-sided
// tail (stats::t_to_z), so every p-value the classifier forms equals the t test's.
#include <string>
#include <vector>

#include "core/scan/mean_finding.h"
#include "core/stats/mean_gap.h"

namespace foldline {

/// The class inputs of one comparison from its figures: crude Welch t and fixed-effects t (HC1
/// SE, N − K − 1 df) as z with the same one-sided tail, signs of the strata, interaction F p.
ClassInputs mean_class_inputs(const stats::CrudeMeans& crude, const stats::FixedEffectsGap& fixed_effects,
                              const stats::InteractionTest& interaction, bool strata_disagree);

/// The same from cells alone (what a resample needs: no per-stratum tables).
ClassInputs mean_class_inputs(const stats::MeanCells& cells, double alpha = 0.05);

/// The names a mean-gap finding carries.
struct MeanNames {
    std::string outcome;
    std::string focal, reference;
};

/// Every figure of one comparison from its cells. `labels[k]` are the per-stratifier labels of
/// stratum k (missing entries give an empty label); `strata_names` the stratifier columns.
/// Strata with no observation in either group are skipped. Class decided with the raw reversal
/// p (q_value = p_reversal until an FDR step). No cells, or a group with no observations, give
/// NaN figures and class stable.
MeanFinding analyse_mean_strata(const stats::MeanCells& cells, const std::vector<std::vector<std::string>>& labels,
                                const std::vector<std::string>& strata_names, const MeanNames& names,
                                double alpha = 0.05);

}  // namespace foldline
