#pragma once
// Tab-separated text of an item model, as spreadsheets paste it.
#include <QString>

class QAbstractItemModel;

namespace foldline::ui {

/// Header row plus one line per row of `model` (display text; tabs and newlines in cells become
/// spaces). A null or empty model gives only the header (or "").
QString model_to_tsv(const QAbstractItemModel* model);

}  // namespace foldline::ui
