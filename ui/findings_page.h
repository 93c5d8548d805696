#pragma once
// Step 4, Findings: the ranked, filterable list on the left; the selected finding on the right
// with its pooled and per-stratum tables side by side, its charts, and the reviewer's decision.
#include <QWidget>

#include "ui/finding_view.h"

class QButtonGroup;
class QCustomPlot;
class QLabel;
class QLineEdit;
class QPlainTextEdit;
class QScrollArea;
class QSplitter;
class QTabWidget;
class QTableView;
class QTableWidget;
class QToolButton;

namespace foldline::ui {

class FindingsFilter;
class FindingsModel;

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

    QTableView* list() const { return list_; }
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
    void set_search(const QString& text);

private:
    void show_finding(int row);
    void fill_rate_tables(const FindingView& f);
    void fill_slope_tables(const FindingView& f);
    void fill_mean_tables(const FindingView& f);
    void draw_charts(const FindingView& f);
    void fit_pooled();
    void update_chips();

    QToolButton* chips_[5] = {};
    QString export_stem_, export_heading_;  ///< class filters, in FindingClass order
    FindingsModel* model_;
    FindingsFilter* filter_;
    QTableView* list_;
    QLineEdit* search_;
    QLabel *heading_, *meaning_, *empty_, *hint_, *partial_ = nullptr;
    QTableWidget *pooled_, *strata_;
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
