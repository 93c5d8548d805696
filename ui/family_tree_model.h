#pragma once
// The findings folded by family (core/scan/families.h): each family's lead is a top-level row and
// the findings that add nothing beyond it (members) or carry the same information (proxies) sit
// beneath it. A thin tree over the flat FindingsModel: it holds source rows only, forwards every
// role, and adds to the strata column the size of a lead's family and the role of a member.
#include <QAbstractItemModel>
#include <QHash>
#include <vector>

namespace foldline::ui {

class FindingsModel;
struct FindingView;

class FamilyTreeModel : public QAbstractItemModel {
    Q_OBJECT
public:
    explicit FamilyTreeModel(FindingsModel* source, QObject* parent = nullptr);

    FindingsModel* source() const { return source_; }
    /// The tree index of source row `row` in `column`; invalid for a row out of range.
    QModelIndex index_of(int row, int column = 0) const;
    /// The source row of a tree index; -1 for an invalid index.
    int source_row(const QModelIndex& index) const;
    /// Source rows folded beneath the lead at source row `row`, in rank order (proxies and members
    /// as core ranked them); empty for a finding that leads no one or sits beneath another.
    std::vector<int> folded_under(int row) const;
    /// Source row of the lead the finding at `row` is folded beneath; `row` itself for a top-level
    /// finding, -1 for a row out of range.
    int lead_row(int row) const;

    QModelIndex index(int row, int column, const QModelIndex& parent = {}) const override;
    QModelIndex parent(const QModelIndex& child) const override;
    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

private:
    void rebuild();
    void on_rows_inserted(int first, int last);
    void on_data_changed(const QModelIndex& tl, const QModelIndex& br, const QList<int>& roles);
    /// Where a finding goes: the position of its lead among the top-level rows, or -1 (top level).
    int parent_slot(const FindingView& f) const;

    FindingsModel* source_;
    std::vector<int> top_;                ///< source rows of the top-level findings, in arrival order
    std::vector<std::vector<int>> kids_;  ///< per top-level position, the source rows beneath it
    std::vector<int> slot_;               ///< per source row: its parent's top-level position, or -1
    std::vector<int> pos_;                ///< per source row: its position among its siblings
    QHash<QString, int> leads_;           ///< family key of each top-level finding → its position
};

}  // namespace foldline::ui
