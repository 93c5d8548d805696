#include "ui/table_model.h"

#include <QApplication>
#include <QPalette>

#include "ui/palette.h"

namespace foldline::ui {

TableModel::TableModel(QObject* parent) : QAbstractTableModel(parent) {}

void TableModel::set_table(std::shared_ptr<const Table> table) {
    beginResetModel();
    table_ = std::move(table);
    endResetModel();
}

int TableModel::rowCount(const QModelIndex& parent) const {
    if (parent.isValid() || !table_) return 0;
    // Views index rows with int; beyond that the preview stops (the scan still sees every row).
    return int(std::min<std::size_t>(table_->rows, std::size_t(std::numeric_limits<int>::max())));
}

int TableModel::columnCount(const QModelIndex& parent) const {
    if (parent.isValid() || !table_) return 0;
    return int(table_->columns.size()) + (table_->weighted() ? 1 : 0);
}

QString TableModel::cell_text(std::size_t row, int column) const {
    if (!table_ || row >= table_->rows || column < 0) return {};
    if (std::size_t(column) == table_->columns.size()) {
        if (!table_->weighted()) return {};
        return QString::number(table_->weights[row], 'g', 12);
    }
    if (std::size_t(column) > table_->columns.size()) return {};
    const Column& c = table_->columns[std::size_t(column)];
    if (c.is_categorical()) {
        const std::uint32_t code = c.code(row);
        if (code >= c.levels.size()) return {};
        return QString::fromStdString(c.levels[code]);
    }
    const double v = c.values[row];
    if (std::isnan(v)) return {};
    return QString::number(v, 'g', 12);
}

QVariant TableModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || !table_) return {};
    const std::size_t row = std::size_t(index.row());
    const int col = index.column();
    const bool is_weight = std::size_t(col) == table_->columns.size();
    switch (role) {
        case Qt::DisplayRole: {
            const QString s = cell_text(row, col);
            if (s.isEmpty() && !is_weight) return QStringLiteral("·");
            return s;
        }
        case Qt::ForegroundRole:
            if (!is_weight && table_->columns[std::size_t(col)].is_missing(row))
                return colors::muted(QApplication::palette());
            return {};
        case Qt::TextAlignmentRole:
            if (is_weight || table_->columns[std::size_t(col)].is_numeric())
                return int(Qt::AlignRight | Qt::AlignVCenter);
            return int(Qt::AlignLeft | Qt::AlignVCenter);
        case Qt::ToolTipRole:
            if (!is_weight && table_->columns[std::size_t(col)].is_missing(row))
                return tr("Missing value");
            return {};
        default:
            return {};
    }
}

QVariant TableModel::headerData(int section, Qt::Orientation o, int role) const {
    if (!table_) return {};
    if (o == Qt::Vertical) {
        if (role == Qt::DisplayRole) return QString::number(qlonglong(section) + 1);
        return {};
    }
    const bool is_weight = std::size_t(section) == table_->columns.size();
    if (role == Qt::DisplayRole) {
        if (is_weight) return QString::fromStdString(table_->weight_column) + tr(" (count)");
        if (std::size_t(section) < table_->columns.size())
            return QString::fromStdString(table_->columns[std::size_t(section)].name);
    }
    if (role == Qt::ToolTipRole && std::size_t(section) < table_->columns.size()) {
        const Column& c = table_->columns[std::size_t(section)];
        return c.is_categorical() ? tr("Categorical: %1 levels").arg(c.levels.size())
                                  : tr("Numeric");
    }
    if (role == Qt::ToolTipRole && is_weight)
        return tr("Count column: each row stands for this many observations");
    return {};
}

}  // namespace foldline::ui
