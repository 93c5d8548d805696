#pragma once
// Undoable edits of a DiagramDoc. Each command calls the document only; the scene follows
// the document's signals.
#include <QHash>
#include <QPointF>
#include <QUndoCommand>
#include <vector>

#include "ui/diagram_doc.h"

namespace foldline::ui {

class AddNodeCommand : public QUndoCommand {
public:
    AddNodeCommand(DiagramDoc* doc, DiagramNode node);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    DiagramNode node_;
};

/// Removes a node with every arrow touching it; undo restores both.
class RemoveNodeCommand : public QUndoCommand {
public:
    RemoveNodeCommand(DiagramDoc* doc, const QString& name);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    DiagramNode node_;
    std::vector<DiagramEdge> edges_;
};

/// Arrow edits are the reviewer's claims: each confirms the diagram (DiagramDoc::confirmed), and
/// undoing it restores whether it was confirmed before.
class AddEdgeCommand : public QUndoCommand {
public:
    AddEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString from_, to_;
    bool was_confirmed_ = true;
};

class RemoveEdgeCommand : public QUndoCommand {
public:
    RemoveEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString from_, to_;
    bool was_confirmed_ = true;
};

/// Turns an arrow round (from → to becomes to → from).
class ReverseEdgeCommand : public QUndoCommand {
public:
    ReverseEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString from_, to_;
    bool was_confirmed_ = true;
};

/// "Use the diagram as drawn": the reviewer confirms the arrows shown, so a verdict is read.
class ConfirmDiagramCommand : public QUndoCommand {
public:
    explicit ConfirmDiagramCommand(DiagramDoc* doc);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    bool was_confirmed_ = false;
};

/// Offers or withdraws draft arrows (DiagramDoc::draft).
class SetDraftCommand : public QUndoCommand {
public:
    SetDraftCommand(DiagramDoc* doc, std::vector<DiagramEdge> draft, const QString& text);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    std::vector<DiagramEdge> before_, after_;
};

class RenameNodeCommand : public QUndoCommand {
public:
    RenameNodeCommand(DiagramDoc* doc, const QString& name, const QString& new_name);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString name_, new_name_;
};

/// Marks a node measured (a data column) or not.
class SetObservedCommand : public QUndoCommand {
public:
    SetObservedCommand(DiagramDoc* doc, const QString& name, bool observed);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString name_;
    bool observed_;
};

/// Moves nodes; consecutive moves of the same node merge into one step.
class MoveNodesCommand : public QUndoCommand {
public:
    MoveNodesCommand(DiagramDoc* doc, QHash<QString, QPointF> before, QHash<QString, QPointF> after,
                     const QString& text);
    void redo() override;
    void undo() override;
    int id() const override { return 7301; }
    bool mergeWith(const QUndoCommand* other) override;

private:
    DiagramDoc* doc_;
    QHash<QString, QPointF> before_, after_;
};

}  // namespace foldline::ui
