#pragma once
// The diagram being edited, as the editor sees it: the causal graph (held by the engine) plus
// where each node sits on the canvas. Every edit goes through here and is announced by a
// signal; the scene's items only mirror it, and the undo commands only call it. The edits
// themselves, and what they refuse, are core/causal/diagram_edit's: this class only converts.
#include <QHash>
#include <QObject>
#include <QPointF>
#include <QString>
#include <QStringList>
#include <functional>
#include <optional>
#include <vector>

#include "core/causal/diagram.h"
#include "core/causal/verdict.h"

namespace foldline::ui {

struct DiagramNode {
    QString name;
    bool observed = true;
    QPointF pos;
};

struct DiagramEdge {
    QString from, to;
    bool operator==(const DiagramEdge& o) const { return from == o.from && to == o.to; }
};

/// What the engine concludes from the diagram for one stratification.
struct DiagramVerdict {
    bool computed = false;        ///< false when the engine is missing or the diagram is invalid
    std::optional<causal::Answer> answer;  ///< which view answers; set when computed
    QString recommended;          ///< the view to quote, in words
    QString reason;               ///< one plain sentence
    QHash<QString, causal::Role> roles;///< node → role; a node absent has none (no verdict)
    QList<QStringList> valid_sets;///< minimal valid adjustment sets
    QStringList standardise_over; ///< the set whose adjusted figure answers the question (other_set)
    QString adjusted;             ///< the estimate the verdict points to, in words, when there is one
    QString direct_effect;        ///< what the direct effect "not through the mediators" needs
    QString problem;              ///< why no verdict (invalid diagram), empty otherwise
    bool unconfirmed = false;     ///< no verdict because nobody has drawn or confirmed the arrows
};

class DiagramDoc : public QObject {
    Q_OBJECT
public:
    explicit DiagramDoc(QObject* parent = nullptr);

    /// Starts a new diagram from the exposure, the outcome and the stratifiers with one arrow,
    /// exposure → outcome: no causal claim nobody made. The diagram is unconfirmed (no verdict)
    /// until the reviewer draws or removes an arrow, accepts a draft or confirms it as drawn.
    void seed(const QString& exposure, const QString& outcome, const QStringList& strata);
    /// Replaces the graph with `d` (a diagram read from a file). The current exposure and
    /// outcome stay the question's: they are added as observed nodes if `d` lacks them. A
    /// diagram that marks either unobserved is refused (Error, nothing changed). A diagram
    /// someone saved is confirmed; any draft is dropped.
    Status replace(const causal::Diagram& d);

    /// Whether the arrows are the reviewer's (drawn, accepted or confirmed as drawn): only then
    /// does verdict() give one. The undo commands set and restore it.
    bool confirmed() const { return confirmed_; }
    void set_confirmed(bool on);
    /// Arrows offered as a draft, shown dashed and never judged, saved or exported until the
    /// reviewer accepts them (then they are ordinary arrows).
    std::vector<DiagramEdge> draft() const { return draft_; }
    void set_draft(std::vector<DiagramEdge> draft);
    /// The draft "every stratifier causes both the exposure and the outcome" for the current
    /// strata: only arrows the diagram lacks and can take (no cycle), in order.
    std::vector<DiagramEdge> draft_from_strata() const;
    /// True when two nodes sit closer than a node's size (positions from elsewhere).
    bool crowded() const;
    /// The finding's stratifiers the verdict is about.
    void set_strata(const QStringList& strata);

    /// Nodes and arrows in diagram order (copies of the engine's diagram).
    std::vector<DiagramNode> nodes() const;
    std::vector<DiagramEdge> edges() const;
    std::optional<DiagramNode> node(const QString& name) const;
    /// The diagram as the engine holds it (for saving and export).
    const causal::Diagram& diagram() const { return d_; }
    bool has_edge(const QString& from, const QString& to) const;
    QString exposure() const { return exposure_; }
    QString outcome() const { return outcome_; }
    QStringList strata() const { return strata_; }

    /// Why the edit cannot be made (empty when it can), in core/causal/diagram_edit's words:
    /// unknown node, self-loop, duplicate, or a cycle (named by its path); a blank or used name.
    QString check_edge(const QString& from, const QString& to) const;
    QString check_node(const QString& name) const;

    // Edits. Each returns false (changing nothing) when the edit is invalid.
    bool add_node(const DiagramNode& n);
    bool remove_node(const QString& name);
    bool add_edge(const QString& from, const QString& to);
    bool remove_edge(const QString& from, const QString& to);
    /// Why from → to cannot be turned round (empty when it can): absent, or the reversed arrow
    /// would close a cycle through other arrows.
    QString check_reverse(const QString& from, const QString& to) const;
    /// Turns from → to round into to → from (one change, one signal).
    bool reverse_edge(const QString& from, const QString& to);
    /// Why `name` cannot become `new_name` (empty when it can): the question's exposure and
    /// outcome and the data's columns keep their names; blank or used names are refused.
    QString check_rename(const QString& name, const QString& new_name) const;
    bool rename_node(const QString& name, const QString& new_name);
    /// Marks a node measured (a data column) or not; the exposure and outcome stay measured.
    bool set_observed(const QString& name, bool observed);
    void move_node(const QString& name, QPointF pos);
    /// Positions in layers by longest path from the sources (exposure far left).
    QHash<QString, QPointF> layout() const;

    /// How verdicts are computed (ui/engine judge, i.e. core/audit): the diagram, the question's
    /// exposure and outcome, and the strata. The default judges the diagram alone (no estimate).
    using Judge = std::function<DiagramVerdict(const causal::Diagram&, const QString& exposure,
                                               const QString& outcome, const QStringList& strata)>;
    void set_judge(Judge judge);
    /// The verdict for the current diagram and strata.
    DiagramVerdict verdict() const;

signals:
    void structure_changed();
    void node_moved(const QString& name, QPointF pos);

private:
    Judge judge_;
    causal::Diagram d_;
    QString exposure_, outcome_;
    QStringList strata_;
    bool confirmed_ = true;
    std::vector<DiagramEdge> draft_;
};

}  // namespace foldline::ui
