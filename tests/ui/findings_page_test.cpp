// tests/ui/findings_page_test.cpp <-> ui/findings_page.h, ui/findings_model.h, ui/charts.h,
// ui/tsv.h
#include <QApplication>
#include <QClipboard>
#include <QFileInfo>
#include <QAction>
#include <QLabel>
#include <QMenu>
#include <QMessageBox>
#include <QPushButton>
#include <QTableWidget>
#include <QTemporaryDir>
#include <QTimer>
#include <QTreeView>
#include <QUndoStack>
#include <QtTest>
#include <qcustomplot.h>

#include "ui/charts.h"
#include "ui/family_tree_model.h"
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
// A family as core's assign_families leaves it (core/scan/families.h): "product" leads, two pairs
// that add nothing beyond it are members, a banded copy is its proxy; "channel" stands alone.
FindingView in_family(FindingView f, FamilyRole role, const QString& lead, const QString& reason) {
    f.family_role = role;
    f.family_lead = lead;
    f.family_reason = reason;
    return f;
}
FindingView pair(FindingClass c, const QString& a, const QString& b, double q) {
    FindingView f = sample(c, a, q);
    f.strata << b;
    return f;
}
/// Rows in the order core ranks them: 0 product, 1 product_band, 2 product × branch,
/// 3 product × term, 4 channel.
void add_family(FindingsModel& model, bool lead_last = false) {
    const QString why = "adds nothing beyond product: MH odds ratio inside product's interval";
    std::vector<FindingView> fs = {
        in_family(sample(FindingClass::Reversal, "product", 0.001), FamilyRole::Lead, "product", "single column"),
        in_family(sample(FindingClass::Reversal, "product_band", 0.002), FamilyRole::Proxy, "product",
                  "proxy of product: each level of product_band meets one level of product"),
        in_family(pair(FindingClass::Reversal, "product", "branch", 0.003), FamilyRole::Member, "product", why),
        in_family(pair(FindingClass::Reversal, "product", "term", 0.004), FamilyRole::Member, "product", why),
        in_family(sample(FindingClass::Explained, "channel", 0.02), FamilyRole::Lead, "channel", "single column")};
    if (lead_last) std::rotate(fs.begin(), fs.begin() + 1, fs.end());
    for (FindingView& f : fs) model.add(std::move(f));
}
int row_of(const FindingsModel& m, const QString& label) {
    for (int i = 0; i < m.size(); ++i)
        if (m.at(i)->strata_label() == label) return i;
    return -1;
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

    // Families fold beneath their lead: the lead's row counts them, each row beneath names its
    // role (the class glyph kept), core's reason is the tooltip, and picking one shows it.
    void families_fold_beneath_their_lead() {
        for (bool lead_last : {false, true}) {
            FindingsModel model;
            FindingsPage page(&model);
            page.resize(1200, 800);
            add_family(model, lead_last);  // a lead arriving after its family still gathers it
            QAbstractItemModel* list = page.list()->model();
            QCOMPARE(list->rowCount(), 2);  // product and channel
            const int product = row_of(model, "product"), band = row_of(model, "product_band"),
                      branch = row_of(model, "product × branch");
            const QModelIndex lead = list->index(0, FindingsModel::Strata);
            QCOMPARE(page.source_row(lead), product);
            QCOMPARE(list->rowCount(lead.siblingAtColumn(0)), 3);
            QCOMPARE(lead.data().toString(), QString("product (1\u00a0proxy, 2\u00a0members)"));
            QVERIFY(lead.data(Qt::ToolTipRole).toString().contains("Leads a family of 4 findings"));
            QCOMPARE(list->rowCount(list->index(1, 0)), 0);  // channel leads no one
            QCOMPARE(list->index(1, FindingsModel::Strata).data().toString(), QString("channel"));
            // Proxies before members, as core ranked them; the role in the class column.
            const QModelIndex first = list->index(0, FindingsModel::Class, lead.siblingAtColumn(0));
            QCOMPARE(page.source_row(first), band);
            QVERIFY(first.data().toString().contains("proxy"));
            QVERIFY(first.data().toString().startsWith(class_glyph(FindingClass::Reversal)));
            const QModelIndex member = list->index(1, FindingsModel::Strata, lead.siblingAtColumn(0));
            QCOMPARE(page.source_row(member), branch);
            QCOMPARE(member.data().toString(), QString("product × branch"));
            QVERIFY(member.siblingAtColumn(FindingsModel::Class).data().toString().contains("member"));
            QVERIFY(member.data(Qt::ToolTipRole).toString().contains("adds nothing beyond product"));
            QCOMPARE(page.family_tree()->folded_under(product), (std::vector<int>{band, branch, row_of(model, "product × term")}));
            QCOMPARE(page.family_tree()->lead_row(branch), product);
            // Folded at first; selecting a member unfolds its family and shows the member.
            QVERIFY(!page.list()->isExpanded(lead.siblingAtColumn(0)));
            QVERIFY(page.select(branch));
            QVERIFY(page.list()->isExpanded(lead.siblingAtColumn(0)));
            QCOMPARE(page.selected(), branch);
            QVERIFY(page.findChild<QLabel*>("finding_heading")->text().contains("product × branch"));
            auto* line = page.findChild<QLabel*>("family_line");
            QVERIFY(line->text().contains("Member of the family led by"));
            QVERIFY(line->text().contains("adds nothing beyond product"));
            // A search for the pair's other column keeps its lead in view, with only that pair.
            page.set_search("term");
            QCOMPARE(list->rowCount(), 1);
            QCOMPARE(list->rowCount(list->index(0, 0)), 1);
            page.set_search({});
            QCOMPARE(list->rowCount(), 2);
        }
    }

    // Right or + unfolds a family from the keyboard, Left or - folds it; Down then walks into it.
    void keyboard_unfolds_and_folds_a_family() {
        FindingsModel model;
        FindingsPage page(&model);
        page.resize(1200, 800);
        page.show();
        QVERIFY(QTest::qWaitForWindowExposed(&page));
        add_family(model);
        QTreeView* list = page.list();
        QCOMPARE(page.select_top(), row_of(model, "product"));
        list->setFocus();
        const QModelIndex lead = list->model()->index(0, 0);
        QVERIFY(!list->isExpanded(lead));
        QTest::keyClick(list, Qt::Key_Right);
        QVERIFY(list->isExpanded(lead));
        QTest::keyClick(list, Qt::Key_Left);
        QVERIFY(!list->isExpanded(lead));
        QTest::keyClick(list, Qt::Key_Plus);
        QVERIFY(list->isExpanded(lead));
        QTest::keyClick(list, Qt::Key_Down);
        QCOMPARE(page.selected(), row_of(model, "product_band"));
        QTest::keyClick(list, Qt::Key_Down);
        QCOMPARE(page.selected(), row_of(model, "product × branch"));
        QTest::keyClick(list, Qt::Key_Left);  // from a member: back to its lead
        QCOMPARE(page.selected(), row_of(model, "product"));
        QTest::keyClick(list, Qt::Key_Minus);
        QVERIFY(!list->isExpanded(lead));
        QTest::keyClick(list, Qt::Key_Down);  // folded: the next family
        QCOMPARE(page.selected(), row_of(model, "channel"));
    }

    // The lead's decision goes to every finding beneath it in one undo step; each keeps its own
    // note and records the lead it came from; undo puts every one back.
    void apply_to_family_is_one_undo_step() {
        FindingsModel model;
        FindingsPage page(&model);
        add_family(model);
        const int product = row_of(model, "product"), branch = row_of(model, "product × branch"),
                  term = row_of(model, "product × term"), band = row_of(model, "product_band");
        model.set_decision(term, Decision::Undecided, "asked the branch managers");
        QVERIFY(page.select(product));
        QAction* apply = page.apply_family_action();
        auto* button = page.findChild<QPushButton*>("apply_family");
        QVERIFY(!apply->isEnabled());  // nothing decided yet
        QVERIFY(!button->isHidden());  // shown on a lead with a family
        QCOMPARE(button->text(), QString("Apply to family (3)"));
        page.decide(Decision::Upheld);
        QVERIFY(apply->isEnabled() && button->isEnabled());
        QCOMPARE(page.undo_stack()->count(), 1);
        apply->trigger();
        QCOMPARE(page.undo_stack()->count(), 2);
        for (int r : {band, branch, term}) {
            QCOMPARE(model.at(r)->decision, Decision::Upheld);
            QCOMPARE(model.at(r)->applied_from, QString("product"));
        }
        QCOMPARE(model.at(term)->note, QString("asked the branch managers"));  // its own note stays
        QVERIFY(model.at(branch)->note.isEmpty());                           // an empty one stays empty
        QVERIFY(model.at(product)->applied_from.isEmpty());
        QCOMPARE(model.data(model.index(branch, FindingsModel::Decided)).toString(), QString("Upheld (from lead)"));
        QVERIFY(model.data(model.index(branch, FindingsModel::Decided), Qt::ToolTipRole).toString().contains("product"));
        // A note typed after the step survives undoing it.
        model.set_decision(branch, Decision::Upheld, "typed later");
        page.undo_stack()->undo();
        for (int r : {band, branch, term}) {
            QCOMPARE(model.at(r)->decision, Decision::Undecided);
            QVERIFY(model.at(r)->applied_from.isEmpty());
        }
        QCOMPARE(model.at(branch)->note, QString("typed later"));
        QCOMPARE(model.at(product)->decision, Decision::Upheld);  // the lead's own step is separate
        page.undo_stack()->redo();
        QCOMPARE(model.at(branch)->decision, Decision::Upheld);
        // Deciding a member by hand makes the decision its own again.
        QVERIFY(page.select(branch));
        auto* line = page.findChild<QLabel*>("family_line");
        QVERIFY(line->text().contains("Decision applied from the lead product"));
        QVERIFY(!apply->isEnabled());  // a member leads no one
        page.decide(Decision::FollowUp);
        QVERIFY(model.at(branch)->applied_from.isEmpty());
        page.undo_stack()->undo();
        QCOMPARE(model.at(branch)->decision, Decision::Upheld);
        QCOMPARE(model.at(branch)->applied_from, QString("product"));
        // The context menu of a lead offers the step and the fold; a member's its lead.
        std::unique_ptr<QMenu> lead_menu(page.context_menu_for(product));
        QVERIFY(lead_menu->actions().contains(apply));
        QStringList texts;
        for (QAction* a : lead_menu->actions()) texts << a->text();
        QVERIFY2(texts.join('|').contains("family"), qPrintable(texts.join('|')));
        std::unique_ptr<QMenu> member_menu(page.context_menu_for(branch));
        texts.clear();
        for (QAction* a : member_menu->actions()) texts << a->text();
        QVERIFY2(texts.join('|').contains("Go to the lead, product"), qPrintable(texts.join('|')));
    }

    // A finding beneath the lead decided otherwise is never overwritten without asking: Cancel
    // changes nothing, "keep theirs" fills only the undecided, "replace" overwrites.
    void apply_to_family_asks_before_overwriting() {
        FindingsModel model;
        FindingsPage page(&model);
        add_family(model);
        const int product = row_of(model, "product"), branch = row_of(model, "product × branch"),
                  term = row_of(model, "product × term"), band = row_of(model, "product_band");
        model.set_decision(branch, Decision::SetAside, "the branch effect is real");
        model.set_decision(band, Decision::Upheld, {});  // the same decision: its own, not asked about
        QVERIFY(page.select(product));
        page.decide(Decision::Upheld);
        QStringList asked;
        OverwriteChoice answer = OverwriteChoice::Cancel;
        page.set_overwrite_prompt([&](const QString& lead, const QString& decision, const QStringList& differing) {
            asked = differing;
            asked.prepend(lead + ": " + decision);
            return answer;
        });
        const int steps = page.undo_stack()->count();
        QCOMPARE(page.apply_to_family(), -1);
        QCOMPARE(asked, (QStringList{"product: Upheld", "product × branch: Set aside"}));
        QCOMPARE(page.undo_stack()->count(), steps);
        QCOMPARE(model.at(term)->decision, Decision::Undecided);
        answer = OverwriteChoice::KeepTheirs;
        QCOMPARE(page.apply_to_family(), 1);
        QCOMPARE(model.at(branch)->decision, Decision::SetAside);
        QCOMPARE(model.at(term)->decision, Decision::Upheld);
        QVERIFY(model.at(band)->applied_from.isEmpty());  // decided so on its own
        answer = OverwriteChoice::Overwrite;
        QCOMPARE(page.apply_to_family(), 1);
        QCOMPARE(model.at(branch)->decision, Decision::Upheld);
        QCOMPARE(model.at(branch)->note, QString("the branch effect is real"));
        page.undo_stack()->undo();
        QCOMPARE(model.at(branch)->decision, Decision::SetAside);
        QVERIFY(model.at(branch)->applied_from.isEmpty());

        // Without a replacement the workbench's own box asks, listing the finding decided otherwise.
        FindingsModel model2;
        FindingsPage page2(&model2);
        add_family(model2);
        model2.set_decision(row_of(model2, "product × term"), Decision::FollowUp, {});
        QVERIFY(page2.select(row_of(model2, "product")));
        page2.decide(Decision::SetAside);
        QString shown;
        QTimer::singleShot(0, [&shown] {
            QTRY_VERIFY_WITH_TIMEOUT(qobject_cast<QMessageBox*>(QApplication::activeModalWidget()), 10000);
            auto* box = qobject_cast<QMessageBox*>(QApplication::activeModalWidget());
            shown = box->text() + "\n" + box->informativeText();
            for (QAbstractButton* b : box->buttons())
                if (b->text() == "Keep their decisions") QTest::mouseClick(b, Qt::LeftButton);
        });
        QCOMPARE(page2.apply_to_family(), 2);
        QVERIFY2(shown.contains("product × term: Follow up"), qPrintable(shown));
        QCOMPARE(model2.at(row_of(model2, "product × term"))->decision, Decision::FollowUp);
        QCOMPARE(model2.at(row_of(model2, "product × branch"))->decision, Decision::SetAside);
    }
};

QTEST_MAIN(FindingsPageTest)
#include "findings_page_test.moc"
