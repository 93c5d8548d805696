#include "ui/diagram_commands.h"

#include <QObject>

namespace foldline::ui {

AddNodeCommand::AddNodeCommand(DiagramDoc* doc, DiagramNode node) : doc_(doc), node_(std::move(node)) {
    setText(QObject::tr("add %1").arg(node_.name));
}
void AddNodeCommand::redo() { doc_->add_node(node_); }
void AddNodeCommand::undo() { doc_->remove_node(node_.name); }

RemoveNodeCommand::RemoveNodeCommand(DiagramDoc* doc, const QString& name) : doc_(doc) {
    if (auto n = doc->node(name)) node_ = *n;
    for (const auto& e : doc->edges())
        if (e.from == name || e.to == name) edges_.push_back(e);
    setText(QObject::tr("delete %1").arg(name));
}
void RemoveNodeCommand::redo() { doc_->remove_node(node_.name); }
void RemoveNodeCommand::undo() {
    doc_->add_node(node_);
    for (const auto& e : edges_) doc_->add_edge(e.from, e.to);
}

AddEdgeCommand::AddEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to)
    : doc_(doc), from_(from), to_(to) {
    setText(QObject::tr("arrow %1 → %2").arg(from, to));
}
void AddEdgeCommand::redo() {
    was_confirmed_ = doc_->confirmed();
    doc_->add_edge(from_, to_);
    doc_->set_confirmed(true);
}
void AddEdgeCommand::undo() {
    doc_->remove_edge(from_, to_);
    doc_->set_confirmed(was_confirmed_);
}

RemoveEdgeCommand::RemoveEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to)
    : doc_(doc), from_(from), to_(to) {
    setText(QObject::tr("delete arrow %1 → %2").arg(from, to));
}
void RemoveEdgeCommand::redo() {
    was_confirmed_ = doc_->confirmed();
    doc_->remove_edge(from_, to_);
    doc_->set_confirmed(true);
}
void RemoveEdgeCommand::undo() {
    doc_->add_edge(from_, to_);
    doc_->set_confirmed(was_confirmed_);
}

ReverseEdgeCommand::ReverseEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to)
    : doc_(doc), from_(from), to_(to) {
    setText(QObject::tr("reverse arrow %1 → %2").arg(from, to));
}
void ReverseEdgeCommand::redo() {
    was_confirmed_ = doc_->confirmed();
    doc_->reverse_edge(from_, to_);
    doc_->set_confirmed(true);
}
void ReverseEdgeCommand::undo() {
    doc_->reverse_edge(to_, from_);
    doc_->set_confirmed(was_confirmed_);
}

ConfirmDiagramCommand::ConfirmDiagramCommand(DiagramDoc* doc) : doc_(doc) {
    setText(QObject::tr("use the diagram as drawn"));
}
void ConfirmDiagramCommand::redo() {
    was_confirmed_ = doc_->confirmed();
    doc_->set_confirmed(true);
}
void ConfirmDiagramCommand::undo() { doc_->set_confirmed(was_confirmed_); }

SetDraftCommand::SetDraftCommand(DiagramDoc* doc, std::vector<DiagramEdge> draft, const QString& text)
    : doc_(doc), before_(doc->draft()), after_(std::move(draft)) {
    setText(text);
}
void SetDraftCommand::redo() { doc_->set_draft(after_); }
void SetDraftCommand::undo() { doc_->set_draft(before_); }

RenameNodeCommand::RenameNodeCommand(DiagramDoc* doc, const QString& name, const QString& new_name)
    : doc_(doc), name_(name), new_name_(new_name) {
    setText(QObject::tr("rename %1 to %2").arg(name, new_name));
}
void RenameNodeCommand::redo() { doc_->rename_node(name_, new_name_); }
void RenameNodeCommand::undo() { doc_->rename_node(new_name_, name_); }

SetObservedCommand::SetObservedCommand(DiagramDoc* doc, const QString& name, bool observed)
    : doc_(doc), name_(name), observed_(observed) {
    setText(observed ? QObject::tr("mark %1 measured").arg(name) : QObject::tr("mark %1 not measured").arg(name));
}
void SetObservedCommand::redo() { doc_->set_observed(name_, observed_); }
void SetObservedCommand::undo() { doc_->set_observed(name_, !observed_); }

MoveNodesCommand::MoveNodesCommand(DiagramDoc* doc, QHash<QString, QPointF> before, QHash<QString, QPointF> after,
                                   const QString& text)
    : doc_(doc), before_(std::move(before)), after_(std::move(after)) {
    setText(text);
}
void MoveNodesCommand::redo() {
    for (auto it = after_.begin(); it != after_.end(); ++it) doc_->move_node(it.key(), it.value());
}
void MoveNodesCommand::undo() {
    for (auto it = before_.begin(); it != before_.end(); ++it) doc_->move_node(it.key(), it.value());
}
bool MoveNodesCommand::mergeWith(const QUndoCommand* other) {
    const auto* o = static_cast<const MoveNodesCommand*>(other);
    if (o->after_.keys() != after_.keys() || after_.size() != 1) return false;
    after_ = o->after_;
    return true;
}

}  // namespace foldline::ui
