#include "ui/tsv.h"

#include <QAbstractItemModel>
#include <QStringList>

namespace foldline::ui {

namespace {
QString clean(QString s) {
    s.replace(QLatin1Char('\t'), QLatin1Char(' '));
    s.replace(QLatin1Char('\n'), QLatin1Char(' '));
    s.replace(QLatin1Char('\r'), QLatin1Char(' '));
    return s;
}
}  // namespace

QString model_to_tsv(const QAbstractItemModel* model) {
    if (!model) return {};
    QStringList lines;
    QStringList head;
    for (int c = 0; c < model->columnCount(); ++c)
        head << clean(model->headerData(c, Qt::Horizontal, Qt::DisplayRole).toString());
    lines << head.join(QLatin1Char('\t'));
    for (int r = 0; r < model->rowCount(); ++r) {
        QStringList cells;
        for (int c = 0; c < model->columnCount(); ++c) cells << clean(model->index(r, c).data(Qt::DisplayRole).toString());
        lines << cells.join(QLatin1Char('\t'));
    }
    return lines.join(QLatin1Char('\n')) + QLatin1Char('\n');
}

}  // namespace foldline::ui
