#include "ui/family_tree_model.h"

#include "ui/findings_model.h"

namespace foldline::ui {

namespace {

/// Findings are compared within their comparison (rates: focal vs reference; slopes: y on x), so
/// a family's key is the comparison and the lead's label.
QString family_key(const FindingView& f, const QString& lead) {
    return (f.slope ? QStringLiteral("slope") : QStringLiteral("rate")) + QChar(0x1f) + f.focal + QChar(0x1f) +
           f.reference + QChar(0x1f) + lead;
}

QString role_word(FamilyRole r) {
    return r == FamilyRole::Proxy ? FamilyTreeModel::tr("proxy") : FamilyTreeModel::tr("member");
}

}  // namespace

FamilyTreeModel::FamilyTreeModel(FindingsModel* source, QObject* parent) : QAbstractItemModel(parent), source_(source) {
    connect(source_, &QAbstractItemModel::modelAboutToBeReset, this, [this] { beginResetModel(); });
    connect(source_, &QAbstractItemModel::modelReset, this, [this] {
        rebuild();
        endResetModel();
    });
    connect(source_, &QAbstractItemModel::rowsInserted, this,
            [this](const QModelIndex&, int first, int last) { on_rows_inserted(first, last); });
    connect(source_, &QAbstractItemModel::dataChanged, this, &FamilyTreeModel::on_data_changed);
    rebuild();
}

int FamilyTreeModel::parent_slot(const FindingView& f) const {
    if (!f.in_family()) return -1;
    const auto it = leads_.constFind(family_key(f, f.family_lead));
    return it == leads_.constEnd() ? -1 : *it;
}

void FamilyTreeModel::rebuild() {
    top_.clear();
    kids_.clear();
    leads_.clear();
    const int n = source_->size();
    slot_.assign(std::size_t(n), -1);
    pos_.assign(std::size_t(n), -1);
    // Leads first (and any finding whose lead is not in the list), so a member placed before its
    // lead still lands beneath it; then the others beneath their leads, in rank order.
    const auto place_top = [this](int r) {
        const FindingView& f = *source_->at(r);
        pos_[std::size_t(r)] = int(top_.size());
        if (!f.in_family()) leads_.insert(family_key(f, f.strata_label()), int(top_.size()));
        top_.push_back(r);
        kids_.emplace_back();
    };
    for (int r = 0; r < n; ++r)
        if (!source_->at(r)->in_family()) place_top(r);
    for (int r = 0; r < n; ++r) {
        const FindingView& f = *source_->at(r);
        if (!f.in_family()) continue;
        const int s = parent_slot(f);
        if (s < 0) {
            place_top(r);
            continue;
        }
        slot_[std::size_t(r)] = s;
        pos_[std::size_t(r)] = int(kids_[std::size_t(s)].size());
        kids_[std::size_t(s)].push_back(r);
    }
}

void FamilyTreeModel::on_rows_inserted(int first, int last) {
    slot_.resize(std::size_t(source_->size()), -1);
    pos_.resize(std::size_t(source_->size()), -1);
    for (int r = first; r <= last; ++r) {
        const FindingView& f = *source_->at(r);
        if (!f.in_family()) {
            const QString key = family_key(f, f.strata_label());
            // A lead arriving after findings that belong beneath it: fold them in afresh.
            bool waiting = false;
            for (int t : top_) {
                const FindingView& o = *source_->at(t);
                if (o.in_family() && family_key(o, o.family_lead) == key) waiting = true;
            }
            if (waiting) {
                // The rebuild places every row up to the last one inserted.
                beginResetModel();
                rebuild();
                endResetModel();
                return;
            }
            const int at = int(top_.size());
            beginInsertRows({}, at, at);
            slot_[std::size_t(r)] = -1;
            pos_[std::size_t(r)] = at;
            leads_.insert(key, at);
            top_.push_back(r);
            kids_.emplace_back();
            endInsertRows();
            continue;
        }
        const int s = parent_slot(f);
        if (s < 0) {
            // Its lead is not in the list (yet): shown at the top level until it comes.
            const int at = int(top_.size());
            beginInsertRows({}, at, at);
            pos_[std::size_t(r)] = at;
            top_.push_back(r);
            kids_.emplace_back();
            endInsertRows();
            continue;
        }
        auto& kids = kids_[std::size_t(s)];
        const int at = int(kids.size());
        beginInsertRows(index(s, 0), at, at);
        slot_[std::size_t(r)] = s;
        pos_[std::size_t(r)] = at;
        kids.push_back(r);
        endInsertRows();
        // The lead's row counts its family.
        const QModelIndex lead = index(s, FindingsModel::Strata);
        emit dataChanged(lead, lead, {Qt::DisplayRole, Qt::ToolTipRole});
    }
}

void FamilyTreeModel::on_data_changed(const QModelIndex& tl, const QModelIndex& br, const QList<int>& roles) {
    for (int r = tl.row(); r <= br.row(); ++r) {
        const QModelIndex a = index_of(r, tl.column()), b = index_of(r, br.column());
        if (a.isValid()) emit dataChanged(a, b, roles);
    }
}

QModelIndex FamilyTreeModel::index_of(int row, int column) const {
    if (row < 0 || row >= int(pos_.size()) || pos_[std::size_t(row)] < 0) return {};
    const int s = slot_[std::size_t(row)];
    return createIndex(pos_[std::size_t(row)], column, quintptr(s + 1));
}

int FamilyTreeModel::source_row(const QModelIndex& i) const {
    if (!i.isValid() || i.model() != this) return -1;
    const auto id = i.internalId();
    if (id == 0) return i.row() < int(top_.size()) ? top_[std::size_t(i.row())] : -1;
    const auto& kids = kids_[std::size_t(id - 1)];
    return i.row() < int(kids.size()) ? kids[std::size_t(i.row())] : -1;
}

std::vector<int> FamilyTreeModel::folded_under(int row) const {
    if (row < 0 || row >= int(slot_.size()) || slot_[std::size_t(row)] >= 0 || pos_[std::size_t(row)] < 0) return {};
    return kids_[std::size_t(pos_[std::size_t(row)])];
}

int FamilyTreeModel::lead_row(int row) const {
    if (row < 0 || row >= int(slot_.size())) return -1;
    const int s = slot_[std::size_t(row)];
    return s < 0 ? row : top_[std::size_t(s)];
}

QModelIndex FamilyTreeModel::index(int row, int column, const QModelIndex& parent) const {
    if (row < 0 || column < 0 || column >= FindingsModel::FieldCount) return {};
    if (!parent.isValid()) return row < int(top_.size()) ? createIndex(row, column, quintptr(0)) : QModelIndex();
    // One level only: a member has no findings beneath it.
    if (parent.internalId() != 0 || parent.row() >= int(kids_.size())) return {};
    if (row >= int(kids_[std::size_t(parent.row())].size())) return {};
    return createIndex(row, column, quintptr(parent.row() + 1));
}

QModelIndex FamilyTreeModel::parent(const QModelIndex& child) const {
    if (!child.isValid() || child.internalId() == 0) return {};
    return createIndex(int(child.internalId() - 1), 0, quintptr(0));
}

int FamilyTreeModel::rowCount(const QModelIndex& parent) const {
    if (!parent.isValid()) return int(top_.size());
    if (parent.column() > 0 || parent.internalId() != 0 || parent.row() >= int(kids_.size())) return 0;
    return int(kids_[std::size_t(parent.row())].size());
}

int FamilyTreeModel::columnCount(const QModelIndex&) const { return FindingsModel::FieldCount; }

QVariant FamilyTreeModel::data(const QModelIndex& i, int role) const {
    const int row = source_row(i);
    const FindingView* f = source_->at(row);
    if (!f) return {};
    const QVariant base = source_->data(source_->index(row, i.column()), role);
    const bool beneath = i.internalId() != 0 || f->in_family();
    if (beneath && i.column() == FindingsModel::Class && (role == Qt::DisplayRole || role == Qt::ToolTipRole)) {
        // Beneath a lead the class column names the role; the glyph keeps the class in view (a
        // member has its lead's class; a proxy may not).
        if (role == Qt::DisplayRole)
            return class_glyph(f->cls) + QStringLiteral("  ") + role_word(f->family_role) +
                   (f->small_counts.isEmpty() ? QString() : tr("  (small counts)"));
        return tr("%1 — %2 of the family led by %3.\n\n%4")
            .arg(class_title(f->cls), role_word(f->family_role), f->family_lead, base.toString());
    }
    if (beneath && i.column() == FindingsModel::Class && role == Qt::FontRole) return {};  // the lead's row stands out
    if (i.column() != FindingsModel::Strata || (role != Qt::DisplayRole && role != Qt::ToolTipRole)) return base;
    if (beneath) {
        if (role == Qt::DisplayRole) return base;
        return tr("%1\n%2 of the family led by %3: %4")
            .arg(f->strata_label(), f->family_role == FamilyRole::Proxy ? tr("Proxy") : tr("Member"), f->family_lead,
                 f->family_reason);
    }
    const auto& kids = kids_[std::size_t(i.row())];
    if (kids.empty()) return role == Qt::DisplayRole ? base : QVariant(f->strata_label());
    int proxies = 0;
    for (int k : kids) proxies += source_->at(k)->family_role == FamilyRole::Proxy ? 1 : 0;
    const int members = int(kids.size()) - proxies;
    // Each part kept on one line ("2 members"); a narrow column may break after the comma.
    QStringList parts;
    if (proxies > 0) parts << (proxies == 1 ? tr("1 proxy") : tr("%1 proxies").arg(proxies));
    if (members > 0) parts << (members == 1 ? tr("1 member") : tr("%1 members").arg(members));
    const QString count = parts.join(QStringLiteral(", "));
    if (role == Qt::DisplayRole) {
        for (QString& p : parts) p.replace(QLatin1Char(' '), QChar(0x00a0));
        return base.toString() + QStringLiteral(" (%1)").arg(parts.join(QStringLiteral(", ")));
    }
    return tr("%1\nLeads a family of %2 findings (%3): the findings beneath it tell the same story. "
              "Right or + shows them, Left or - folds them.")
        .arg(f->strata_label())
        .arg(kids.size() + 1)
        .arg(count);
}

QVariant FamilyTreeModel::headerData(int section, Qt::Orientation o, int role) const {
    return source_->headerData(section, o, role);
}

}  // namespace foldline::ui
