// tests/ui/findings_page_test.cpp <-> ui/findings_page.h, ui/findings_model.h, ui/charts.h,
// ui/tsv.h
#include <QApplication>
#include <QClipboard>
#include <QFileInfo>
#include <QTableView>
#include <QTableWidget>
#include <QTemporaryDir>
#include <QtTest>
#include <qcustomplot.h>

#include "ui/charts.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {
// Numbers as an engine would hand them over; the page must show them, not recompute them.
FindingView sample(FindingClass c, const QString& strata, double q) {
    FindingView f;
    f.cls = c;
    f.strata = QStringList{strata};
    f.focal = "B";
    f.reference = "A";
    f.effect_name = "risk difference";
    f.adjusted_name = "adjusted difference (Mantel-Haenszel)";
    f.crude = {-0.1, -0.15, -0.05};
    f.adjusted = {0.05, 0.01, 0.09};
    f.q_value = q;
    f.stability = 0.93;
    f.within = 0.04;
    f.composition = -0.14;
    f.pooled = {"all", 300, 1000, 400, 1000, {0.3, 0.27, 0.33}, {0.4, 0.37, 0.43}, f.crude, 0.75, true, {}};
    f.rows.push_back({"north", 250, 500, 100, 250, {0.5, 0.46, 0.54}, {0.4, 0.34, 0.46}, {0.1, 0.03, 0.17}, 1.25, true, {}});
    f.rows.push_back({"south", 50, 500, 300, 750, {0.1, 0.08, 0.13}, {0.4, 0.37, 0.44}, {-0.3, -0.34, -0.26}, 0.25, true, {}});
    f.rows.push_back({"east", 0, 0, 0, 0, {}, {}, {}, kNaN, false, "no focal rows"});
    return f;
}
}  // namespace

class FindingsPageTest : public QObject {
    Q_OBJECT
private slots:
    void ranks_filters_and_searches() {
        FindingsModel model;
        FindingsPage page(&model);
        model.add(sample(FindingClass::Stable, "branch", 0.9));
        model.add(sample(FindingClass::Reversal, "product", 0.01));
        model.add(sample(FindingClass::Explained, "channel", 0.02));
        QCOMPARE(page.select_top(), 1);  // reversal ranks first whatever the arrival order
        page.filter()->set_class_shown(FindingClass::Reversal, false);
        QCOMPARE(page.list()->model()->rowCount(), 2);
        page.filter()->set_class_shown(FindingClass::Reversal, true);
        page.set_search("chan");
        QCOMPARE(page.list()->model()->rowCount(), 1);
        page.set_search({});
        QCOMPARE(page.list()->model()->rowCount(), 3);
    }

    // A finding whose class rests on an exact test (core/scan/small_counts.h) says so in the class
    // column, and its tooltip gives the engine's reasons; other findings carry no mark.
    void small_counts_are_marked_on_the_class() {
        FindingsModel model;
        model.add(sample(FindingClass::Stable, "branch", 0.9));
        FindingView f = sample(FindingClass::Masked, "penicillin", 0.04);
        f.small_counts = "Mantel-Fleiss distance 4 < 5: the exact conditional test decides (p 0.03994).";
        model.add(f);
        const QModelIndex plain = model.index(0, FindingsModel::Class), small = model.index(1, FindingsModel::Class);
        QVERIFY(!model.data(plain, Qt::DisplayRole).toString().contains(QStringLiteral("small counts")));
        QVERIFY(model.data(small, Qt::DisplayRole).toString().endsWith(QStringLiteral("(small counts)")));
        QVERIFY(model.data(small, Qt::ToolTipRole).toString().contains(QStringLiteral("exact conditional test decides")));
        QVERIFY(!model.data(plain, Qt::ToolTipRole).toString().contains(QStringLiteral("Mantel-Fleiss")));
    }

    void tables_show_the_engine_numbers_and_grey_uninformative_strata() {
        FindingsModel model;
        FindingsPage page(&model);
        page.resize(1200, 800);
        model.add(sample(FindingClass::Reversal, "product", 0.01));
        QVERIFY(page.select(0));
        QTableWidget* s = page.strata_table();
        QCOMPARE(s->rowCount(), 3);
        QCOMPARE(s->item(0, 0)->text(), QStringLiteral("north"));
        QCOMPARE(s->item(0, 1)->text(), QStringLiteral("250 / 500"));
        QCOMPARE(s->item(0, 5)->text(), QStringLiteral("10.0 pp [3.0, 17.0]"));
        QCOMPARE(s->item(0, 2)->text(), QStringLiteral("50.0% [46.0, 54.0]"));
        QCOMPARE(s->item(1, 6)->text(), QStringLiteral("0.25"));
        QVERIFY(s->item(2, 7)->text().contains("no focal rows"));
        QVERIFY(s->item(2, 0)->font().italic());
        QTableWidget* p = page.pooled_table();
        QCOMPARE(p->item(0, 1)->text(), QStringLiteral("300 / 1000"));
        QCOMPARE(p->item(2, 2)->text(), QStringLiteral("-10.0 pp [-15.0, -5.0]"));
        QCOMPARE(p->item(4, 2)->text(), QStringLiteral("5.0 pp [1.0, 9.0]"));
        QVERIFY(p->item(4, 0)->text().contains("Mantel-Haenszel"));
        // The list shows rate gaps in the memo's unit (percentage points), not as fractions.
        QCOMPARE(model.data(model.index(0, FindingsModel::Crude)).toString(), QStringLiteral("-10.0 pp"));
        QCOMPARE(model.data(model.index(0, FindingsModel::Adjusted)).toString(), QStringLiteral("5.0 pp"));
        // Every statistic explains itself.
        QVERIFY(!s->horizontalHeaderItem(5)->toolTip().isEmpty());
        QVERIFY(!s->horizontalHeaderItem(6)->toolTip().isEmpty());

        page.copy_table();
        const QString tsv = QApplication::clipboard()->text();
        QVERIFY(tsv.startsWith("Stratum\tB\t"));
        QVERIFY(tsv.contains("north\t250 / 500\t"));
        QCOMPARE(tsv.count('\n'), 4);

        page.decide(Decision::FollowUp);
        QCOMPARE(model.at(0)->decision, Decision::FollowUp);
    }

