#pragma once
// Undoable changes of the reviewer's decisions. A command records each finding's decision and
// where it came from, before and after; notes are not part of it, so undoing a decision never
// takes back text typed since.
#include <QString>
#include <QUndoCommand>
#include <vector>

#include "core/scan/finding_class.h"

namespace foldline::ui {

class FindingsModel;

/// One reviewer's action on one or more findings (a decision, or a lead's decision applied to
/// its family), undone and redone as one step.
class DecisionCommand : public QUndoCommand {
public:
    struct Change {
        int row = -1;  ///< source row in the FindingsModel
        Decision before = Decision::Undecided, after = Decision::Undecided;
        QString before_from, after_from;  ///< the family lead a decision was applied from; empty: its own
    };
    DecisionCommand(FindingsModel* model, std::vector<Change> changes, const QString& text);
    void redo() override;
    void undo() override;
    const std::vector<Change>& changes() const { return changes_; }

private:
    FindingsModel* model_;
    std::vector<Change> changes_;
};

}  // namespace foldline::ui
