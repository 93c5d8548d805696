#pragma once
// The words every finding, panel, JSON file and memo uses for what a stratified view did to the
// pooled comparison. Shared by the rate and the slope scans.
#include <string_view>

namespace foldline {

enum class FindingClass {
    Reversal,       ///< adjusted effect significant on the other side of the null from the crude one
    Explained,      ///< crude effect clearly present, adjusted effect consistent with none
    Masked,         ///< crude consistent with none, adjusted clearly present
    Heterogeneous,  ///< strata disagree in sign and homogeneity is rejected: quote no single figure
    Stable,         ///< none of the above
};

/// Lower-case name used in JSON, CLI and memo: "reversal", "explained", ...
constexpr std::string_view to_string(FindingClass c) {
    switch (c) {
        case FindingClass::Reversal: return "reversal";
        case FindingClass::Explained: return "explained";
        case FindingClass::Masked: return "masked";
        case FindingClass::Heterogeneous: return "heterogeneous";
        case FindingClass::Stable: return "stable";
    }
    return "stable";
}

/// Rank for ordering findings: reversal first, stable last.
constexpr int rank(FindingClass c) { return static_cast<int>(c); }

/// A reviewer's decision on a finding.
enum class Decision { Undecided, Upheld, SetAside, FollowUp };

constexpr std::string_view to_string(Decision d) {
    switch (d) {
        case Decision::Undecided: return "undecided";
        case Decision::Upheld: return "upheld";
        case Decision::SetAside: return "set aside";
        case Decision::FollowUp: return "follow up";
    }
    return "undecided";
}

}  // namespace foldline
