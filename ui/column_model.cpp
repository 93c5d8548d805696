#include "ui/column_model.h"

namespace foldline::ui {

ColumnModel::ColumnModel(QObject* parent) : QAbstractTableModel(parent) {}

void ColumnModel::set_table(std::shared_ptr<const Table> table) {
    beginResetModel();
    rows_.clear();
    if (table) {
        for (const Column& c : table->columns) {
            Summary s;
            s.name = QString::fromStdString(c.name);
            s.label = QString::fromStdString(c.label);
            s.description = QString::fromStdString(c.description);
            s.type = c.is_categorical() ? tr("categorical") : tr("numeric");
            s.missing = c.missing_count;
            s.missing_share = table->rows ? double(c.missing_count) / double(table->rows) : 0.0;
            s.distinct = c.distinct_count();
            if (c.is_categorical()) {
                QStringList first;
                for (std::size_t i = 0; i < c.levels.size() && i < 8; ++i)
                    first << QString::fromStdString(c.levels[i]);
                s.levels = first.join(QStringLiteral(", "));
                if (c.levels.size() > 8) s.levels += tr(", … (%1 more)").arg(c.levels.size() - 8);
            }
            rows_.push_back(std::move(s));
        }
    }
    endResetModel();
}

int ColumnModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(rows_.size());
}
int ColumnModel::columnCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : FieldCount;
}

QVariant ColumnModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || std::size_t(index.row()) >= rows_.size()) return {};
    const Summary& s = rows_[std::size_t(index.row())];
    if (role == Qt::DisplayRole) {
        switch (index.column()) {
            // A variable label is shown beside the name (statistical files carry one).
            case Name: return s.label.isEmpty() ? s.name : s.name + QStringLiteral("  \u2014 ") + s.label;
            case Type: return s.type;
            case Missing:
                return s.missing ? QStringLiteral("%1 (%2%)").arg(s.missing).arg(100 * s.missing_share, 0, 'f', 1)
                                 : QStringLiteral("0");
            case Distinct: return s.distinct;
            case Levels: return s.levels;
        }
    }
    if (role == Qt::TextAlignmentRole && (index.column() == Missing || index.column() == Distinct))
        return int(Qt::AlignRight | Qt::AlignVCenter);
    if (role == Qt::ToolTipRole && index.column() == Levels)
        return s.description.isEmpty() ? s.levels : s.levels + QLatin1Char('\n') + s.description;
    if (role == Qt::ToolTipRole && index.column() == Name && !s.label.isEmpty()) return s.label;
    return {};
}

QVariant ColumnModel::headerData(int section, Qt::Orientation o, int role) const {
    if (o != Qt::Horizontal) return {};
    if (role == Qt::DisplayRole) {
        switch (section) {
            case Name: return tr("Column");
            case Type: return tr("Type");
            case Missing: return tr("Missing");
            case Distinct: return tr("Distinct");
            case Levels: return tr("Levels");
        }
    }
    if (role == Qt::ToolTipRole) {
        switch (section) {
            case Type: return tr("How the reader read the column; categorical columns are compared by level, numeric ones can be binned");
            case Missing: return tr("Cells with no value (empty or a missing marker) and their share of rows");
            case Distinct: return tr("Number of different non-missing values");
            case Levels: return tr("The first levels in order of first appearance");
        }
    }
    return {};
}

}  // namespace foldline::ui
