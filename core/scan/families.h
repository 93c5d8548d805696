#pragma once
// Finding families: one story told once. A scan that stratifies by every column and every pair
// reports one real driver S again in every pair "S × T"; a family groups those findings under
// their simplest member, so lists, exports and the memo can state the explanation once.
//
// Rules (alpha = the scan's level; every family test below is corrected with Benjamini-Hochberg
// over all family tests of the scan, a false-discovery-rate family of its own):
//   member  a pair (S, T) joins the family of the flagged single S when it has S's class and adds
//           nothing beyond S: its adjusted estimate lies inside S's adjusted interval (rates: the
//           Mantel-Haenszel odds ratio inside S's Robins-Breslow-Greenland interval; slopes: the
//           within slope inside S's within-slope interval) and a test of further stratifying S by
//           T does not reject (rates: Breslow-Day with Tarone's correction, computed within each
//           level of S against that level's MH odds ratio, statistics and degrees of freedom
//           summed over S's levels; slopes: Cochran's Q of the stratum slopes around their
//           inverse-variance mean within each level of S, summed likewise). When both singles
//           qualify, the pair joins the better-ranked one.
//   lead    every other flagged finding leads its own family: a pair whose singles are not
//           flagged (the joint strata are the explanation), or one that adds to S.
//   proxy   two flagged singles that carry nearly the same information form one family, led by
//           the better-ranked one, the other named its proxy: one is a function of the other (each
//           level of one meets a single level of the other, e.g. a banded copy of a numeric
//           column), or Cramér's V between them is at least 0.7 (a common-practice threshold for
//           a strong association). The association is read from the pair's strata, so proxies
//           are found only in scans with pairs.
// Unflagged (stable) findings lead their own one-finding family and are not listed in families.
// Rate findings form families within their comparison; slope findings among themselves.
#include <cstddef>
#include <string>
#include <vector>

#include "core/scan/finding.h"

namespace foldline {

struct ScanResult;
struct RateFinding;
struct SlopeFinding;

/// Cramér's V of two stratifiers at or above which two flagged singles count as proxies
/// (common practice for a "strong" association).
inline constexpr double kProxyCramersV = 0.7;

/// A family in rank order: its lead, its class and the labels of the findings beneath it.
struct FindingFamilySummary {
    FindingKind kind = FindingKind::Rate;
    std::size_t comparison = 0;          ///< rate families: index into Question::focal
    std::string lead;                    ///< the lead's label ("product")
    FindingClass cls = FindingClass::Stable;  ///< the lead's class
    std::vector<std::string> proxies;    ///< singles shown with the lead, in rank order
    std::vector<std::string> members;    ///< pairs that add nothing beyond the lead (or a proxy)
    std::size_t size() const { return 1 + proxies.size() + members.size(); }
};

/// The test of further stratifying single S by T, read from the pair (S, T)'s strata.
struct FurtherStratifying {
    double statistic = 0;  ///< summed Breslow-Day (Tarone) or Cochran's Q; NaN when no level of S
                           ///< has two usable strata of T
    double df = 0;
    double p = 0;          ///< chi-square survival p; NaN when the statistic is
};

/// Within each level of the pair's stratifier `s_index` (0 or 1), Breslow-Day with Tarone's
/// correction of the pair's strata against that level's MH odds ratio, summed over S's levels.
FurtherStratifying further_stratifying(const RateFinding& pair, std::size_t s_index);
/// The same for slopes: Cochran's Q of the informative stratum slopes (finite, positive SE).
FurtherStratifying further_stratifying(const SlopeFinding& pair, std::size_t s_index);

/// Association of a pair's two stratifiers from the rows in its strata.
struct StrataAssociation {
    double cramers_v = 0;  ///< NaN when either stratifier has one level or there are no rows
    bool nested = false;   ///< every level of one stratifier meets exactly one level of the other
    std::string coarser;   ///< the stratifier that is a function of the other, when nested
};
StrataAssociation association(const RateFinding& pair);
StrataAssociation association(const SlopeFinding& pair);

/// Fills every finding's `family` and result.families (in the order rank_findings leaves the
/// findings; call it there). Findings that are not flagged lead their own families and are not
/// listed. An empty result stays empty.
void assign_families(ScanResult& result);

/// The family list in the findings' current order (lead order). Used by rank_findings.
std::vector<FindingFamilySummary> list_families(const ScanResult& result);

}  // namespace foldline
