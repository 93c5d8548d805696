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

    /// Seeds a fresh diagram for a finding: exposure → outcome, strata pointing at both; the
    /// other data columns are offered for adding. Clears the undo history.
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

public slots:
    /// Requests an arrow; a refused one (cycle, duplicate, self-loop) is explained, not drawn.
    bool request_edge(const QString& from, const QString& to);
    bool add_observed(const QString& column);
    bool add_unobserved(const QString& name);
    void delete_selected();
    void auto_layout();
    void set_connect_mode(bool on);
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

    DiagramDoc* doc_;
    DiagramScene* scene_;
    QUndoStack* undo_;
    QGraphicsView* view_;
    QComboBox* columns_;
    QLineEdit* unobserved_;
    QToolButton* connect_;
    QLabel *verdict_label_, *message_;
    DiagramChecksPanel* checks_;
    QSplitter* split_;
    DiagramVerdict verdict_;
    QStringList data_columns_;
};

}  // namespace foldline::ui
