#pragma once
// Step 2, Question: the outcome and its positive level, the compared groups, the candidate
// stratifiers (with the reason any column is left out) and the scan settings. Problems are
// explained inline while the reviewer chooses; the scan button stays off until there are none.
#include <QStringList>
#include <QWidget>
#include <memory>
#include <optional>

#include "core/table/table.h"
#include "ui/engine.h"

class QCheckBox;
class QFormLayout;
class QRadioButton;
class QComboBox;
class QDoubleSpinBox;
class QLabel;
class QLineEdit;
class QListWidget;
class QPushButton;
class QSpinBox;
class QUndoStack;

namespace foldline::ui {

class QuestionPage : public QWidget {
    Q_OBJECT
public:
    explicit QuestionPage(QWidget* parent = nullptr);

    /// Fills the choices from `table` with sensible defaults; null clears them. `new_data` (another
    /// data set, not the same one read again) also puts the scan settings back to their defaults,
    /// so nothing chosen for the previous data (e.g. 10,000 resamples) carries over.
    void set_table(std::shared_ptr<const Table> table, bool new_data = true);
    /// Chooses the outcome, its positive level, the groups column and the two groups when the
    /// table has them (a typed-in table names them itself); others are left as they are.
    void propose_groups(const QString& outcome, const QString& positive, const QString& exposure,
                        const QString& focal, const QString& reference);
    /// The question as currently chosen.
    QuestionSpec spec() const;
    /// Applies a question (unknown columns or levels are left as they are).
    void set_spec(const QuestionSpec& q);
    /// Problems with the current choice (empty when the scan can run).
    QStringList problems() const;
    /// The columns combined with the groups column, in the order they join the groups' name
    /// (`sex+ethnicity`: {"ethnicity"}); empty for one groups column.
    QStringList combined_with() const { return combine_order_; }
    /// Combines the groups column with `columns` (each combination a group), choosing the focal
    /// and reference combinations given, else the defaults; one undoable step.
    void combine_with(const QStringList& columns, const QString& focal = {}, const QString& reference = {});
    /// Undo history of the combined groups (a tick or untick of "Combined with" is one step).
    QUndoStack* undo_stack() const { return undo_; }

signals:
    void scan_requested(const foldline::ui::QuestionSpec& spec);
    void changed();

private:
    void fill_levels(QComboBox* box, const QString& column);
    void refresh_candidates();
    void validate();
    void fill_columns();
    void set_kind(bool slope);
    void reset_settings();
    QString groups_name() const;  ///< the groups column, joined with the combined columns by "+"
    void refill_combine();        ///< the "Combined with" list for the current groups column
    void fill_groups();           ///< focal and reference from the groups (combined or not), defaults chosen
    friend class CombineCommand;
    /// Sets the combination and the two groups without touching the undo history.
    void apply_combination(const QStringList& order, const QString& focal, const QString& reference);

    std::shared_ptr<const Table> table_;
    QComboBox *outcome_, *positive_, *exposure_, *focal_, *reference_;
    QRadioButton *rates_, *slopes_;
    QFormLayout* who_form_;
    QListWidget* candidates_;
    QCheckBox* pairs_;
    QSpinBox *bins_, *bootstrap_, *max_levels_;
    QLineEdit* seed_;            ///< any 64-bit seed (a saved audit may hold one above 2^32)
    QLineEdit* rows_;            ///< rows to include (docs/filter.md)
    QCheckBox* find_groups_ = nullptr;  ///< trends: the hidden-group hint
    bool all_candidates_ = false;///< the saved audit's "auto" list, kept until the reviewer edits the ticks
    QDoubleSpinBox* alpha_;
    QLabel* problems_;
    QPushButton* scan_;
    bool filling_ = false;
    QStringList covariates_;  ///< a trend's covariates from an opened audit (no editor of their own)
    QListWidget* combine_;    ///< "Combined with": other columns that, ticked, split the groups further
    QStringList combine_order_;          ///< the ticked columns, in the order they join the name
    std::optional<Column> combined_;     ///< the combined groups column of the current choice
    QUndoStack* undo_;
};

}  // namespace foldline::ui
