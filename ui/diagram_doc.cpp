#include "ui/diagram_doc.h"

#include <QSet>
#include <algorithm>
#include <functional>

namespace foldline::ui {

QString role_title(const QString& role) {
    if (role == QLatin1String("exposure")) return QObject::tr("exposure");
    if (role == QLatin1String("outcome")) return QObject::tr("outcome");
    if (role == QLatin1String("confounder")) return QObject::tr("confounder");
    if (role == QLatin1String("mediator")) return QObject::tr("mediator");
    if (role == QLatin1String("collider")) return QObject::tr("collider");
    if (role == QLatin1String("collider_descendant")) return QObject::tr("after a collider");
    if (role == QLatin1String("outcome_descendant")) return QObject::tr("after the outcome");
    if (role == QLatin1String("instrument")) return QObject::tr("cause of exposure only");
    if (role == QLatin1String("precision")) return QObject::tr("cause of outcome only");
    if (role == QLatin1String("unrelated")) return QObject::tr("unrelated");
    return role;
}

DiagramDoc::DiagramDoc(QObject* parent) : QObject(parent) {}

void DiagramDoc::seed(const QString& exposure, const QString& outcome, const QStringList& strata) {
    nodes_.clear();
    edges_.clear();
    exposure_ = exposure;
    outcome_ = outcome;
    strata_ = strata;
    nodes_.push_back({exposure, true, {0, 0}});
    nodes_.push_back({outcome, true, {360, 0}});
    edges_.push_back({exposure, outcome});
    double y = -140;
    for (const QString& s : strata) {
        if (node(s)) continue;
        nodes_.push_back({s, true, {180, y}});
        edges_.push_back({s, exposure});
        edges_.push_back({s, outcome});
        y -= 110;
    }
    emit structure_changed();
}

void DiagramDoc::set_strata(const QStringList& strata) {
    strata_ = strata;
    emit structure_changed();
}

const DiagramNode* DiagramDoc::node(const QString& name) const {
    for (const auto& n : nodes_)
        if (n.name == name) return &n;
    return nullptr;
}

bool DiagramDoc::has_edge(const QString& from, const QString& to) const {
    return std::find(edges_.begin(), edges_.end(), DiagramEdge{from, to}) != edges_.end();
}

std::optional<QStringList> DiagramDoc::path_between(const QString& from, const QString& to) const {
    // Depth-first search along directed edges; returns the node path from → … → to.
    QSet<QString> seen;
    QStringList path;
    std::function<bool(const QString&)> dfs = [&](const QString& at) {
        path << at;
        if (at == to) return true;
        seen.insert(at);
        for (const auto& e : edges_)
            if (e.from == at && !seen.contains(e.to) && dfs(e.to)) return true;
        path.removeLast();
        return false;
    };
    if (dfs(from)) return path;
    return std::nullopt;
}

QString DiagramDoc::check_node(const QString& name) const {
    if (name.trimmed().isEmpty()) return tr("A node needs a name.");
    if (node(name)) return tr("\"%1\" is already in the diagram.").arg(name);
    return {};
}

QString DiagramDoc::check_edge(const QString& from, const QString& to) const {
    if (!node(from) || !node(to)) return tr("Both ends of an arrow must be nodes of the diagram.");
    if (from == to) return tr("An arrow cannot point from \"%1\" to itself.").arg(from);
    if (has_edge(from, to)) return tr("The arrow %1 → %2 is already drawn.").arg(from, to);
    if (auto back = path_between(to, from))
        return tr("That arrow would close a cycle: %1 → %2. A causal diagram cannot loop back on itself.")
            .arg(back->join(QStringLiteral(" → ")), to);
    return {};
}

bool DiagramDoc::add_node(const DiagramNode& n) {
    if (!check_node(n.name).isEmpty()) return false;
    nodes_.push_back(n);
    emit structure_changed();
    return true;
}

bool DiagramDoc::remove_node(const QString& name) {
    auto it = std::find_if(nodes_.begin(), nodes_.end(), [&](const DiagramNode& n) { return n.name == name; });
    if (it == nodes_.end()) return false;
    nodes_.erase(it);
    edges_.erase(std::remove_if(edges_.begin(), edges_.end(),
                                [&](const DiagramEdge& e) { return e.from == name || e.to == name; }),
                 edges_.end());
    emit structure_changed();
    return true;
}

bool DiagramDoc::add_edge(const QString& from, const QString& to) {
    if (!check_edge(from, to).isEmpty()) return false;
    edges_.push_back({from, to});
    emit structure_changed();
    return true;
}

bool DiagramDoc::remove_edge(const QString& from, const QString& to) {
    auto it = std::find(edges_.begin(), edges_.end(), DiagramEdge{from, to});
    if (it == edges_.end()) return false;
    edges_.erase(it);
    emit structure_changed();
    return true;
}

void DiagramDoc::move_node(const QString& name, QPointF pos) {
    for (auto& n : nodes_)
        if (n.name == name) {
            n.pos = pos;
            emit node_moved(name, pos);
        }
}

QHash<QString, QPointF> DiagramDoc::layout() const {
    // Layer = longest path from any source; the exposure is pinned to layer 0 when it is a source.
    QHash<QString, int> layer;
    for (const auto& n : nodes_) layer[n.name] = 0;
    for (std::size_t pass = 0; pass < nodes_.size(); ++pass) {
        bool changed = false;
        for (const auto& e : edges_)
            if (layer[e.to] < layer[e.from] + 1) layer[e.to] = layer[e.from] + 1, changed = true;
        if (!changed) break;
    }
    QHash<int, QStringList> by_layer;
    for (const auto& n : nodes_) by_layer[layer[n.name]] << n.name;
    // Exposure and outcome sit on one line; every other node goes above or below it in turn,
    // so arrows from a common cause to the outcome pass clear of the exposure.
    QHash<QString, QPointF> pos;
    for (auto it = by_layer.begin(); it != by_layer.end(); ++it) {
        QStringList names = it.value();
        std::sort(names.begin(), names.end());
        int k = 0;
        for (const QString& name : names) {
            double y = 0;
            if (name != exposure_ && name != outcome_) {
                y = (k % 2 == 0 ? -1.0 : 1.0) * (k / 2 + 1) * 120.0;
                ++k;
            }
            pos[name] = QPointF(it.key() * 220.0, y);
        }
    }
    return pos;
}

DiagramVerdict DiagramDoc::verdict() const {
    DiagramVerdict v;
    v.problem = tr("This build has no causal engine; the diagram can be drawn but not judged.");
    return v;
}

}  // namespace foldline::ui
