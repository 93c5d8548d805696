#pragma once
// The offer to restore an audit that a session left behind without saving (see ui/autosave.h):
// what the copy holds and when it was written, and three answers. Keyboard: Enter restores,
// Alt+R / Alt+D / Alt+L pick an answer, Escape decides later.
#include "ui/autosave.h"  // core before Qt (see DEVELOPERS.md)

#include <QDialog>

class QPushButton;

namespace foldline::ui {

enum class RecoveryChoice {
    Restore,  ///< open the copy (the recovery file is removed once it is open)
    Discard,  ///< delete the copy
    Later,    ///< keep the copy and ask again at the next start
};

class RecoveryDialog : public QDialog {
    Q_OBJECT
public:
    explicit RecoveryDialog(const RecoveryOffer& offer, QWidget* parent = nullptr);
    /// The answer given; Later until a button is pressed (and after Escape).
    RecoveryChoice choice() const { return choice_; }
    QPushButton* button(RecoveryChoice c) const;
    /// The summary shown (plain text).
    QString summary() const { return summary_; }

private:
    void answer(RecoveryChoice c);
    RecoveryChoice choice_ = RecoveryChoice::Later;
    QPushButton* restore_;
    QPushButton* discard_;
    QPushButton* later_;
    QString summary_;
};

/// Shows the dialog modally; returns the answer (Later when it is closed any other way).
RecoveryChoice ask_recovery(QWidget* parent, const RecoveryOffer& offer);

}  // namespace foldline::ui
