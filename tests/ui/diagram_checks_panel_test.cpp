// tests/ui/diagram_checks_panel_test.cpp <-> ui/diagram_checks_panel.h (and its hook in
// ui/diagram_page.h). The statistics themselves are checked in tests/core/audit.
#include <QLabel>
#include <QThread>
#include <QtTest>
#include <cmath>
#include <random>

#include "ui/diagram_checks_panel.h"
#include "ui/diagram_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

// Rows in which c depends on a directly (log-odds 1.0 per level), not only through b: the
// diagram a → b → c misses that arrow, so its claim "a and c independent given b" is false.
std::shared_ptr<const Table> rows_with_direct_effect(std::size_t n) {
    std::mt19937_64 rng(3);
    std::uniform_real_distribution<double> u(0, 1);
    std::vector<std::uint32_t> a(n), b(n), c(n);
    for (std::size_t i = 0; i < n; ++i) {
        a[i] = static_cast<std::uint32_t>(u(rng) * 3);
        b[i] = u(rng) < 0.3 + 0.2 * a[i];
        const double p = 1.0 / (1.0 + std::exp(-(-0.5 + 0.6 * b[i] + 1.0 * a[i])));
        c[i] = u(rng) < p;
    }
    auto t = std::make_shared<Table>();
    t->rows = n;
    t->columns = {Column::categorical("a", {"a0", "a1", "a2"}, a), Column::categorical("b", {"b0", "b1"}, b),
                  Column::categorical("c", {"c0", "c1"}, c)};
    return t;
}

causal::Diagram chain(bool with_direct) {
    causal::Diagram d;
    d.nodes = {{"a", true, {}, {}}, {"b", true, {}, {}}, {"c", true, {}, {}}};
    d.edges = {{"a", "b"}, {"b", "c"}};
    if (with_direct) d.edges.push_back({"a", "c"});
    return d;
}

}  // namespace

class DiagramChecksPanelTest : public QObject {
    Q_OBJECT
private slots:
    void missing_arrow_is_flagged_off_the_gui_thread() {
        DiagramChecksPanel panel;
        panel.set_rows(rows_with_direct_effect(4000));
        panel.set_diagram(chain(false));
        // set_diagram only schedules: the tests run on the job's worker.
        QVERIFY(panel.busy());
        QVERIFY(panel.wait(20000));
        QVERIFY(panel.checks().has_value());
        QCOMPARE(int(panel.checks()->checks.size()), 1);
        QCOMPARE(panel.checks()->contradicted, 1);
        QCOMPARE(panel.tests_run(), 1);
        auto* summary = panel.findChild<QLabel*>(QStringLiteral("diagram_checks_summary"));
        auto* list = panel.findChild<QLabel*>(QStringLiteral("diagram_checks_list"));
        QVERIFY2(summary->text().startsWith("1 of 1 tested claims are contradicted"), qPrintable(summary->text()));
        QVERIFY2(list->text().contains("the data disagree"), qPrintable(list->text()));
        QVERIFY(list->text().contains("an arrow or a common cause may be missing"));
    }

    void an_edit_reuses_cached_tests_and_a_quick_edit_cancels_the_run() {
        DiagramChecksPanel panel;
        QSignalSpy changed(&panel, &DiagramChecksPanel::checks_changed);
        panel.set_rows(rows_with_direct_effect(4000));
        panel.set_diagram(chain(false));
        QVERIFY(panel.wait(20000));
        // Drawing the missing arrow leaves nothing to claim.
        panel.set_diagram(chain(true));
        QVERIFY(panel.wait(20000));
        QVERIFY(panel.checks()->checks.empty());
        auto* summary = panel.findChild<QLabel*>(QStringLiteral("diagram_checks_summary"));
        QVERIFY(summary->text().contains("no claim"));
        // Undoing it brings the claim back from the cache: no test runs.
        panel.set_diagram(chain(false));
        QVERIFY(panel.wait(20000));
        QCOMPARE(int(panel.checks()->checks.size()), 1);
        QCOMPARE(panel.tests_run(), 0);
        QCOMPARE(panel.checks()->contradicted, 1);
        // Two edits in a row: the result is the last diagram's.
        const int before = int(changed.count());
        panel.set_diagram(chain(true));
        panel.set_diagram(chain(false));
        QVERIFY(panel.wait(20000));
        QCOMPARE(int(panel.checks()->checks.size()), 1);
        QVERIFY(changed.count() > before);
    }

    void without_rows_nothing_is_tested() {
        DiagramChecksPanel panel;
        panel.set_diagram(chain(false));
        QVERIFY(panel.wait(5000));
        QVERIFY(!panel.checks().has_value());
        auto* summary = panel.findChild<QLabel*>(QStringLiteral("diagram_checks_summary"));
        QVERIFY(summary->text().contains("Run a scan"));
    }

    void the_diagram_page_rechecks_after_each_edit() {
        DiagramPage page;
        page.seed("b", "c", {"a"}, {"a", "b", "c"});  // b → c only: a fresh diagram claims no other arrow
        QVERIFY(page.doc()->add_edge("a", "b"));
        QVERIFY(page.doc()->add_edge("a", "c"));      // a → b, a → c, b → c: nothing to claim
        page.checks_panel()->set_rows(rows_with_direct_effect(4000));
        QVERIFY(page.checks_panel()->wait(20000));
        QVERIFY(page.checks_panel()->checks().has_value());
        QVERIFY(page.checks_panel()->checks()->checks.empty());
        page.doc()->remove_edge("a", "c");
        QVERIFY(page.checks_panel()->wait(20000));
        QCOMPARE(int(page.checks_panel()->checks()->checks.size()), 1);
        QCOMPARE(page.checks_panel()->checks()->contradicted, 1);
    }
};

QTEST_MAIN(DiagramChecksPanelTest)
#include "diagram_checks_panel_test.moc"
