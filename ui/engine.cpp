#include "ui/engine.h"

#include <QObject>
#include <algorithm>

#if __has_include("core/io/csv_reader.h")
#include "core/io/csv_reader.h"
#define FOLDLINE_UI_HAS_READER 1
#endif

namespace foldline::ui {

bool reader_available() {
#ifdef FOLDLINE_UI_HAS_READER
    return true;
#else
    return false;
#endif
}

Result<Table> load_table(const QString& path, const LoadOptions& opts, const Work& work) {
#ifdef FOLDLINE_UI_HAS_READER
    CsvOptions o;
    o.count_column = opts.count_column.toStdString();
    if (!opts.missing_markers.isEmpty()) {
        o.missing_markers.clear();
        for (const QString& m : opts.missing_markers) o.missing_markers.push_back(m.toStdString());
    }
    for (const auto& [name, type] : opts.type_overrides) o.type_overrides[name] = type;
    return read_csv(path.toStdString(), o, nullptr, work);
#else
    (void)opts;
    (void)work;
    return make_error("this build has no CSV reader", path.toStdString());
#endif
}

std::vector<CandidateView> propose_candidates(const Table& t, const QuestionSpec& q) {
    std::vector<CandidateView> out;
    for (const Column& c : t.columns) {
        CandidateView v{QString::fromStdString(c.name), true, {}};
        const double miss = t.rows ? double(c.missing_count) / double(t.rows) : 0.0;
        const std::size_t distinct = c.distinct_count();
        if (v.column == q.outcome) {
            v.usable = false;
            v.reason = QObject::tr("the outcome");
        } else if (v.column == q.exposure) {
            v.usable = false;
            v.reason = QObject::tr("the compared groups");
        } else if (distinct < 2) {
            v.usable = false;
            v.reason = QObject::tr("constant");
        } else if (miss > 0.5) {
            v.usable = false;
            v.reason = QObject::tr("mostly missing (%1%)").arg(100 * miss, 0, 'f', 0);
        } else if (c.is_categorical() && distinct > 50) {
            v.usable = false;
            v.reason = distinct >= t.rows ? QObject::tr("one value per row")
                                          : QObject::tr("too many levels (%1 > 50)").arg(distinct);
        }
        out.push_back(std::move(v));
    }
    return out;
}

QStringList check_question(const Table& t, const QuestionSpec& q) {
    QStringList problems;
    const Column* outcome = t.column(q.outcome.toStdString());
    const Column* exposure = t.column(q.exposure.toStdString());
    if (!outcome) problems << QObject::tr("Choose the outcome column.");
    if (!exposure) problems << QObject::tr("Choose the column that holds the compared groups.");
    if (outcome && exposure && outcome == exposure)
        problems << QObject::tr("The outcome and the groups must be different columns.");
    if (outcome && !outcome->is_binary())
        problems << QObject::tr("The outcome \"%1\" has %2 distinct values; a rate needs exactly two.")
                        .arg(q.outcome)
                        .arg(outcome->distinct_count());
    if (outcome && q.positive.isEmpty()) problems << QObject::tr("Choose which outcome value counts as positive.");
    if (exposure) {
        if (q.focal.isEmpty() || q.reference.isEmpty())
            problems << QObject::tr("Choose the focal group and the reference group.");
        else if (q.focal == q.reference)
            problems << QObject::tr("The focal and reference groups must differ.");
    }
    if (q.candidates.isEmpty()) problems << QObject::tr("Tick at least one candidate stratifier.");
    if (q.alpha <= 0 || q.alpha >= 0.5) problems << QObject::tr("Alpha must lie between 0 and 0.5.");
    return problems;
}

bool scan_available() { return false; }

Result<int> run_scan(const Table&, const QuestionSpec&, const Work&, const std::function<void(FindingView)>&) {
    return make_error("this build has no rate scan");
}

}  // namespace foldline::ui
