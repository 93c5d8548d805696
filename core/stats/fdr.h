#pragma once
// Benjamini-Hochberg (1995, JRSS B 57:289) false-discovery-rate adjustment.
#include <vector>

namespace foldline::stats {

/// BH q-values in the input order: q_(i) = min over j >= i of m p_(j) / j, capped at 1, with m
/// the number of finite p-values. NaN p-values stay NaN and do not count in m. Empty -> empty.
std::vector<double> benjamini_hochberg(const std::vector<double>& p);

}  // namespace foldline::stats
