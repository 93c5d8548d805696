#pragma once
// Step 5, Diagram: draw what is known about how the columns cause one another, and read the
// engine's verdict live: node roles (shape + label, with a legend), the valid adjustment
// sets, the view to quote and why. Every edit is undoable.
#include <QWidget>
#include <functional>

#include "core/common/error.h"
#include "ui/diagram_doc.h"

class QComboBox;
class QGraphicsView;
class QLabel;
class QLineEdit;
class QMenu;
class QPushButton;
class QSplitter;
class QToolButton;
class QUndoStack;

namespace foldline::ui {

class DiagramScene;
class DiagramChecksPanel;

class DiagramPage : public QWidget {
    Q_OBJECT
public:
    explicit DiagramPage(QWidget* parent = nullptr);

    /// Seeds a fresh diagram for a finding: the exposure, the outcome and the strata with one
    /// arrow, exposure → outcome, and no verdict until the reviewer draws or confirms arrows;
    /// the other data columns are offered for adding. Clears the undo history.
    void seed(const QString& exposure, const QString& outcome, const QStringList& strata,
              const QStringList& columns);

    // The verdict and the estimate it points to come from the doc's judge (DiagramDoc::set_judge).

    DiagramDoc* doc() const { return doc_; }
    DiagramScene* scene() const { return scene_; }
    QGraphicsView* view() const { return view_; }
    QUndoStack* undo_stack() const { return undo_; }
    QSplitter* splitter() const { return split_; }
    const DiagramVerdict& verdict() const { return verdict_; }
    /// The diagram's claims tested on the rows (ui/diagram_checks_panel.h), kept up to date after each edit.
    DiagramChecksPanel* checks_panel() const { return checks_; }
    /// Last message shown about a refused edit (empty when the last edit was accepted).
    QString message() const;
    /// Names the finding the verdict is read for ("Reversal: product (B vs A)"), shown above it.
    void set_finding(const QString& words);
    QString finding() const;
    /// The banner's text: why there is no verdict yet, or what a pending draft assumes; empty
    /// (and hidden) when the arrows are the reviewer's and no draft is pending.
    QString banner() const;
    /// The verdict panel's text as shown (rich text).
    QString verdict_text() const;

public slots:
    /// Requests an arrow; a refused one (cycle, duplicate, self-loop) is explained, not drawn.
    bool request_edge(const QString& from, const QString& to);
    bool add_observed(const QString& column);
    bool add_unobserved(const QString& name);
    void delete_selected();
    void auto_layout();
    void set_connect_mode(bool on);
    /// "Use the diagram as drawn": the arrows shown are the reviewer's (undoable).
    void confirm_as_drawn();
    /// Offers the draft "every stratifier causes the exposure and the outcome" as dashed arrows
    /// (undoable); false when it would add nothing.
    bool offer_draft();
    /// Turns the pending draft into arrows in one undoable step; discarding withdraws it.
    void accept_draft();
    void discard_draft();
    /// Reverses an arrow; a reversal that would close a cycle is explained, not made.
    bool reverse_edge(const QString& from, const QString& to);
    /// Renames a node the reviewer declared (data columns keep their names).
    bool rename_node(const QString& name, const QString& new_name);
    /// Marks a node measured (only a column of the data) or not measured.
    bool set_node_observed(const QString& name, bool observed);
    /// Keyboard: selects the next (+1) or previous (-1) node or arrow, in diagram order.
    void select_next(int step);
    /// Keyboard: moves the selected nodes by (dx, dy), one undoable step per node run.
    void nudge(double dx, double dy);
    /// The menu of a node or an arrow (also opened with Shift+F10 on the selection).
    void show_node_menu(const QString& name, const QPoint& screen_pos);
    void show_edge_menu(const QString& from, const QString& to, const QPoint& screen_pos);
    void show_selection_menu();
    /// Reads a NAME.diagram.json file into the editor (clears the undo history); Error names
    /// the file and what is wrong. Crowded positions are tidied.
    Status open_file(const QString& path);
    /// Writes the diagram atomically as NAME.diagram.json.
    Status save_file(const QString& path) const;
    /// Writes the diagram as Graphviz DOT (atomically).
    Status export_dot(const QString& path) const;
    /// Asks for a file, then opens / saves / exports; errors go to a message box.
    void open_dialog();
    void save_dialog();
    void export_dot_dialog();
    /// Shows the whole diagram at natural size, shrinking only when it does not fit.
    void fit_view();

protected:
    void showEvent(QShowEvent* e) override;

signals:
    void verdict_changed(const foldline::ui::DiagramVerdict& v);

private:
    void refresh_verdict();
    void show_message(const QString& text);
    QPointF free_spot() const;
    void refill_columns();
    void refresh_banner();
    QMenu* node_menu(const QString& name);
    QMenu* edge_menu(const QString& from, const QString& to);

    DiagramDoc* doc_;
    DiagramScene* scene_;
    QUndoStack* undo_;
    QGraphicsView* view_;
    QComboBox* columns_;
    QLineEdit* unobserved_;
    QToolButton* connect_;
    QLabel *verdict_label_, *message_, *finding_label_, *banner_label_;
    QWidget* banner_;
    QPushButton *draft_btn_, *confirm_btn_, *accept_btn_, *discard_btn_;
    DiagramChecksPanel* checks_;
    QSplitter* split_;
    DiagramVerdict verdict_;
    QStringList data_columns_;
};

}  // namespace foldline::ui
