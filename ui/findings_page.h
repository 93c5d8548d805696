#pragma once
// Step 4, Findings: the ranked, filterable list on the left, each family's lead with the findings
// that repeat its story folded beneath it; the selected finding on the right with its pooled and
// per-stratum tables side by side, its charts, and the reviewer's decision (undoable, and
// appliable from a lead to its family in one step).
#include <QWidget>
#include <functional>

#include "ui/finding_view.h"

class QAction;
class QButtonGroup;
class QCustomPlot;
class QLabel;
class QLineEdit;
class QMenu;
class QPlainTextEdit;
class QPushButton;
class QScrollArea;
class QSplitter;
class QTabWidget;
class QTableWidget;
class QToolButton;
class QTreeView;
class QUndoStack;

namespace foldline::ui {

class FamilyTreeModel;
class FindingsFilter;
class FindingsModel;

/// What to do when applying a lead's decision meets family findings decided otherwise.
enum class OverwriteChoice { Overwrite, KeepTheirs, Cancel };
/// Asked with the lead's label, its decision and one line per finding decided otherwise
/// ("product × region: Set aside").
using OverwritePrompt = std::function<OverwriteChoice(const QString& lead, const QString& decision,
                                                      const QStringList& differing)>;

/// `path` with the suffix of the save dialog's chosen `filter` ("PNG image (*.png)") added when it
/// has none of .png, .svg or .pdf.
QString with_chart_suffix(const QString& path, const QString& filter);

class FindingsPage : public QWidget {
    Q_OBJECT
public:
    explicit FindingsPage(FindingsModel* model, QWidget* parent = nullptr);

    /// Selects source row `row` of the model (the list may be sorted or filtered); false when hidden.
    bool select(int row);
    /// Source row of the selected finding, or -1.
    int selected() const;
    /// Selects the first row in rank order; -1 when the list is empty.
    int select_top();

    /// The findings list: a tree of family leads with the findings folded beneath them.
    QTreeView* list() const { return list_; }
    /// The source row of a list index (an index of list()->model()); -1 for an invalid one.
    int source_row(const QModelIndex& view_index) const;
    FamilyTreeModel* family_tree() const { return tree_; }
    /// The reviewer's decisions, undoable (the window's Edit menu acts on it on this step).
    QUndoStack* undo_stack() const { return reviews_; }
    /// "Apply this decision to the family" (Ctrl+Shift+M): enabled on a decided lead with findings
    /// folded beneath it.
    QAction* apply_family_action() const { return apply_; }
    /// The list's context menu for source row `row` (decisions, apply to the family, fold, go to
    /// the lead); the caller owns it.
    QMenu* context_menu_for(int row);
    /// Replaces the box that asks before overwriting other decisions (tests answer it).
    void set_overwrite_prompt(OverwritePrompt p) { overwrite_prompt_ = std::move(p); }
    QTableWidget* pooled_table() const { return pooled_; }
    QTableWidget* strata_table() const { return strata_; }
    QTabWidget* chart_tabs() const { return charts_; }
    QCustomPlot* current_chart() const;
    /// The pay-review caution shown above a mean-gap finding (hidden for other kinds).
    QLabel* pay_caution() const { return pay_caution_; }
    QSplitter* main_splitter() const { return split_; }
    QSplitter* detail_splitter() const { return detail_split_; }
    FindingsFilter* filter() const { return filter_; }
    /// Shows the hidden-group hint of a trend audit (core's ScanResult::latent note) above the
    /// list, labelled as a hint and never as a finding row; empty text hides it.
    void set_hidden_group_hint(const QString& note);
    /// The hint line as shown; empty when hidden.
    QString hidden_group_hint() const;
    /// Marks the list as partial (a stopped scan: provisional findings) with `why`; empty
    /// clears the mark.
    void set_partial_note(const QString& why);
    QString partial_note() const;
    /// What Save chart proposes and writes: the file name's stem (the audit's name) and a heading
    /// naming the data set, the groups and the question, drawn above an exported chart.
    void set_export_context(const QString& stem, const QString& heading);

signals:
    /// The selected finding changed (source row, or -1).
    void finding_selected(int row);

public slots:
    /// Copies the table with focus (or the per-stratum table) as TSV.
    void copy_table();
    /// Asks for a file and saves the visible chart as PNG, SVG or PDF.
    void save_chart();
    void decide(foldline::Decision d);
    /// Copies the selected lead's decision to every finding folded beneath it as one undo step;
    /// each keeps its own note and records the lead it came from. Findings decided otherwise are
    /// overwritten only when the prompt says so. Returns the findings changed (0: nothing to do,
    /// -1: cancelled).
    int apply_to_family();
    void set_search(const QString& text);

private:
    void show_finding(int row);
    /// Refreshes what the decision row and the family line say of the shown finding.
    void show_review(const FindingView& f);
    void update_apply();
    void fill_rate_tables(const FindingView& f);
    void fill_slope_tables(const FindingView& f);
    void fill_mean_tables(const FindingView& f);
    void draw_charts(const FindingView& f);
    void fit_pooled();
    void update_chips();

    QToolButton* chips_[5] = {};
    QString export_stem_, export_heading_;  ///< class filters, in FindingClass order
    FindingsModel* model_;
    FamilyTreeModel* tree_;
    FindingsFilter* filter_;
    QTreeView* list_;
    QUndoStack* reviews_;
    QAction* apply_;
    QPushButton* apply_button_;
    QLabel* family_;
    OverwritePrompt overwrite_prompt_;
    int shown_ = -1;
    QLineEdit* search_;
    QLabel *heading_, *meaning_, *empty_, *hint_, *partial_ = nullptr;
    QTableWidget *pooled_, *strata_;
    QLabel* pooled_title_;  ///< what the pooled table holds, by the shown finding's kind
    QTabWidget* charts_;
    QCustomPlot *forest_, *mix_, *decomp_, *scatter_, *multiples_, *means_;
    QLabel* pay_caution_;  ///< mean-gap findings: the pay-review caution
    QScrollArea* forest_scroll_;
    QButtonGroup* decision_;
    QPlainTextEdit* note_;
    QSplitter *split_, *detail_split_, *tables_split_;
    bool fitted_ = false;
    QWidget* detail_;
    bool showing_ = false;
};

}  // namespace foldline::ui
