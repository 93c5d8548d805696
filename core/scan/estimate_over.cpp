#include "core/scan/estimate_over.h"

#include "core/scan/cube.h"
#include "core/scan/joint_strata.h"
#include "core/stats/standardize.h"

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

}  // namespace foldline