    void charts_save_as_png_svg_and_pdf() {
        FindingsModel model;
        FindingsPage page(&model);
        page.resize(1200, 800);
        page.show();
        QVERIFY(QTest::qWaitForWindowExposed(&page));
        model.add(sample(FindingClass::Reversal, "product", 0.01));
        QVERIFY(page.select(0));
        QTemporaryDir dir;
        for (const char* ext : {"png", "svg", "pdf"}) {
            const QString path = dir.filePath(QStringLiteral("forest.") + ext);
            const Status st = charts::save(page.current_chart(), path);
            QVERIFY2(st.ok(), ext);
            QVERIFY(QFileInfo(path).size() > 500);
        }
        QVERIFY(!charts::save(page.current_chart(), dir.filePath("x.bmp")).ok());
        // An exported chart carries its heading (data set, groups, question) in the file only.
        const int rows_before = page.current_chart()->plotLayout()->rowCount();
        const QString svg = dir.filePath("headed.svg");
        QVERIFY(charts::save(page.current_chart(), svg, "clinic.csv — recovered = yes, B against A (group)").ok());
        QFile headed(svg);
        QVERIFY(headed.open(QIODevice::ReadOnly));
        QVERIFY(QString::fromUtf8(headed.readAll()).contains("clinic.csv"));
        QCOMPARE(page.current_chart()->plotLayout()->rowCount(), rows_before);
        // The save dialog's chosen filter supplies a missing suffix, never a second one.
        QCOMPARE(with_chart_suffix("/tmp/gaps", "SVG drawing (*.svg)"), QStringLiteral("/tmp/gaps.svg"));
        QCOMPARE(with_chart_suffix("/tmp/gaps.pdf", "PNG image (*.png)"), QStringLiteral("/tmp/gaps.pdf"));
        QCOMPARE(with_chart_suffix("/tmp/gaps.v2", "PDF document (*.pdf)"), QStringLiteral("/tmp/gaps.v2.pdf"));
        // Forest chart: one series of informative strata, one marker each for adjusted and pooled.
        QCOMPARE(page.current_chart()->graphCount(), 3);  // strata, adjusted, pooled
        // For looking at the page by eye: FOLDLINE_UI_GRAB_DIR=/some/dir saves the page per chart.
        if (const QByteArray grab = qgetenv("FOLDLINE_UI_GRAB_DIR"); !grab.isEmpty())
            for (int i = 0; i < 3; ++i) {
                page.chart_tabs()->setCurrentIndex(i);
                QApplication::processEvents();
                page.grab().save(QString::fromLocal8Bit(grab) + QStringLiteral("/findings-%1.png").arg(i));
            }
    }

    void slope_finding_uses_scatter_tabs() {
        FindingsModel model;
        FindingsPage page(&model);
        FindingView f;
        f.slope = true;
        f.cls = FindingClass::Reversal;
        f.strata = {"site"};
        f.focal = "dose";
        f.reference = "response";
        f.crude = {-0.5, -0.7, -0.3};
        f.pooled_intercept = 10;
        f.adjusted = {0.8, 0.6, 1.0};
        f.slope_rows = {{"a", 50, {0.8, 0.5, 1.1}, 2}, {"b", 50, {0.7, 0.4, 1.0}, 6}};
        for (int i = 0; i < 100; ++i) {
            const int s = i % 2;
            const double x = s ? 5 + i * 0.01 : i * 0.01;
            f.points.push_back({x, (s ? 6 : 2) + 0.8 * x});
            f.point_stratum.push_back(s);
        }
        f.points_note = "all 100 points";
        model.add(f);
        QVERIFY(page.select(0));
        QCOMPARE(page.strata_table()->rowCount(), 2);
        QCOMPARE(page.chart_tabs()->currentIndex(), 3);
        QVERIFY(!page.chart_tabs()->isTabVisible(0));
    }
};

QTEST_MAIN(FindingsPageTest)
#include "findings_page_test.moc"
