#include "ui/review_commands.h"

#include "ui/findings_model.h"

namespace foldline::ui {

DecisionCommand::DecisionCommand(FindingsModel* model, std::vector<Change> changes, const QString& text)
    : QUndoCommand(text), model_(model), changes_(std::move(changes)) {}

void DecisionCommand::redo() {
    for (const Change& c : changes_)
        if (const FindingView* f = model_->at(c.row)) model_->set_review(c.row, c.after, f->note, c.after_from);
}

void DecisionCommand::undo() {
    // In reverse, so a finding changed twice in one step ends where it began.
    for (auto it = changes_.rbegin(); it != changes_.rend(); ++it)
        if (const FindingView* f = model_->at(it->row)) model_->set_review(it->row, it->before, f->note, it->before_from);
}

}  // namespace foldline::ui
