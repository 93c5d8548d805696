#include "core/causal/roles.h"

#include "core/causal/adjustment.h"

namespace foldline::causal {

std::string_view to_string(Role r) {
    switch (r) {
        case Role::Exposure: return "exposure";
        case Role::Outcome: return "outcome";
        case Role::Mediator: return "mediator";
        case Role::OutcomeDescendant: return "outcome_descendant";
        case Role::MediatorDescendant: return "mediator_descendant";
        case Role::Confounder: return "confounder";
        case Role::Collider: return "collider";
        case Role::ColliderDescendant: return "collider_descendant";
        case Role::ExposureDescendant: return "exposure_descendant";
        case Role::ExposureCause: return "exposure_cause";
        case Role::OutcomeCause: return "outcome_cause";
        case Role::Unrelated: return "unrelated";
    }
    return "unrelated";
}

std::string_view describe(Role r) {
    switch (r) {
        case Role::Exposure: return "the exposure";
        case Role::Outcome: return "the outcome";
        case Role::Mediator: return "a mediator (it lies on a causal path from the exposure to the outcome)";
        case Role::OutcomeDescendant: return "a descendant of the outcome";
        case Role::MediatorDescendant: return "a descendant of a mediator";
        case Role::Confounder: return "a confounder (a common cause of the exposure and the outcome)";
        case Role::Collider: return "a collider (a common effect of the exposure's side and the outcome's side)";
        case Role::ColliderDescendant: return "a descendant of a collider";
        case Role::ExposureDescendant: return "an effect of the exposure off the causal paths";
        case Role::ExposureCause: return "a cause of the exposure only";
        case Role::OutcomeCause: return "a cause of the outcome only";
        case Role::Unrelated: return "unrelated to the question";
    }
    return "unrelated to the question";
}

bool always_biases(Role r) {
    return r == Role::Mediator || r == Role::MediatorDescendant || r == Role::OutcomeDescendant;
}

std::vector<Role> assign_roles(const Graph& g, int x, int y) {
    const int n = g.size();
    std::vector<Role> roles(static_cast<std::size_t>(n), Role::Unrelated);
    if (x < 0 || x >= n || y < 0 || y >= n || x == y) return roles;
    NodeMask xm = to_mask(n, {x});
    NodeMask an_x = ancestors(g, {x});
    NodeMask de_x = descendants(g, {x});
    NodeMask de_y = descendants(g, {y});
    NodeMask an_y_via = ancestors_avoiding(g, {y}, xm);  // causes of Y not through X
    NodeMask cn = to_mask(n, proper_causal_nodes(g, {x}, {y}));
    NodeMask de_cn = descendants(g, from_mask(cn));
    auto at = [](const NodeMask& m, int v) { return m[static_cast<std::size_t>(v)] != 0; };
    // X's side: X, its causes and its effects; Y's side: causes of Y not through X (excluding
    // Y itself, whose children are outcome descendants).
    auto x_side = [&](int v) { return at(an_x, v) || at(de_x, v); };
    auto y_side = [&](int v) { return v != y && at(an_y_via, v); };
    std::vector<int> colliders;
    for (int v = 0; v < n; ++v) {
        Role r = Role::Unrelated;
        if (v == x) r = Role::Exposure;
        else if (v == y) r = Role::Outcome;
        else if (at(cn, v)) r = Role::Mediator;
        else if (at(de_y, v)) r = Role::OutcomeDescendant;
        else if (at(de_cn, v)) r = Role::MediatorDescendant;
        else if (at(an_x, v) && at(an_y_via, v)) r = Role::Confounder;
        else {
            bool collider = false;
            for (int p : g.parents(v)) {
                if (!x_side(p)) continue;
                for (int q : g.parents(v))
                    if (q != p && y_side(q)) collider = true;
            }
            if (collider) r = Role::Collider;
        }
        roles[static_cast<std::size_t>(v)] = r;
        if (r == Role::Collider) colliders.push_back(v);
    }
    NodeMask de_col = descendants(g, colliders);
    for (int v = 0; v < n; ++v) {
        Role& r = roles[static_cast<std::size_t>(v)];
        if (r != Role::Unrelated) continue;
        if (at(de_col, v)) r = Role::ColliderDescendant;
        else if (at(de_x, v)) r = Role::ExposureDescendant;
        else if (at(an_x, v)) r = Role::ExposureCause;
        else if (at(an_y_via, v)) r = Role::OutcomeCause;
    }
    return roles;
}

Identifiability identifiability(const CausalGraph& cg, int x, int y) {
    Identifiability id;
    const int n = cg.size();
    if (x < 0 || x >= n || y < 0 || y >= n || x == y) return id;
    const Graph& g = cg.graph();
    id.outcome_causes_exposure = ancestors(g, {x})[static_cast<std::size_t>(y)] != 0;
    if (auto s = smallest_adjustment_set(g, {x}, {y}, cg.observed_mask())) {
        id.identifiable = true;
        id.smallest = *s;
        return id;
    }
    // Price observed nodes at 1 and unobserved ones above the cost of all observed nodes
    // together, so the cheapest set uses as few unobserved nodes as possible.
    std::vector<std::int64_t> cost(static_cast<std::size_t>(n));
    for (int v = 0; v < n; ++v) cost[static_cast<std::size_t>(v)] = cg.observed(v) ? 1 : n + 1;
    if (auto s = cheapest_adjustment_set(g, {x}, {y}, cost))
        for (int v : *s)
            if (!cg.observed(v)) id.unobserved_needed.push_back(v);
    return id;
}

}  // namespace foldline::causal
