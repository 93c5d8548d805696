#pragma once
// Read-only, virtualised view of a columnar Table: data() reads the codes or values of one cell
// directly, so a view over ten million rows costs nothing until a cell is painted.
#include <QAbstractTableModel>
#include <memory>

#include "core/table/table.h"

namespace foldline::ui {

class TableModel : public QAbstractTableModel {
    Q_OBJECT
public:
    explicit TableModel(QObject* parent = nullptr);
    /// Shows `table`; a null table shows nothing. A weighted table gets its count column last.
    void set_table(std::shared_ptr<const Table> table);
    const Table* table() const { return table_.get(); }

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

    /// Text of one cell as shown ("" for a missing cell or out of range).
    QString cell_text(std::size_t row, int column) const;

private:
    std::shared_ptr<const Table> table_;
};

}  // namespace foldline::ui
