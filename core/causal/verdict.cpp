#include "core/causal/verdict.h"

#include <algorithm>

#include "core/causal/adjustment.h"

namespace foldline::causal {

std::string_view to_string(Answer a) {
    switch (a) {
        case Answer::Stratified: return "stratified";
        case Answer::Pooled: return "pooled";
        case Answer::Both: return "both";
        case Answer::OtherSet: return "other_set";
        case Answer::NotIdentifiable: return "not_identifiable";
    }
    return "not_identifiable";
}

namespace {

// "a", "a and b", "a, b and c" with each name quoted.
std::string list_names(const std::vector<std::string>& names) {
    std::string out;
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (i > 0) out += (i + 1 == names.size()) ? " and " : ", ";
        out += quote_name(names[i]);
    }
    return out;
}

std::string set_phrase(const std::vector<std::string>& names) {
    return names.empty() ? std::string("nothing") : list_names(names);
}

std::vector<std::vector<std::string>> named_sets(const CausalGraph& cg, const std::vector<std::vector<int>>& sets) {
    std::vector<std::vector<std::string>> out;
    for (const auto& s : sets) out.push_back(cg.names_of(s));
    return out;
}

std::vector<NamedRole> named_roles(const CausalGraph& cg, const std::vector<Role>& roles, const std::vector<int>& nodes) {
    std::vector<NamedRole> out;
    for (int v : nodes) out.push_back({cg.name(v), roles[static_cast<std::size_t>(v)], cg.observed(v)});
    return out;
}

std::vector<int> others(int n, int x, int y) {
    std::vector<int> out;
    for (int v = 0; v < n; ++v)
        if (v != x && v != y) out.push_back(v);
    return out;
}

std::vector<std::string> of_role(const CausalGraph& cg, const std::vector<Role>& roles, Role r) {
    std::vector<std::string> out;
    for (int v = 0; v < cg.size(); ++v)
        if (roles[static_cast<std::size_t>(v)] == r) out.push_back(cg.name(v));
    return out;
}

// A member of S that biases the total effect whatever else is adjusted for, or a collider.
bool biasing(Role r) {
    return always_biases(r) || r == Role::Collider || r == Role::ColliderDescendant;
}

bool has_biasing_member(const std::vector<Role>& roles, const std::vector<int>& s, const NodeMask& forb) {
    return std::any_of(s.begin(), s.end(), [&](int u) {
        return forb[static_cast<std::size_t>(u)] || biasing(roles[static_cast<std::size_t>(u)]);
    });
}

// Why S cannot be used: members whose role biases any set containing them, else colliders.
std::string why_invalid(const CausalGraph& cg, const std::vector<Role>& roles, const std::vector<int>& s,
                        const NodeMask& forb) {
    std::vector<std::string> parts;
    for (int v : s) {
        Role r = roles[static_cast<std::size_t>(v)];
        if (biasing(r))
            parts.push_back(quote_name(cg.name(v)) + " is " + std::string(describe(r)));
        else if (forb[static_cast<std::size_t>(v)])
            parts.push_back(quote_name(cg.name(v)) + " is affected by the exposure through a causal path");
    }
    if (parts.empty()) return "it leaves a back-door path between the exposure and the outcome open";
    std::string out;
    for (std::size_t i = 0; i < parts.size(); ++i) {
        if (i > 0) out += (i + 1 == parts.size()) ? " and " : ", ";
        out += parts[i];
    }
    return out;
}

struct Core {
    int x = -1, y = -1;
    std::vector<Role> roles;
    SeparatorList minimal;
    bool empty_valid = false;
    Identifiability id;
};

Core analyse(const CausalGraph& cg, int x, int y, std::size_t max_sets) {
    Core c;
    c.x = x;
    c.y = y;
    const Graph& g = cg.graph();
    c.roles = assign_roles(g, x, y);
    c.minimal = minimal_adjustment_sets(g, {x}, {y}, cg.observed_mask(), max_sets);
    c.empty_valid = is_valid_adjustment(g, {x}, {y}, {});
    c.id = identifiability(cg, x, y);
    return c;
}

std::string not_identifiable_reason(const CausalGraph& cg, const Core& c, const std::string& question) {
    if (c.id.outcome_causes_exposure)
        return "The diagram has " + quote_name(cg.name(c.y)) + " causing " + quote_name(cg.name(c.x)) +
               ", so it allows no effect of " + question + " and no adjustment set exists.";
    if (!c.id.unobserved_needed.empty())
        return "The " + question + " is not identifiable by adjustment from this diagram: no set of observed columns "
               "is valid, and the unobserved " + list_names(cg.names_of(c.id.unobserved_needed)) +
               " would have to be measured.";
    return "The " + question + " is not identifiable by adjustment from this diagram, even if every variable were "
           "measured.";
}

}  // namespace

