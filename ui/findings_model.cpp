#include "ui/findings_model.h"

#include <QApplication>
#include <QFont>
#include <QPalette>

#include "ui/palette.h"

namespace foldline::ui {

QString class_title(FindingClass c) {
    switch (c) {
        case FindingClass::Reversal: return QObject::tr("Reversal");
        case FindingClass::Explained: return QObject::tr("Explained");
        case FindingClass::Masked: return QObject::tr("Masked");
        case FindingClass::Heterogeneous: return QObject::tr("Heterogeneous");
        case FindingClass::Stable: return QObject::tr("Stable");
    }
    return {};
}

QString class_meaning(FindingClass c) {
    switch (c) {
        case FindingClass::Reversal:
            return QObject::tr("Within the strata the gap points the other way from the pooled gap, and both are significant.");
        case FindingClass::Explained:
            return QObject::tr("The pooled gap is clear, but within the strata it is consistent with none.");
        case FindingClass::Masked:
            return QObject::tr("The pooled view shows no clear gap, but within the strata there is one.");
        case FindingClass::Heterogeneous:
            return QObject::tr("The strata disagree in direction and are not homogeneous: no single adjusted figure should be quoted.");
        case FindingClass::Stable:
            return QObject::tr("Stratifying does not change the conclusion of the pooled comparison.");
    }
    return {};
}

QString class_glyph(FindingClass c) {
    switch (c) {
        case FindingClass::Reversal: return QStringLiteral("⇄");
        case FindingClass::Explained: return QStringLiteral("↘");
        case FindingClass::Masked: return QStringLiteral("↗");
        case FindingClass::Heterogeneous: return QStringLiteral("≠");
        case FindingClass::Stable: return QStringLiteral("=");
    }
    return {};
}

QString decision_title(Decision d) {
    switch (d) {
        case Decision::Undecided: return QStringLiteral("—");
        case Decision::Upheld: return QObject::tr("Upheld");
        case Decision::SetAside: return QObject::tr("Set aside");
        case Decision::FollowUp: return QObject::tr("Follow up");
    }
    return {};
}

QString format_estimate(const Estimate& e, int digits) {
    if (!std::isfinite(e.value)) return QStringLiteral("—");
    QString s = QString::number(e.value, 'f', digits);
    if (e.has_ci()) s += QStringLiteral(" [%1, %2]").arg(e.lo, 0, 'f', digits).arg(e.hi, 0, 'f', digits);
    return s;
}

QString format_percent(const Estimate& e) {
    if (!std::isfinite(e.value)) return QStringLiteral("—");
    QString s = QStringLiteral("%1%").arg(100 * e.value, 0, 'f', 1);
    if (e.has_ci()) s += QStringLiteral(" [%1, %2]").arg(100 * e.lo, 0, 'f', 1).arg(100 * e.hi, 0, 'f', 1);
    return s;
}

QString format_points(const Estimate& e, bool with_ci) {
    if (!std::isfinite(e.value)) return QStringLiteral("—");
    QString s = QStringLiteral("%1 pp").arg(100 * e.value, 0, 'f', 1);
    if (with_ci && e.has_ci()) s += QStringLiteral(" [%1, %2]").arg(100 * e.lo, 0, 'f', 1).arg(100 * e.hi, 0, 'f', 1);
    return s;
}

QString format_gap(const FindingView& f, const Estimate& e, bool with_ci) {
    if (f.slope || f.mean) return format_estimate(with_ci ? e : Estimate{e.value, kNaN, kNaN});
    return format_points(e, with_ci);
}

FindingsModel::FindingsModel(QObject* parent) : QAbstractTableModel(parent) {}

void FindingsModel::clear() {
    beginResetModel();
    findings_.clear();
    endResetModel();
}

void FindingsModel::add(FindingView f) {
    const int r = int(findings_.size());
    beginInsertRows({}, r, r);
    f.id = r;
    findings_.push_back(std::move(f));
    endInsertRows();
}

const FindingView* FindingsModel::at(int row) const {
    return row >= 0 && row < size() ? &findings_[std::size_t(row)] : nullptr;
}
FindingView* FindingsModel::at(int row) { return row >= 0 && row < size() ? &findings_[std::size_t(row)] : nullptr; }

void FindingsModel::set_decision(int row, Decision d, const QString& note) {
    const FindingView* f = at(row);
    if (!f) return;
    set_review(row, d, note, d == f->decision ? f->applied_from : QString());
}

void FindingsModel::set_review(int row, Decision d, const QString& note, const QString& applied_from) {
    FindingView* f = at(row);
    if (!f) return;
    f->decision = d;
    f->note = note;
    f->applied_from = d == Decision::Undecided ? QString() : applied_from;
    emit dataChanged(index(row, 0), index(row, FieldCount - 1));
}

int FindingsModel::rowCount(const QModelIndex& parent) const { return parent.isValid() ? 0 : size(); }
int FindingsModel::columnCount(const QModelIndex& parent) const { return parent.isValid() ? 0 : FieldCount; }

QVariant FindingsModel::data(const QModelIndex& index, int role) const {
    const FindingView* f = at(index.row());
    if (!f) return {};
    if (role == ClassRole) return int(f->cls);
    if (role == LabelRole) return f->strata_label();
    if (role == SortRole) {
        switch (index.column()) {
            case Class: return rank(f->cls) * 10.0 + (std::isfinite(f->q_value) ? f->q_value : 1.0);
            case Strata: return f->strata_label();
            case Crude: return f->crude.value;
            case Adjusted: return f->adjusted.value;
            case QValue: return std::isfinite(f->q_value) ? f->q_value : 2.0;
            case Stability: return std::isfinite(f->stability) ? f->stability : -1.0;
            case Decided: return int(f->decision);
        }
    }
    if (role == Qt::DisplayRole) {
        switch (index.column()) {
            case Class:
                return class_glyph(f->cls) + QStringLiteral("  ") + class_title(f->cls) +
                       (f->small_counts.isEmpty() ? QString() : tr("  (small counts)"));
            case Strata: return f->strata_label() + (f->slope ? tr("  (slope)") : QString());
            case Crude: return format_gap(*f, f->crude, false);
            case Adjusted: return format_gap(*f, f->adjusted, false);
            case QValue: return std::isfinite(f->q_value) ? QString::number(f->q_value, 'g', 3) : QStringLiteral("—");
            case Stability:
                return std::isfinite(f->stability) ? QStringLiteral("%1%").arg(100 * f->stability, 0, 'f', 0) : QStringLiteral("—");
            case Decided:
                // A decision copied from the family's lead says so where it is read.
                return f->applied_from.isEmpty() ? decision_title(f->decision)
                                                 : tr("%1 (from lead)").arg(decision_title(f->decision));
        }
    }
    if (role == Qt::ToolTipRole) {
        switch (index.column()) {
            case Class:
                return f->small_counts.isEmpty() ? class_meaning(f->cls)
                                                 : class_meaning(f->cls) + QStringLiteral("\n\n") + f->small_counts;
            case Crude:
                return tr("Pooled %1, %2 minus %3: %4 (95% confidence interval)")
                    .arg(f->effect_name, f->focal, f->reference, format_gap(*f, f->crude));
            case Adjusted:
                return tr("%1 after stratifying: %2 (95% confidence interval)").arg(f->adjusted_name, format_gap(*f, f->adjusted));
            case Decided: {
                QString tip = f->note;
                if (!f->applied_from.isEmpty())
                    tip = tr("Applied from the family's lead, %1").arg(f->applied_from) +
                          (tip.isEmpty() ? QString() : QStringLiteral("\n\n") + tip);
                return tip;
            }
            case Strata: return f->strata_label();
        }
    }
    if (role == Qt::ForegroundRole && index.column() == Class && f->cls == FindingClass::Stable)
        return colors::muted(QApplication::palette());
    if (role == Qt::FontRole && index.column() == Class && f->cls == FindingClass::Reversal) {
        QFont b;
        b.setBold(true);
        return b;
    }
    if (role == Qt::TextAlignmentRole && index.column() >= Crude && index.column() <= Stability)
        return int(Qt::AlignRight | Qt::AlignVCenter);
    return {};
}

QVariant FindingsModel::headerData(int section, Qt::Orientation o, int role) const {
    if (o != Qt::Horizontal) return {};
    if (role == Qt::DisplayRole) {
        switch (section) {
            case Class: return tr("Class");
            case Strata: return tr("Stratified by");
            case Crude: return tr("Pooled gap");
            case Adjusted: return tr("Adjusted gap");  // Mantel-Haenszel for rates, within-stratum slope for trends
            case QValue: return tr("q-value");
            case Stability: return tr("Stability");
            case Decided: return tr("Decision");
        }
    }
    if (role == Qt::ToolTipRole) {
        switch (section) {
            case Class: return tr("What stratifying did to the pooled comparison");
            case Strata: return tr("The column or pair of columns that defines the strata");
            case Crude: return tr("The difference between the groups with all strata pooled together (rates: percentage points)");
            case Adjusted: return tr("The difference after comparing like with like within strata: the Mantel-Haenszel difference for rates (percentage points), the within-stratum slope for trends");
            case QValue: return tr("The smallest false discovery rate at which this finding would be flagged (Benjamini-Hochberg)");
            case Stability: return tr("Share of bootstrap resamples in which the finding keeps its class");
            case Decided: return tr("The reviewer's decision on this finding");
        }
    }
    return {};
}

FindingsFilter::FindingsFilter(QObject* parent) : QSortFilterProxyModel(parent) {
    setSortRole(FindingsModel::SortRole);
    // Over the family tree: a lead stays in view while a finding beneath it is shown.
    setRecursiveFilteringEnabled(true);
}

void FindingsFilter::set_class_shown(FindingClass c, bool shown) {
    shown_[int(c)] = shown;
    invalidateFilter();
}

void FindingsFilter::set_search(const QString& text) {
    search_ = text.trimmed();
    invalidateFilter();
}

bool FindingsFilter::filterAcceptsRow(int row, const QModelIndex& parent) const {
    const QModelIndex i = sourceModel()->index(row, FindingsModel::Strata, parent);
    const int cls = sourceModel()->data(i, FindingsModel::ClassRole).toInt();
    if (cls < 0 || cls > 4 || !shown_[cls]) return false;
    if (search_.isEmpty()) return true;
    return sourceModel()->data(i, FindingsModel::LabelRole).toString().contains(search_, Qt::CaseInsensitive);
}

bool FindingsFilter::lessThan(const QModelIndex& a, const QModelIndex& b) const {
    const QVariant va = a.data(FindingsModel::SortRole), vb = b.data(FindingsModel::SortRole);
    if (va.typeId() == QMetaType::QString) return va.toString() < vb.toString();
    return va.toDouble() < vb.toDouble();
}

}  // namespace foldline::ui
