#include "ui/diagram_doc.h"

#include "core/causal/diagram_edit.h"
#include "ui/engine.h"
#include "ui/layered_layout.h"

#include <QSet>
#include <algorithm>
#include <cmath>
#include <functional>

namespace foldline::ui {

namespace {
QString qs(const std::string& s) { return QString::fromStdString(s); }
std::string ss(const QString& s) { return s.toStdString(); }
DiagramNode to_ui(const causal::DiagramNode& n) {
    return {qs(n.name), n.observed, QPointF(n.x.value_or(0), n.y.value_or(0))};
}
}  // namespace

DiagramDoc::DiagramDoc(QObject* parent) : QObject(parent) {}

void DiagramDoc::seed(const QString& exposure, const QString& outcome, const QStringList& strata) {
    exposure_ = exposure;
    outcome_ = outcome;
    strata_ = strata;
    // Built with the editor's edits, so the seed obeys the rules every later edit does; an edit
    // they refuse (a stratifier that is the exposure or named twice) is left out.
    causal::Diagram d;
    (void)causal::add_node(d, {ss(exposure), true, 0.0, 0.0});
    (void)causal::add_node(d, {ss(outcome), true, 360.0, 0.0});
    (void)causal::add_edge(d, ss(exposure), ss(outcome));
    double y = -140;
    for (const QString& s : strata) {
        if (!causal::add_node(d, {ss(s), true, 180.0, y})) continue;
        y -= 110;
    }
    (void)causal::set_question(d, ss(exposure), ss(outcome));
    d_ = std::move(d);
    confirmed_ = false;
    draft_.clear();
    emit structure_changed();
}

void DiagramDoc::set_confirmed(bool on) {
    if (confirmed_ == on) return;
    confirmed_ = on;
    emit structure_changed();
}

void DiagramDoc::set_draft(std::vector<DiagramEdge> draft) {
    draft_ = std::move(draft);
    emit structure_changed();
}

std::vector<DiagramEdge> DiagramDoc::draft_from_strata() const {
    causal::Diagram d = d_;
    std::vector<DiagramEdge> out;
    for (const QString& s : strata_)
        for (const QString& to : {exposure_, outcome_})
            if (causal::add_edge(d, ss(s), ss(to))) out.push_back({s, to});
    return out;
}

Status DiagramDoc::replace(const causal::Diagram& d) {
    causal::Diagram next = d;
    for (const QString& name : {exposure_, outcome_})
        if (!name.isEmpty() && next.find_node(ss(name)) < 0) (void)causal::add_node(next, {ss(name), true, 0.0, 0.0});
    if (auto st = causal::set_question(next, ss(exposure_), ss(outcome_)); !st) return st;
    d_ = std::move(next);
    confirmed_ = true;
    draft_.clear();
    emit structure_changed();
    return Ok{};
}

bool DiagramDoc::crowded() const {
    for (std::size_t i = 0; i < d_.nodes.size(); ++i)
        for (std::size_t j = i + 1; j < d_.nodes.size(); ++j) {
            const auto& a = d_.nodes[i];
            const auto& b = d_.nodes[j];
            if (!a.x || !a.y || !b.x || !b.y) return true;
            if (std::abs(*a.x - *b.x) < 170 && std::abs(*a.y - *b.y) < 80) return true;
        }
    return false;
}

void DiagramDoc::set_strata(const QStringList& strata) {
    strata_ = strata;
    emit structure_changed();
}

std::vector<DiagramNode> DiagramDoc::nodes() const {
    std::vector<DiagramNode> out;
    for (const auto& n : d_.nodes) out.push_back(to_ui(n));
    return out;
}

std::vector<DiagramEdge> DiagramDoc::edges() const {
    std::vector<DiagramEdge> out;
    for (const auto& e : d_.edges) out.push_back({qs(e.from), qs(e.to)});
    return out;
}

std::optional<DiagramNode> DiagramDoc::node(const QString& name) const {
    const int i = d_.find_node(ss(name));
    if (i < 0) return std::nullopt;
    return to_ui(d_.nodes[std::size_t(i)]);
}

bool DiagramDoc::has_edge(const QString& from, const QString& to) const {
    return std::any_of(d_.edges.begin(), d_.edges.end(),
                       [&](const causal::DiagramEdge& e) { return e.from == ss(from) && e.to == ss(to); });
}

QString DiagramDoc::check_node(const QString& name) const {
    if (auto st = causal::check_new_node(d_, ss(name)); !st) return tr("Node refused: %1.").arg(qs(st.error().message));
    return {};
}

QString DiagramDoc::check_edge(const QString& from, const QString& to) const {
    if (auto st = causal::check_new_edge(d_, ss(from), ss(to)); !st)
        return tr("Arrow %1 → %2 refused: %3.").arg(from, to, qs(st.error().message));
    return {};
}

bool DiagramDoc::add_node(const DiagramNode& n) {
    if (!causal::add_node(d_, {ss(n.name), n.observed, n.pos.x(), n.pos.y()})) return false;
    // A question node put back (an undone delete) is the question's again.
    if (n.name == exposure_ || n.name == outcome_) (void)causal::set_question(d_, ss(exposure_), ss(outcome_));
    emit structure_changed();
    return true;
}

bool DiagramDoc::remove_node(const QString& name) {
    if (!causal::remove_node(d_, ss(name))) return false;
    emit structure_changed();
    return true;
}

bool DiagramDoc::add_edge(const QString& from, const QString& to) {
    if (!causal::add_edge(d_, ss(from), ss(to))) return false;
    emit structure_changed();
    return true;
}

bool DiagramDoc::remove_edge(const QString& from, const QString& to) {
    if (!causal::remove_edge(d_, ss(from), ss(to))) return false;
    emit structure_changed();
    return true;
}

QString DiagramDoc::check_reverse(const QString& from, const QString& to) const {
    causal::Diagram d = d_;
    if (auto st = causal::remove_edge(d, ss(from), ss(to)); !st)
        return tr("Arrow %1 → %2 cannot be reversed: %3.").arg(from, to, qs(st.error().message));
    if (auto st = causal::check_new_edge(d, ss(to), ss(from)); !st)
        return tr("Arrow %1 → %2 cannot be reversed: %3.").arg(from, to, qs(st.error().message));
    return {};
}

bool DiagramDoc::reverse_edge(const QString& from, const QString& to) {
    if (!check_reverse(from, to).isEmpty()) return false;
    (void)causal::remove_edge(d_, ss(from), ss(to));
    (void)causal::add_edge(d_, ss(to), ss(from));
    emit structure_changed();
    return true;
}

QString DiagramDoc::check_rename(const QString& name, const QString& new_name) const {
    const auto n = node(name);
    if (!n) return tr("Node %1 is not in the diagram.").arg(name);
    if (name == exposure_ || name == outcome_)
        return tr("%1 is the question's %2: it keeps its name.").arg(name, name == exposure_ ? tr("exposure") : tr("outcome"));
    if (n->observed) return tr("%1 is a column of the data: it keeps its name.").arg(name);
    if (new_name == name) return {};
    return check_node(new_name);
}

bool DiagramDoc::rename_node(const QString& name, const QString& new_name) {
    if (!check_rename(name, new_name).isEmpty()) return false;
    if (!causal::rename_node(d_, ss(name), ss(new_name))) return false;
    emit structure_changed();
    return true;
}

bool DiagramDoc::set_observed(const QString& name, bool observed) {
    if (!causal::set_observed(d_, ss(name), observed)) return false;
    emit structure_changed();
    return true;
}

void DiagramDoc::move_node(const QString& name, QPointF pos) {
    if (!causal::move_node(d_, ss(name), pos.x(), pos.y())) return;
    emit node_moved(name, pos);
}

QHash<QString, QPointF> DiagramDoc::layout() const {
    // Layers by longest path from the sources (ui/layered_layout, as the memo lays out).
    std::vector<QString> names;
    for (const auto& n : d_.nodes) names.push_back(qs(n.name));
    std::vector<std::pair<int, int>> es;
    for (const auto& e : d_.edges) es.emplace_back(d_.find_node(e.from), d_.find_node(e.to));
    const std::vector<QPointF> at =
        layered_layout(names, es, d_.find_node(ss(exposure_)), d_.find_node(ss(outcome_)));
    QHash<QString, QPointF> pos;
    for (std::size_t i = 0; i < names.size(); ++i) pos[names[i]] = at[i];
    return pos;
}

void DiagramDoc::set_judge(Judge judge) {
    judge_ = std::move(judge);
    emit structure_changed();
}

DiagramVerdict DiagramDoc::verdict() const {
    if (!confirmed_) {
        DiagramVerdict v;
        v.unconfirmed = true;
        v.problem = tr("Nobody has drawn the arrows yet: apart from %1 → %2 the diagram claims nothing about what "
                       "causes what, so it cannot say which view answers the question. Draw the arrows you know, "
                       "or confirm the diagram as drawn.").arg(exposure_, outcome_);
        return v;
    }
    if (judge_) return judge_(d_, exposure_, outcome_, strata_);
    return judge(d_, exposure_, outcome_, strata_, nullptr, nullptr, project::AuditSpec{});
}

}  // namespace foldline::ui
