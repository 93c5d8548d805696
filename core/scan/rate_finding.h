#pragma once
// Plain result structs of a rate scan: what the tables, forest plots, stratum-mix charts, the
// decomposition view, the memo and the JSON export read. No behaviour beyond small helpers.
#include <cstddef>
#include <string>
#include <vector>

#include "core/scan/classify.h"
#include "core/scan/finding.h"
#include "core/scan/finding_class.h"
#include "core/scan/small_counts.h"
#include "core/stats/decomposition.h"
#include "core/stats/evalue.h"
#include "core/stats/proportions.h"
#include "core/stats/standardize.h"
#include "core/stats/stratified.h"

namespace foldline {

/// One stratum of one comparison.
struct StratumRow {
    std::string level;                ///< "auto_loan" or, for a pair, "auto_loan | BR03"
    std::vector<std::string> levels;  ///< one label per stratifier
    double pos_focal = 0, n_focal = 0, pos_reference = 0, n_reference = 0;
    double rate_focal, rate_reference;              ///< NaN for a group with no rows
    stats::Interval rate_focal_ci, rate_reference_ci;  ///< Wilson
    double rd;                        ///< rate_focal - rate_reference
    stats::Interval rd_ci;            ///< Newcombe hybrid score
    double selection_ratio;           ///< rate_focal / rate_reference
    double share;                     ///< stratum's share of all rows in the comparison (mix chart)
    double share_focal, share_reference;  ///< stratum's share within each group
    bool informative = true;          ///< both groups have rows
    std::string reason;               ///< why not informative ("no focal rows"), else empty
};

struct CrudeFigures {
    double pos_focal = 0, n_focal = 0, pos_reference = 0, n_reference = 0;
    double rate_focal, rate_reference;
    stats::Interval rate_focal_ci, rate_reference_ci;
    double rd;
    stats::Interval rd_ci;            ///< Newcombe
    double rr, odds_ratio;            ///< 0.5 added to every cell only if one is zero
    double selection_ratio;           ///< focal / reference
    bool below_four_fifths = false;   ///< lower rate < 0.8 x higher rate (29 CFR 1607.4(D))
    double z, p;                      ///< single-table MH test, uncorrected (two-sided p)
};

struct AdjustedFigures {
    stats::Estimate mh_or;            ///< Robins-Breslow-Greenland CI
    stats::Estimate mh_rr;            ///< Greenland-Robins CI
    stats::RiskDifferenceMh mh_rd;    ///< Greenland-Robins CI (Sato SE beside it)
    stats::Standardized standardized; ///< back-door adjustment, standard = pooled stratum mix
};

/// A rate comparison stratified by one column or a pair (the shared part in FindingHeader:
/// strata, class, p_reversal, q_value, stability, verdict).
struct RateFinding : FindingHeader {
    RateFinding() { kind = FindingKind::Rate; }
    std::size_t comparison = 0;       ///< index into Question::focal
    std::string focal, reference;
    double rows_used = 0;             ///< weighted rows in the comparison with known strata

    CrudeFigures crude;
    AdjustedFigures adjusted;
    stats::CmhTest cmh;
    stats::BreslowDayTest breslow_day;  ///< psi = MH OR
    SmallCounts small_counts;           ///< validity of CMH / Breslow-Day and the exact tests used
    stats::Decomposition decomposition;
    stats::EValue e_value;              ///< of the MH RR and its CI limit nearer 1

    std::vector<StratumRow> strata_table;
    std::vector<std::string> uninformative;  ///< labels of strata left out of adjusted figures
    std::size_t informative_strata = 0;
    bool strata_disagree = false;       ///< informative strata with RD of both signs

    bool direction_flip = false;        ///< MH OR on the other side of 1 from the crude RD
    double change = 0;                  ///< |crude RD - MH RD|, for ranking
    ClassInputs class_inputs{};         ///< what the class was decided from (kept to re-decide)

    bool reversal() const { return cls == FindingClass::Reversal; }
};

}  // namespace foldline
