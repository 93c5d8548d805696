#pragma once
// Kitagawa (1955, JASA 50:1168) two-factor decomposition of a crude rate gap, in the symmetric
// form of Das Gupta (1993): with group mixes c_gz = n_gz / n_g and rates r_gz,
//   R1 - R2 = sum_z [(c1z + c2z) / 2] (r1z - r2z)   [within-stratum part]
//           + sum_z [(r1z + r2z) / 2] (c1z - c2z)   [composition (mix) part]
// exactly, with no residual.
#include <vector>

#include "core/stats/stratified.h"

namespace foldline::stats {

struct Decomposition {
    double crude_gap;    ///< R1 - R2
    double within;       ///< rate (within-stratum) part
    double composition;  ///< mix part; within + composition == crude_gap up to rounding
};

/// Decomposition from mixes and rates given directly (shares need not sum to 1 exactly; they
/// are used as given). All NaN when the vectors differ in length or are empty.
Decomposition kitagawa(const std::vector<double>& mix1, const std::vector<double>& rate1,
                       const std::vector<double>& mix2, const std::vector<double>& rate2);

/// Decomposition of the focal - reference crude RD of a count cube over all strata with rows.
/// A stratum in which one group has no rows gets that group's rate set to the other group's
/// (its within part is then 0 and the identity stays exact). All NaN when a group has no rows.
Decomposition decompose_crude_rd(const Strata& strata);

}  // namespace foldline::stats
