#include "ui/demo.h"

#include <QApplication>
#include <QDir>
#include <QElapsedTimer>
#include <QFileInfo>
#include <QPixmap>
#include <QTabWidget>
#include <QTreeView>
#include <QThread>

#include "ui/counts_grid.h"
#include "ui/diagram_page.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"
#include "ui/main_window.h"
#include "ui/question_page.h"
#include "ui/scan_page.h"
#include "ui/source_page.h"

#ifndef FOLDLINE_SOURCE_DIR
#define FOLDLINE_SOURCE_DIR ""
#endif

namespace foldline::ui {

namespace {
bool spin_until(const std::function<bool()>& done, int timeout_ms) {
    QElapsedTimer t;
    t.start();
    while (!done()) {
        if (t.elapsed() > timeout_ms) return false;
        QApplication::processEvents(QEventLoop::AllEvents, 20);
        QThread::msleep(5);
    }
    return true;
}
/// Opens on the highest-ranked finding with a single stratifier: its story is the easiest to read.
void select_top_single(MainWindow& w) {
    FindingsPage* page = w.findings_page();
    page->select_top();
    for (int r = 0; r < page->list()->model()->rowCount(); ++r) {
        const int row = page->source_row(page->list()->model()->index(r, 0));
        if (w.findings_model()->at(row)->strata.size() == 1) {
            page->select(row);
            // Its family unfolded, so the findings that repeat its story are in view.
            page->list()->expand(page->list()->model()->index(r, 0));
            return;
        }
    }
}
}  // namespace

QString find_sample(const QString& name) {
    QStringList roots;
    const QDir exe(QApplication::applicationDirPath());
    for (const char* up : {".", "..", "../..", "../../.."}) roots << exe.absoluteFilePath(QString::fromLatin1(up));
    roots << QStringLiteral(FOLDLINE_SOURCE_DIR) << QDir::currentPath();
    for (const QString& r : roots) {
        const QString p = QDir(r).absoluteFilePath(QStringLiteral("sample_data/") + name);
        if (QFileInfo(p).isFile()) return QDir::cleanPath(p);
    }
    return {};
}

/// Seeds the diagram for the selected finding, then replaces it with the sample's own diagram
/// file when there is one (the scenario's story as its author drew it).
static void load_sample_diagram(MainWindow& w, const QString& name) {
    const QString path = find_sample(name);
    if (path.isEmpty()) return;
    w.go_to(MainWindow::Diagram);
    w.diagram_page()->open_file(path);
    w.go_to(MainWindow::Findings);
}

QString prepare_demo(MainWindow& w, int timeout_ms) {
    SourcePage* src = w.source_page();
    const QString csv = find_sample(QStringLiteral("lender_approvals.csv"));
    if (reader_available() && !csv.isEmpty()) {
        src->open_path(csv);
        if (!spin_until([&] { return !src->loading(); }, timeout_ms)) return QObject::tr("loading the demo timed out");
        if (!src->table()) return QObject::tr("the demo data did not load: %1").arg(src->message());
    } else {
        // Invented counts of a fictional lender: approvals by product line for two applicant groups.
        CountsGrid* g = src->counts_grid();
        g->set_rows({{"secured_card", "540", "600", "160", "200"},
                     {"auto_loan", "270", "400", "390", "600"},
                     {"debt_consolidation", "60", "200", "300", "1000"}});
        src->show_counts_grid();
        g->use_table();
        if (!src->table()) return QObject::tr("the demo counts did not build a table");
    }
    QuestionSpec q = w.question_page()->spec();
    if (src->table()->column("approved")) {
        q.outcome = QStringLiteral("approved");
        q.positive = QStringLiteral("1");
        q.exposure = QStringLiteral("applicant_group");
        q.focal = QStringLiteral("B");
        q.reference = QStringLiteral("A");
        w.question_page()->set_spec(q);
    }
    if (!w.question_page()->problems().isEmpty()) {
        w.go_to(MainWindow::Question);
        return w.question_page()->problems().join(QLatin1Char(' '));
    }
    if (!w.start_scan()) return QObject::tr("the scan did not start");
    if (!spin_until([&] { return !w.scan_page()->running(); }, timeout_ms)) return QObject::tr("the demo scan timed out");
    QApplication::processEvents();
    if (w.findings_model()->size() == 0) return QObject::tr("the demo scan found nothing: %1").arg(w.scan_page()->status());
    w.go_to(MainWindow::Findings);
    select_top_single(w);
    load_sample_diagram(w, QStringLiteral("lender_approvals.diagram.json"));
    return {};
}

QString prepare_slope_demo(MainWindow& w, int timeout_ms) {
    SourcePage* src = w.source_page();
    const QString csv = find_sample(QStringLiteral("retail_weeks.csv"));
    if (csv.isEmpty()) return QObject::tr("sample_data/retail_weeks.csv not found");
    src->open_path(csv);
    if (!spin_until([&] { return !src->loading(); }, timeout_ms)) return QObject::tr("loading the demo timed out");
    if (!src->table()) return QObject::tr("the demo data did not load: %1").arg(src->message());
    QuestionSpec q = w.question_page()->spec();
    q.slope = true;
    q.outcome = QStringLiteral("weekly_sales");
    q.exposure = QStringLiteral("promo_spend");
    w.question_page()->set_spec(q);
    if (!w.question_page()->problems().isEmpty()) return w.question_page()->problems().join(QLatin1Char(' '));
    if (!w.start_scan()) return QObject::tr("the scan did not start");
    if (!spin_until([&] { return !w.scan_page()->running(); }, timeout_ms)) return QObject::tr("the demo scan timed out");
    QApplication::processEvents();
    if (w.findings_model()->size() == 0) return QObject::tr("the demo scan found nothing: %1").arg(w.scan_page()->status());
    w.go_to(MainWindow::Findings);
    select_top_single(w);
    load_sample_diagram(w, QStringLiteral("retail_weeks.diagram.json"));
    return {};
}

int save_screenshots(MainWindow& w, const QString& dir) {
    QDir().mkpath(dir);
    const char* names[] = {"source", "question", "scan", "findings", "diagram", "memo"};
    int written = 0;
    for (int s = 0; s < MainWindow::StepCount; ++s) {
        w.go_to(s);
        QApplication::processEvents();
        const QString path = QDir(dir).absoluteFilePath(QStringLiteral("%1-%2.png").arg(s + 1, 2, 10, QLatin1Char('0')).arg(names[s]));
        if (w.grab().save(path)) ++written;
    }
    // The findings step once more with the stratum-mix chart, which tells the story of a reversal.
    w.go_to(MainWindow::Findings);
    if (auto* tabs = w.findings_page()->chart_tabs()) {
        tabs->setCurrentIndex(1);
        QApplication::processEvents();
        if (w.grab().save(QDir(dir).absoluteFilePath(QStringLiteral("07-findings-mix.png")))) ++written;
        tabs->setCurrentIndex(0);
    }
    return written;
}

}  // namespace foldline::ui
