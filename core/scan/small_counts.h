#pragma once
// When the asymptotic tests of a rate finding cannot be trusted, and what replaces them.
//
// Adjusted test of no association. Mantel-Fleiss criterion (Mantel & Fleiss 1980, Am J
// Epidemiol 112:129, from memory): with E_k = n1 m1 / N, L_k = max(0, m1 - n0) and
// U_k = min(n1, m1) per stratum, the CMH chi-square is adequate when
// min(ΣE - ΣL, ΣU - ΣE) >= 5. Below that the class uses the exact conditional test
// (core/stats/exact_stratified.h); if the exact test is above its limits or the counts are
// weighted, the asymptotic p stands with a notice.
//
// Homogeneity. Breslow-Day validity (common practice: Cochran's rule for expected counts applied
// to the Breslow-Day fitted cells E, n1 - E, m1 - E, N - n1 - m1 + E at the MH odds ratio): the
// test is trusted unless more than 20% of those cells are below 5. Otherwise Zelen's exact test
// (core/stats/exact_homogeneity.h) decides; when it cannot be run, homogeneity is "not assessable
// with these counts" and the finding cannot be classed heterogeneous.
#include <string>
#include <string_view>
#include <vector>

#include "core/scan/classify.h"
#include "core/stats/exact_homogeneity.h"
#include "core/stats/exact_stratified.h"
#include "core/stats/stratified.h"

namespace foldline {

struct SmallCountOptions {
    double min_distance = 5;       ///< Mantel-Fleiss threshold
    double min_fitted = 5;         ///< a Breslow-Day fitted cell below this is small
    double max_small_share = 0.2;  ///< Breslow-Day trusted up to this share of small cells
    double max_tables = 1e5;       ///< Zelen enumeration limit
    double max_count_work = 5e7;   ///< Zelen: steps allowed to count the tables
    stats::ExactLimits limits;     ///< exact conditional test limits
};

struct MantelFleiss {
    double expected = 0;  ///< ΣE_k
    double lower = 0;     ///< ΣL_k
    double upper = 0;     ///< ΣU_k
    double distance = 0;  ///< min(ΣE - ΣL, ΣU - ΣE)
    bool satisfied = false;
};

/// Mantel-Fleiss quantities over strata with rows (strata with N = 0 add nothing). All zero and
/// not satisfied for no strata.
MantelFleiss mantel_fleiss(const stats::Strata& strata, double min_distance = 5);

struct BreslowDayValidity {
    std::size_t fitted_cells = 0;  ///< 4 per stratum with every margin positive
    std::size_t small_cells = 0;   ///< fitted below min_fitted
    double small_share = 0;        ///< small / fitted (0 when none)
    bool trusted = false;          ///< share <= max_small_share and at least one cell
};

/// Fitted cells of the Breslow-Day test at psi; not trusted when psi is not finite and positive.
BreslowDayValidity breslow_day_validity(const stats::Strata& strata, double psi, const SmallCountOptions& opt = {});

enum class AdjustedTestUsed { Cmh, Exact };
enum class HomogeneityUsed { BreslowDay, Zelen, NotAssessable };

/// "cmh", "exact"; "breslow_day", "zelen", "not_assessable" (JSON words).
std::string_view to_string(AdjustedTestUsed u);
std::string_view to_string(HomogeneityUsed u);

struct SmallCounts {
    MantelFleiss mantel_fleiss;
    bool exact_run = false;                    ///< the exact test was attempted (criterion failed)
    stats::ExactCommonOr exact;                ///< its figures (status says whether computed)
    std::vector<stats::ExactCommonOr> fisher;  ///< per stratum, in strata order, when exact_run
    AdjustedTestUsed adjusted_used = AdjustedTestUsed::Cmh;
    std::string adjusted_reason;               ///< one sentence: which test and why

    BreslowDayValidity breslow_day;
    bool zelen_run = false;
    stats::ZelenTest zelen;
    HomogeneityUsed homogeneity_used = HomogeneityUsed::BreslowDay;
    std::string homogeneity_reason;

    /// True when either decision departed from the asymptotic tests or could not.
    bool flagged() const { return !mantel_fleiss.satisfied || !breslow_day.trusted; }
};

/// Assesses one finding's strata. `psi` is the MH odds ratio (for the Breslow-Day fit). `full`
/// false skips the exact MLE, interval and per-stratum Fisher tests (p-values only, for
/// bootstrap resamples). `need_homogeneity` false skips Zelen's test.
SmallCounts assess_small_counts(const stats::Strata& strata, double psi, double alpha, bool full = true,
                                bool need_homogeneity = true, const SmallCountOptions& opt = {});

/// Puts the tests the assessment chose into the class inputs: the exact p-values when the exact
/// test is used (else left NaN), and the homogeneity p (Breslow-Day with Tarone's correction
/// `p_breslow_day`, Zelen's p, or NaN when not assessable).
void use_small_counts(const SmallCounts& sc, double p_breslow_day, ClassInputs& in);

}  // namespace foldline