Result<AdjustmentReport> analyse_adjustment(const CausalGraph& cg, std::string_view exposure,
                                            std::string_view outcome, std::size_t max_sets) {
    auto q = cg.question(exposure, outcome);
    if (!q) return q.error();
    auto [x, y] = *q;
    Core c = analyse(cg, x, y, max_sets);
    AdjustmentReport r;
    r.exposure = cg.name(x);
    r.outcome = cg.name(y);
    r.roles = named_roles(cg, c.roles, others(cg.size(), x, y));
    r.empty_set_valid = c.empty_valid;
    r.minimal_sets = named_sets(cg, c.minimal.sets);
    r.truncated = c.minimal.truncated;
    r.identifiable = c.id.identifiable;
    if (c.id.identifiable) r.smallest = cg.names_of(c.id.smallest);
    r.unobserved_needed = cg.names_of(c.id.unobserved_needed);
    r.outcome_causes_exposure = c.id.outcome_causes_exposure;
    const std::string question = "total effect of " + quote_name(r.exposure) + " on " + quote_name(r.outcome);
    if (c.empty_valid)
        r.summary = "The pooled comparison answers the " + question + "; no adjustment is needed.";
    else if (c.id.identifiable)
        r.summary = "The " + question + " needs adjustment; the smallest valid set is " + set_phrase(*r.smallest) + ".";
    else
        r.summary = not_identifiable_reason(cg, c, question);
    return r;
}

