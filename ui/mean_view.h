#pragma once
// What the findings panels show of a mean-gap finding (core/scan/mean_finding.h), copied into a
// FindingView: group means with their intervals, pooled and per stratum, the Welch, fixed-effects
// and standardised differences, the within / composition split and the further tests.
#include "core/scan/mean_finding.h"
#include "ui/finding_view.h"

namespace foldline::ui {

/// The view of one mean-gap finding; every number is core's. Empty strata table → no rows.
FindingView mean_view(const MeanFinding& f);

/// The caution shown beside mean-gap findings (core's pay-review sentence).
QString pay_review_caution();

}  // namespace foldline::ui
