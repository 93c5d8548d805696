#pragma once
// Which view answers the question. For a finding stratified by a set S and the question "total
// effect of X on Y", the verdict compares S and the empty set under the generalised adjustment
// criterion (adjustment.h) and says, in one plain sentence, which table to believe:
//   stratified        S is valid, ∅ is not
//   pooled            ∅ is valid, S is not (S holds a mediator, collider or outcome descendant…)
//   both              both valid: they estimate the same effect; a gap is noise or heterogeneity
//   other_set         neither, but a set of observed columns is valid: standardise over it
//   not_identifiable  no set of observed columns is valid (names the unobserved nodes needed)
// It also answers the second question, the controlled direct effect "X on Y not through M"
// (M = the mediators in S): identified by adjustment when M ∪ Z is valid for the joint
// intervention on {X} ∪ M (Pearl 2001, "Direct and indirect effects", UAI; the joint-treatment
// form of the adjustment criterion, Shpitser et al. 2010), i.e. Z blocks the back-door paths
// of M → Y and of X → Y.
//
// The adjusted estimate itself is computed by the scan engine over `standardise_over`.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/causal/diagram.h"
#include "core/causal/roles.h"
#include "core/common/error.h"

namespace foldline::causal {

enum class Answer { Stratified, Pooled, Both, OtherSet, NotIdentifiable };

/// "stratified", "pooled", "both", "other_set", "not_identifiable".
std::string_view to_string(Answer a);

struct NamedRole {
    std::string name;
    Role role = Role::Unrelated;
    bool observed = true;
};

/// What the total effect of X on Y needs, independent of any finding (`foldline adjust`).
struct AdjustmentReport {
    std::string exposure;
    std::string outcome;
    std::vector<NamedRole> roles;                       ///< every other node, in diagram order
    bool empty_set_valid = false;                       ///< the pooled comparison is unbiased
    std::vector<std::vector<std::string>> minimal_sets; ///< all minimal valid sets of observed nodes
    bool truncated = false;                             ///< enumeration stopped at the cap
    std::optional<std::vector<std::string>> smallest;   ///< a smallest valid observed set; nullopt: none
    bool identifiable = false;
    std::vector<std::string> unobserved_needed;         ///< when not identifiable
    bool outcome_causes_exposure = false;
    std::string summary;                                ///< one plain sentence
};

/// The controlled direct effect "X on Y not through M".
struct DirectEffectNeeds {
    bool applies = false;                               ///< false when S holds no mediator
    std::vector<std::string> mediators;                 ///< M
    bool identifiable = false;
    bool stratifier_suffices = false;                   ///< conditioning on S alone is enough
    std::vector<std::string> conditioning_set;          ///< M ∪ a smallest extra set
    std::vector<std::vector<std::string>> extra_sets;   ///< all minimal extra sets Z
    std::string reason;
};

struct Verdict {
    Answer answer = Answer::NotIdentifiable;
    std::string exposure;
    std::string outcome;
    std::vector<std::string> stratifier;
    std::vector<NamedRole> stratifier_roles;
    bool stratifier_valid = false;
    bool empty_set_valid = false;
    std::vector<std::vector<std::string>> valid_sets;  ///< minimal valid sets of observed nodes
    /// The observed set whose standardised estimate answers the total effect: empty = pooled;
    /// nullopt when not identifiable by adjustment.
    std::optional<std::vector<std::string>> standardise_over;
    std::vector<std::string> unobserved_needed;
    std::vector<NamedRole> roles;
    std::string reason;  ///< one plain sentence
    DirectEffectNeeds direct_effect;
};

/// Analysis of the question (x, y) given as names; errors name the unknown/unobserved node.
Result<AdjustmentReport> analyse_adjustment(const CausalGraph& cg, std::string_view exposure,
                                            std::string_view outcome, std::size_t max_sets = 10000);

/// Verdict for a finding stratified by `stratifier` (column names; empty = the pooled view
/// itself, which gives "pooled"/"both" when ∅ is valid). Errors: unknown or unobserved
/// exposure/outcome/stratifier column, or a stratifier naming the exposure or outcome.
Result<Verdict> decide(const CausalGraph& cg, std::string_view exposure, std::string_view outcome,
                       const std::vector<std::string>& stratifier, std::size_t max_sets = 10000);

}  // namespace foldline::causal