Result<Verdict> decide(const CausalGraph& cg, std::string_view exposure, std::string_view outcome,
                       const std::vector<std::string>& stratifier, std::size_t max_sets) {
    auto q = cg.question(exposure, outcome);
    if (!q) return q.error();
    auto [x, y] = *q;
    std::vector<int> s;
    for (const auto& name : stratifier) {
        int v = cg.index_of(name);
        if (v < 0) return make_error("stratifier " + quote_name(name) + " is not a node of the diagram");
        if (!cg.observed(v))
            return make_error("stratifier " + quote_name(name) + " is a data column but the diagram marks it unobserved");
        if (v == x || v == y)
            return make_error("stratifier " + quote_name(name) + " is the exposure or the outcome itself");
        if (std::find(s.begin(), s.end(), v) == s.end()) s.push_back(v);
    }
    const Graph& g = cg.graph();
    Core c = analyse(cg, x, y, max_sets);
    NodeMask forb = forbidden_nodes(g, {x}, {y});

    Verdict v;
    v.exposure = cg.name(x);
    v.outcome = cg.name(y);
    v.stratifier = cg.names_of(s);
    v.stratifier_roles = named_roles(cg, c.roles, s);
    v.roles = named_roles(cg, c.roles, others(cg.size(), x, y));
    v.empty_set_valid = c.empty_valid;
    v.stratifier_valid = is_valid_adjustment(g, {x}, {y}, s);
    v.valid_sets = named_sets(cg, c.minimal.sets);
    v.unobserved_needed = cg.names_of(c.id.unobserved_needed);

    const std::string question = "total effect of " + quote_name(v.exposure) + " on " + quote_name(v.outcome);
    const std::string by = "stratifying by " + set_phrase(v.stratifier);
    if (s.empty() || (v.stratifier_valid && v.empty_set_valid)) {
        if (c.empty_valid) {
            v.answer = s.empty() ? Answer::Pooled : Answer::Both;
            v.standardise_over = std::vector<std::string>{};
            v.reason = s.empty()
                           ? "The pooled view answers the " + question + ": the diagram leaves no back-door path open."
                           : "Both views estimate the same " + question + ": neither the pooled comparison nor " + by +
                                 " is biased by the diagram, so a difference between them is sampling noise or "
                                 "an effect that differs across strata.";
        }
    }
    if (!s.empty() && v.stratifier_valid && !v.empty_set_valid) {
        v.answer = Answer::Stratified;
        v.standardise_over = v.stratifier;
        auto conf = of_role(cg, c.roles, Role::Confounder);
        std::string why = conf.empty() ? std::string("the pooled comparison has an open back-door path")
                                       : "the pooled comparison is confounded by " + list_names(conf);
        v.reason = "The stratified view answers the " + question + ": " + by + " blocks every back-door path, while " +
                   why + ".";
    } else if (!s.empty() && !v.stratifier_valid && v.empty_set_valid) {
        v.answer = Answer::Pooled;
        v.standardise_over = std::vector<std::string>{};
        v.reason = "The pooled view answers the " + question + ": it needs no adjustment, and " + by +
                   " introduces bias because " + why_invalid(cg, c.roles, s, forb) + ".";
    } else if (!v.stratifier_valid && !v.empty_set_valid) {
        if (c.id.identifiable) {
            v.answer = Answer::OtherSet;
            // Prefer the minimal set sharing most columns with S, then the smallest.
            std::vector<int> best = c.id.smallest;
            std::size_t best_overlap = 0;
            for (const auto& m : c.minimal.sets) {
                std::size_t overlap = 0;
                for (int u : m)
                    if (std::find(s.begin(), s.end(), u) != s.end()) ++overlap;
                if (overlap > best_overlap || (overlap == best_overlap && overlap > 0 && m.size() < best.size())) {
                    best = m;
                    best_overlap = overlap;
                }
            }
            v.standardise_over = cg.names_of(best);
            v.reason = "Neither view answers the " + question + ": the pooled comparison is confounded and " +
                       (s.empty() ? std::string("no stratifier was given")
                        : has_biasing_member(c.roles, s, forb)
                            ? by + " is itself biased because " + why_invalid(cg, c.roles, s, forb)
                            : by + " is not enough because " + why_invalid(cg, c.roles, s, forb)) +
                       "; standardise over " + set_phrase(*v.standardise_over) + " instead.";
        } else {
            v.answer = Answer::NotIdentifiable;
            v.reason = not_identifiable_reason(cg, c, question);
        }
    }

    // The controlled direct effect, when S holds mediators.
    DirectEffectNeeds& d = v.direct_effect;
    std::vector<int> m, rest;
    for (int u : s) (c.roles[static_cast<std::size_t>(u)] == Role::Mediator ? m : rest).push_back(u);
    d.applies = !m.empty();
    if (d.applies) {
        d.mediators = cg.names_of(m);
        std::vector<int> joint{x};
        joint.insert(joint.end(), m.begin(), m.end());
        const std::string dq = "effect of " + quote_name(v.exposure) + " on " + quote_name(v.outcome) + " not through " +
                               list_names(d.mediators);
        SeparatorList extra = minimal_adjustment_sets(g, joint, {y}, cg.observed_mask(), max_sets);
        d.extra_sets = named_sets(cg, extra.sets);
        auto smallest = smallest_adjustment_set(g, joint, {y}, cg.observed_mask());
        d.identifiable = smallest.has_value();
        d.stratifier_suffices = is_valid_adjustment(g, joint, {y}, rest);
        if (d.stratifier_suffices) {
            d.conditioning_set = v.stratifier;
            d.reason = "For the " + dq + " (controlled direct effect), " + by + " is enough: it holds the mediator "
                       "fixed and leaves no back-door path open.";
        } else if (d.identifiable) {
            std::vector<int> cond = m;
            cond.insert(cond.end(), smallest->begin(), smallest->end());
            d.conditioning_set = cg.names_of(cond);
            d.reason = "For the " + dq + " (controlled direct effect), condition on " + list_names(d.mediators) +
                       " together with " + set_phrase(cg.names_of(*smallest)) +
                       ", which blocks the back-door paths from the mediator and the exposure to the outcome.";
        } else {
            d.reason = "The " + dq + " (controlled direct effect) is not identifiable by adjustment from this diagram.";
        }
    }
    return v;
}

}  // namespace foldline::causal
