#pragma once
// One row per column of a Table: name, type, missing cells, distinct values, first levels.
#include <QAbstractTableModel>
#include <memory>

#include "core/table/table.h"

namespace foldline::ui {

class ColumnModel : public QAbstractTableModel {
    Q_OBJECT
public:
    enum Field { Name, Type, Missing, Distinct, Levels, FieldCount };
    explicit ColumnModel(QObject* parent = nullptr);
    /// Summarises `table`; a null table gives an empty model.
    void set_table(std::shared_ptr<const Table> table);

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

private:
    struct Summary {
        QString name, type, levels;
        QString label, description;  ///< a statistical file's variable label and value-label codes
        qulonglong missing = 0, distinct = 0;
        double missing_share = 0;
    };
    std::vector<Summary> rows_;
};

}  // namespace foldline::ui
