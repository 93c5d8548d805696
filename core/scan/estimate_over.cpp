#include "core/scan/estimate_over.h"

#include "core/scan/cube.h"
#include "core/scan/joint_strata.h"
#include "core/stats/mean_gap.h"
#include "core/stats/standardize.h"

#include <cmath>

namespace foldline {

Result<EstimateOver> standardised_rd_over(const Table& table, const RowCells& rows, const std::vector<std::string>& set,
                                          std::size_t comparison, double alpha, int bins, std::size_t max_levels) {
    auto joint = joint_stratifier(table, set, bins, max_levels);
    if (!joint) return joint.error();
    const CountCube cube = build_cube(*joint, rows, table.weights);
    const stats::Strata strata = comparison_strata(cube, comparison + 1);
    const stats::Standardized s = stats::standardized_rd(strata, alpha);
    EstimateOver e;
    e.over = set;
    e.estimate = s.rd;
    e.ci_low = s.rd_ci.lo;
    e.ci_high = s.rd_ci.hi;
    for (const auto& k : strata) e.strata += k.informative() ? 1 : 0;
    return e;
}

Result<EstimateOver> within_slope_over(const Table& table, const SlopeQuestion& question,
                                       const std::vector<std::string>& set, int bins, std::size_t max_levels) {
    auto joint = joint_stratifier(table, set, bins, max_levels);
    if (!joint) return joint.error();
    SlopeQuestion q = question;
    q.bootstrap = 0;  // the estimate only; stability belongs to the scan's findings
    auto f = check_slope(table, q, {&*joint});
    if (!f) return f.error();
    EstimateOver e;
    e.over = set;
    e.estimate = f->adjusted ? f->adjusted_within.slope : f->within.slope;
    e.ci_low = f->adjusted ? f->adjusted_within.ci_low : f->within.ci_low;
    e.ci_high = f->adjusted ? f->adjusted_within.ci_high : f->within.ci_high;
    e.strata = f->within.strata;
    return e;
}

Result<EstimateOver> fixed_effects_gap_over(const Table& table, const Question& groups, bool log_outcome,
                                            const std::vector<std::string>& set, std::size_t comparison,
                                            double alpha, int bins, std::size_t max_levels) {
    if (groups.outcome_column >= table.columns.size() || !table.columns[groups.outcome_column].is_numeric())
        return make_error("the outcome \"" + groups.outcome + "\" is not a numeric column of the table");
    auto joint = joint_stratifier(table, set, bins, max_levels);
    if (!joint) return joint.error();
    // The slot of each row's group (0 = reference, c + 1 = focal group c), as every scan reads it.
    const RowCells rows = encode_rows(table, groups);
    const std::vector<double>& y = table.columns[groups.outcome_column].values;
    const auto focal_slot = comparison + 1;
    stats::MeanCellBuilder cells(joint->levels.size());
    const auto missing = joint->missing_code();
    visit_codes(*joint, [&](const auto& codes) {
        for (std::size_t i = 0; i < table.rows; ++i) {
            if (rows.cell[i] == rows.unused() || codes[i] == missing) continue;
            const std::size_t slot = rows.cell[i] / 2;
            if (slot != 0 && slot != focal_slot) continue;
            double v = y[i];
            if (log_outcome) {
                if (!(v > 0)) continue;
                v = std::log(v);
            }
            cells.add(codes[i], slot == focal_slot, v, table.weight(i));
        }
    });
    const stats::FixedEffectsGap fe = stats::fixed_effects_difference(cells.cells(), alpha);
    EstimateOver e;
    e.over = set;
    e.estimate = fe.estimate;
    e.ci_low = fe.robust.ci_low;
    e.ci_high = fe.robust.ci_high;
    e.strata = fe.strata;
    return e;
}

}  // namespace foldline
