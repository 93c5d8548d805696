#pragma once
// What the findings panels show of one finding, copied out of the engine's result so widgets
// never hold pointers into a scan that may be replaced. Filled by ui/engine.cpp only; every
// number here was computed by core/.
#include <QPointF>
#include <QString>
#include <QStringList>
#include <cmath>
#include <limits>
#include <vector>

#include "core/scan/finding.h"
#include "core/scan/finding_class.h"

namespace foldline::ui {

inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

/// An estimate with its confidence interval; NaN where the engine gave none.
struct Estimate {
    double value = kNaN, lo = kNaN, hi = kNaN;
    bool has_ci() const { return std::isfinite(lo) && std::isfinite(hi); }
};

/// One row of a 2-group table: a stratum, or the pooled total.
struct GroupRow {
    QString level;
    double pos_focal = 0, n_focal = 0, pos_reference = 0, n_reference = 0;
    Estimate rate_focal, rate_reference, rd;
    double selection_ratio = kNaN;
    bool informative = true;
    QString reason;  ///< why an uninformative stratum is left out of the adjusted figures
    // Mean gaps: n_focal / n_reference are the groups' observations, rd the Welch difference.
    Estimate mean_focal, mean_reference;  ///< group means with their t intervals
    double sd_focal = kNaN, sd_reference = kNaN;
};

/// One stratum of a slope finding.
struct SlopeRow {
    QString level;
    double n = 0;
    Estimate slope;
    double intercept = kNaN;
};

/// A further statistic of a finding, as the pooled table lists it.
struct StatLine {
    QString name, value, tip;
};

struct FindingView {
    int id = 0;                    ///< position in arrival order
    bool slope = false;            ///< false: rate finding; true: slope finding
    bool mean = false;             ///< a mean-gap finding (focal / reference are the groups)
    QString outcome;               ///< mean gaps: the numeric outcome
    FindingClass cls = FindingClass::Stable;
    QStringList strata;            ///< stratifying column(s)
    QString focal, reference;      ///< group labels (rates) or x / y names (slopes)
    QString effect_name;           ///< e.g. "risk difference" or "slope"
    QString adjusted_name;         ///< "adjusted difference (Mantel-Haenszel)" or "within-stratum slope"
    Estimate crude, adjusted;      ///< rates: pooled and Mantel-Haenszel risk differences
    Estimate standardised;         ///< rates: the difference directly standardised ("Standardised gap")
    double p_value = kNaN, q_value = kNaN, stability = kNaN;
    double within = kNaN, composition = kNaN;  ///< decomposition of the crude gap
    GroupRow pooled;
    std::vector<StatLine> more;    ///< MH figures, tests, E-value: shown under the pooled table
    QString small_counts;          ///< which tests decided the class and why, when counts are small
                                   ///< (core/scan/small_counts.h); empty when the asymptotic tests hold
    std::vector<GroupRow> rows;    ///< per stratum (rates)
    // Slopes.
    std::vector<SlopeRow> slope_rows;
    double pooled_intercept = kNaN;
    std::vector<QPointF> points;   ///< pooled scatter, possibly sampled
    std::vector<int> point_stratum;///< index into slope_rows per point
    QString points_note;           ///< e.g. "5,000 of 1,000,000 points, sampled evenly"
    // Family (core/scan/families.h): the label of the finding that leads it ("product"; the
    // finding's own label when it leads), its role there and core's reason in words.
    QString family_lead;
    FamilyRole family_role = FamilyRole::Lead;
    QString family_reason;
    // Reviewer.
    Decision decision = Decision::Undecided;
    QString note;
    QString applied_from;          ///< the family lead whose decision was applied here; empty when
                                   ///< the reviewer decided this finding itself

    QString strata_label() const { return strata.join(QStringLiteral(" × ")); }
    /// True when the finding sits beneath another finding's family (a member or a proxy).
    bool in_family() const { return family_role != FamilyRole::Lead && !family_lead.isEmpty(); }
};

}  // namespace foldline::ui
