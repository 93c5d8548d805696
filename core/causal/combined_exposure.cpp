#include "core/causal/combined_exposure.h"

#include <algorithm>

namespace foldline::causal {

Diagram combine_exposure(const Diagram& d, const std::vector<std::string>& parts, const std::string& name) {
    if (parts.empty() || d.find_node(name) >= 0) return d;
    for (const auto& p : parts)
        if (d.find_node(p) < 0) return d;
    auto is_part = [&](const std::string& n) { return std::find(parts.begin(), parts.end(), n) != parts.end(); };
    Diagram out;
    DiagramNode combined{name, true, std::nullopt, std::nullopt};
    double sx = 0, sy = 0;
    int placed = 0;
    bool inserted = false;
    for (const auto& n : d.nodes) {
        if (!is_part(n.name)) {
            out.nodes.push_back(n);
            continue;
        }
        if (n.x && n.y) {
            sx += *n.x;
            sy += *n.y;
            ++placed;
        }
        if (!inserted) {
            out.nodes.push_back(combined);  // where the first part stood, so the order stays stable
            inserted = true;
        }
    }
    if (placed == static_cast<int>(parts.size())) {
        auto& c = out.nodes[static_cast<std::size_t>(out.find_node(name))];
        c.x = sx / placed;
        c.y = sy / placed;
    }
    auto mapped = [&](const std::string& n) { return is_part(n) ? name : n; };
    for (const auto& e : d.edges) {
        DiagramEdge m{mapped(e.from), mapped(e.to)};
        if (m.from == m.to) continue;
        if (std::none_of(out.edges.begin(), out.edges.end(),
                         [&](const DiagramEdge& o) { return o.from == m.from && o.to == m.to; }))
            out.edges.push_back(std::move(m));
    }
    out.exposure = is_part(d.exposure) ? name : d.exposure;
    out.outcome = d.outcome;
    return out;
}

}  // namespace foldline::causal
