#pragma once
// A typed-in table: K strata × (focal positives, focal total, reference positives, reference
// total). Cells are edited in place or pasted from a spreadsheet as tab-separated text; every
// problem is reported by row and column before a table is built.
#include <QWidget>
#include <memory>

#include "core/common/error.h"
#include "core/table/table.h"

class QTableWidget;
class QLineEdit;
class QLabel;

namespace foldline::ui {

class CountsGrid : public QWidget {
    Q_OBJECT
public:
    explicit CountsGrid(QWidget* parent = nullptr);

    /// Replaces the grid with `rows` rows of {stratum, pos_f, n_f, pos_r, n_r} text.
    void set_rows(const QList<QStringList>& rows);
    /// Pastes tab-separated text at the current cell, growing the grid as needed; a first line
    /// whose number cells are not numbers is taken as a header and skipped. Returns rows pasted.
    int paste_tsv(const QString& text);
    /// Builds a weighted table with columns (stratum, group, outcome) and one row per non-empty
    /// cell; an Error names the first bad cell (row and column 1-based in the grid).
    Result<Table> to_table() const;
    /// Names used for the built table's columns and levels.
    QString stratum_name() const;
    QString focal_name() const;
    QString reference_name() const;
    QString outcome_name() const;
    /// The built table's group column and the outcome's two levels (the typed outcome label
    /// counts as positive; "not <label>" the rest).
    QString group_column_name() const;
    QString positive_label() const;
    QString negative_label() const;

signals:
    /// The grid built a table the reviewer asked to use.
    void table_ready(std::shared_ptr<const foldline::Table> table);

public slots:
    void paste_from_clipboard();
    void use_table();

protected:
    bool eventFilter(QObject* watched, QEvent* event) override;

private:
    QTableWidget* grid_;
    QLineEdit *stratum_, *focal_, *reference_, *outcome_;
    QLabel* message_;
};

}  // namespace foldline::ui
