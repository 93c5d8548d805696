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

class AddEdgeCommand : public QUndoCommand {
public:
    AddEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString from_, to_;
};

class RemoveEdgeCommand : public QUndoCommand {
public:
    RemoveEdgeCommand(DiagramDoc* doc, const QString& from, const QString& to);
    void redo() override;
    void undo() override;

private:
    DiagramDoc* doc_;
    QString from_, to_;
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
