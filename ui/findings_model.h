#pragma once
// The ranked list of findings: one row per finding (class, strata, crude vs adjusted effect,
// q-value, stability, decision), filled as the scan delivers them; plus a proxy that filters
// by class and searches the strata names.
#include <QAbstractTableModel>
#include <QSortFilterProxyModel>
#include <vector>

#include "ui/finding_view.h"

namespace foldline::ui {

class FindingsModel : public QAbstractTableModel {
    Q_OBJECT
public:
    enum Field { Class, Strata, Crude, Adjusted, QValue, Stability, Decided, FieldCount };
    enum Roles { SortRole = Qt::UserRole + 1, ClassRole, LabelRole /* strata label, for search */ };
    explicit FindingsModel(QObject* parent = nullptr);

    void clear();
    /// Appends one finding (rows are inserted, so views update as the scan runs).
    void add(FindingView f);
    const FindingView* at(int row) const;
    FindingView* at(int row);
    int size() const { return int(findings_.size()); }
    const std::vector<FindingView>& findings() const { return findings_; }
    /// Records the reviewer's decision and note on row `row`. A decision other than the one
    /// recorded is the reviewer's own: it clears where an applied decision came from.
    void set_decision(int row, Decision d, const QString& note);
    /// Records decision, note and the family lead the decision was applied from (empty: decided
    /// on its own) on row `row`, as they are; out-of-range rows are ignored.
    void set_review(int row, Decision d, const QString& note, const QString& applied_from);

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

private:
    std::vector<FindingView> findings_;
};

/// Filters findings by class (a set of allowed classes) and a search text over strata; over a
/// tree, a lead is kept while any finding beneath it is.
class FindingsFilter : public QSortFilterProxyModel {
    Q_OBJECT
public:
    explicit FindingsFilter(QObject* parent = nullptr);
    void set_class_shown(FindingClass c, bool shown);
    void set_search(const QString& text);

protected:
    bool filterAcceptsRow(int row, const QModelIndex& parent) const override;
    bool lessThan(const QModelIndex& a, const QModelIndex& b) const override;

private:
    bool shown_[5] = {true, true, true, true, true};
    QString search_;
};

/// Display name of a class, capitalised for headings ("Reversal").
QString class_title(FindingClass c);
/// One-sentence meaning of a class, for tooltips.
QString class_meaning(FindingClass c);
/// Glyph that marks a class without relying on colour.
QString class_glyph(FindingClass c);
/// Display text of a decision ("Upheld", "Set aside", "Follow up", "—").
QString decision_title(Decision d);
/// "0.123 [0.045, 0.201]" with `digits` decimals; "—" when the value is NaN.
QString format_estimate(const Estimate& e, int digits = 3);
/// A rate as a percentage, "41.2% [38.0, 44.5]"; "—" when the value is NaN.
QString format_percent(const Estimate& e);
/// A rate gap in percentage points, "-19.9 pp [-24.1, -15.7]" (one decimal, as the memo writes
/// it); "—" when the value is NaN. `with_ci` false leaves the interval out.
QString format_points(const Estimate& e, bool with_ci = true);
/// A finding's gap in its own unit: percentage points for rates, the slope's unit for trends.
QString format_gap(const FindingView& f, const Estimate& e, bool with_ci = true);

}  // namespace foldline::ui
