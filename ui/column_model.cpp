#include "ui/column_model.h"

#include <QLocale>
#include <algorithm>
#include <cmath>
#include <limits>

namespace foldline::ui {

namespace {
/// Text order with runs of digits compared by value ("a9" before "a10"), case-insensitively;
/// the same on every system (no locale collation).
bool natural_less(const QString& a, const QString& b) {
    qsizetype i = 0, j = 0;
    while (i < a.size() && j < b.size()) {
        if (a[i].isDigit() && b[j].isDigit()) {
            qsizetype i2 = i, j2 = j;
            while (i2 < a.size() && a[i2].isDigit()) ++i2;
            while (j2 < b.size() && b[j2].isDigit()) ++j2;
            QString x = a.mid(i, i2 - i), y = b.mid(j, j2 - j);
            while (x.size() > 1 && x.startsWith(QLatin1Char('0'))) x.remove(0, 1);
            while (y.size() > 1 && y.startsWith(QLatin1Char('0'))) y.remove(0, 1);
            if (x.size() != y.size()) return x.size() < y.size();
            if (x != y) return x < y;
            i = i2, j = j2;
            continue;
        }
        const QChar p = a[i].toLower(), q = b[j].toLower();
        if (p != q) return p < q;
        ++i, ++j;
    }
    if ((a.size() - i) != (b.size() - j)) return a.size() - i < b.size() - j;
    return a < b;  // equal but for case or leading zeros: a fixed order all the same
}
}  // namespace

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
                // Sorted (numbers inside labels by value), so a row-level file and the same data
                // pre-counted list their levels alike whatever order the rows came in.
                QStringList all;
                for (const std::string& l : c.levels) all << QString::fromStdString(l);
                std::sort(all.begin(), all.end(), natural_less);
                s.levels = all.mid(0, 8).join(QStringLiteral(", "));
                if (all.size() > 8) s.levels += tr(", … (%1 more)").arg(all.size() - 8);
            } else {
                double lo = std::numeric_limits<double>::infinity(), hi = -lo;
                for (double v : c.values)
                    if (!std::isnan(v)) lo = std::min(lo, v), hi = std::max(hi, v);
                if (lo <= hi) s.levels = tr("range %1 to %2").arg(QLocale().toString(lo, 'g', 6), QLocale().toString(hi, 'g', 6));
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
            case Levels: return tr("Levels or range");
        }
    }
    if (role == Qt::ToolTipRole) {
        switch (section) {
            case Type: return tr("How the reader read the column; categorical columns are compared by level, numeric ones can be binned");
            case Missing: return tr("Cells with no value (empty or a missing marker) and their share of rows");
            case Distinct: return tr("Number of different non-missing values");
            case Levels: return tr("A categorical column's levels, sorted; a numeric column's smallest and largest value");
        }
    }
    return {};
}

}  // namespace foldline::ui
