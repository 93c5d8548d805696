// tests/ui/scan_page_test.cpp <-> ui/scan_page.h: the event loop stays responsive while a
// 1M-row scan runs on the worker thread, a cancel stops it promptly, and on a 2M-row table the
// first finding is on the page while the scan is still running.
#include <QElapsedTimer>
#include <QTimer>
#include <QtTest>
#include <random>

#include "ui/findings_model.h"
#include "ui/scan_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {
// An invented audit: `n` applicants (1 M unless said), two groups, `columns` 3- to 6-level columns.
std::shared_ptr<const Table> million_rows(std::size_t columns = 8, std::size_t n = 1'000'000) {
    std::mt19937 rng(7);
    Table t;
    t.rows = n;
    std::vector<std::uint32_t> g(n), y(n);
    std::vector<std::vector<std::uint32_t>> s(columns, std::vector<std::uint32_t>(n));
    for (std::size_t i = 0; i < n; ++i) {
        g[i] = rng() % 2;
        for (std::size_t k = 0; k < columns; ++k) s[k][i] = rng() % (3 + k % 4);
        y[i] = (rng() % 100) < (30 + 10 * s[0][i] + 5 * g[i]) ? 1 : 0;
    }
    t.columns.push_back(Column::categorical("group", {"A", "B"}, g));
    t.columns.push_back(Column::categorical("approved", {"0", "1"}, y));
    for (std::size_t k = 0; k < columns; ++k) {
        std::vector<std::string> levels;
        for (std::size_t l = 0; l < 3 + k % 4; ++l) levels.push_back(QStringLiteral("L%1").arg(l).toStdString());
        t.columns.push_back(Column::categorical(QStringLiteral("c%1").arg(k).toStdString(), levels, s[k]));
    }
    return std::make_shared<const Table>(std::move(t));
}

QuestionSpec question(int columns = 8) {
    QuestionSpec q;
    q.outcome = "approved";
    q.positive = "1";
    q.exposure = "group";
    q.focal = "B";
    q.reference = "A";
    for (int k = 0; k < columns; ++k) q.candidates << QStringLiteral("c%1").arg(k);
    q.pairs = true;
    q.bootstrap = 200;
    return q;
}
}  // namespace

class ScanPageTest : public QObject {
    Q_OBJECT
private slots:
    void event_loop_stays_responsive_during_a_million_row_scan() {
        if (!scan_available()) QSKIP("this build has no scan engine");
        auto table = million_rows();
        FindingsModel model;
        ScanPage page(&model);
        page.show();
        QElapsedTimer tick;
        qint64 worst = 0;
        int ticks = 0;
        QTimer timer;
        timer.setInterval(10);
        connect(&timer, &QTimer::timeout, [&] {
            if (ticks++ > 0) worst = std::max(worst, tick.elapsed());
            tick.restart();
        });
        QVERIFY(page.start(table, question(), audit_spec(question(), {})));
        tick.start();
        timer.start();
        QTRY_VERIFY_WITH_TIMEOUT(!page.running(), 240000);
        timer.stop();
        qInfo("1M-row scan: %.2f s, %d findings, %d timer ticks, longest gap between ticks %lld ms",
              page.elapsed_seconds(), model.size(), ticks, worst);
        QVERIFY(model.size() > 0);
        // Generous bound so a loaded 2-core machine never fails it; the figure is printed above.
        QVERIFY2(worst < 1000, qPrintable(QStringLiteral("longest gap %1 ms").arg(worst)));
    }

    void first_finding_is_shown_before_a_two_million_row_scan_completes() {
        if (!scan_available()) QSKIP("this build has no scan engine");
        // 40 columns: 40 single cubes and 780 pairs over 2 M rows, then the bootstrap. The page
        // shows findings as they arrive (every 50 ms), so the first one, from the first cube,
        // must be in the model while the worker is still busy with the rest. The check is on
        // the order of events, not on a duration, so a loaded machine cannot make it fail (and
        // 820 cubes keep even a many-core machine busy well past the first 50 ms refresh); the
        // times are printed (the strict figure at 10 M rows is bench/first_finding_bench).
        auto table = million_rows(40, 2'000'000);
        FindingsModel model;
        ScanPage page(&model);
        page.show();
        bool seen = false, running_at_first = false;
        double first_s = 0;
        connect(&model, &QAbstractItemModel::rowsInserted, &page, [&] {
            if (seen) return;
            seen = true;
            running_at_first = page.running();
            first_s = page.elapsed_seconds();
        });
        QVERIFY(page.start(table, question(40), audit_spec(question(40), {})));
        QTRY_VERIFY_WITH_TIMEOUT(!page.running(), 240000);
        qInfo("2M-row scan: first finding shown after %.3f s of %.2f s, %d findings", first_s,
              page.elapsed_seconds(), model.size());
        QVERIFY(seen);
        QVERIFY2(running_at_first, "the first finding appeared only after the scan had finished");
        QVERIFY(first_s < page.elapsed_seconds());
    }

    void cancel_stops_within_a_fraction_of_a_second() {
        if (!scan_available()) QSKIP("this build has no scan engine");
        // 40 columns and their 780 pairs: long enough that the scan is still running when stopped.
        auto table = million_rows(40);
        FindingsModel model;
        ScanPage page(&model);
        QVERIFY(page.start(table, question(40), audit_spec(question(40), {})));
        QTest::qWait(50);
        QVERIFY(page.running());
        QElapsedTimer clock;
        clock.start();
        page.cancel();
        QTRY_VERIFY_WITH_TIMEOUT(!page.running(), 10000);
        qInfo("cancel took %lld ms", clock.elapsed());
        QVERIFY(clock.elapsed() < 2000);
        QVERIFY(page.status().startsWith("Stopped"));
        // Why the later steps wait: the findings kept are provisional.
        QVERIFY2(page.status().contains("provisional") && page.status().contains("Diagram and Memo"),
                 qPrintable(page.status()));
    }
};

QTEST_MAIN(ScanPageTest)
#include "scan_page_test.moc"
