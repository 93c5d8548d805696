// tests/ui/diagram_page_test.cpp <-> ui/diagram_page.h, ui/diagram_scene.h, ui/diagram_doc.h,
// ui/diagram_commands.h
#include <QDir>
#include <QFile>
#include <QGraphicsView>
#include <QLabel>
#include <QMenu>
#include <QPushButton>
#include <QTemporaryDir>
#include <QMouseEvent>
#include <QUndoStack>
#include <QtTest>

#include <unistd.h>

#include "ui/diagram_page.h"
#include "ui/diagram_scene.h"
#include "ui/role_style.h"

using namespace foldline;
using namespace foldline::ui;

class DiagramPageTest : public QObject {
    Q_OBJECT
private slots:
    // No invented causal claims: a fresh diagram holds the exposure, the outcome and the
    // finding's column with the one arrow exposure → outcome, and gives no verdict.
    void seed_claims_nothing_but_exposure_to_outcome() {
        DiagramPage page;
        page.seed("group", "approved", {"product"}, {"group", "approved", "product", "branch"});
        QCOMPARE(int(page.doc()->nodes().size()), 3);
        QVERIFY(page.doc()->node("product"));
        QCOMPARE(int(page.doc()->edges().size()), 1);
        QVERIFY(page.doc()->has_edge("group", "approved"));
        QVERIFY(!page.doc()->has_edge("product", "group"));
        QVERIFY(!page.doc()->has_edge("product", "approved"));
        QCOMPARE(page.scene()->edge_items().size(), 1);
        QCOMPARE(page.undo_stack()->count(), 0);
        QVERIFY(!page.doc()->confirmed());
        QVERIFY(!page.verdict().computed);
        QVERIFY(page.verdict().unconfirmed);
        QVERIFY(!page.verdict().answer.has_value());
        QVERIFY(page.verdict().roles.isEmpty());
        QVERIFY2(page.verdict_text().contains("No verdict yet"), qPrintable(page.verdict_text()));
        QVERIFY(!page.verdict_text().contains("Quote"));
        QVERIFY2(page.banner().contains("No verdict yet"), qPrintable(page.banner()));
        // No node is drawn with a role it was never given.
        QVERIFY(!page.scene()->node_item("product")->role().has_value());
    }

    // The verdict appears once the reviewer confirms the diagram as drawn, or draws an arrow;
    // undoing either takes it away again.
    void no_verdict_until_arrows_are_drawn_or_confirmed() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {"X", "Y", "S"});
        page.confirm_as_drawn();
        QVERIFY(page.doc()->confirmed());
        QVERIFY(page.verdict().computed);
        QVERIFY(page.banner().isEmpty());
        // S with no arrow is unrelated: both views estimate the same effect (back-door criterion,
        // Pearl 2009, Causality, sec. 3.3.1: the empty set and {S} are both valid).
        QVERIFY(page.verdict().answer == causal::Answer::Both);
        QVERIFY(page.verdict_text().contains("Quote"));
        page.undo_stack()->undo();
        QVERIFY(!page.doc()->confirmed());
        QVERIFY(!page.verdict().computed);
        QVERIFY(!page.verdict_text().contains("Quote"));
        // Drawing an arrow is a claim of the reviewer's: the verdict follows it.
        QVERIFY(page.request_edge("S", "X"));
        QVERIFY(page.doc()->confirmed());
        QVERIFY(page.verdict().computed);
        page.undo_stack()->undo();
        QVERIFY(!page.doc()->has_edge("S", "X"));
        QVERIFY(!page.doc()->confirmed());
        QVERIFY(!page.verdict().computed);
    }

    // A draft is visibly a draft (dashed, not selectable, not in the diagram), says what it
    // assumes, gives no verdict, and takes one undoable click to accept or discard.
    void draft_is_a_draft_until_accepted() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {"X", "Y", "S"});
        QVERIFY(page.offer_draft());
        QCOMPARE(int(page.doc()->draft().size()), 2);
        QCOMPARE(int(page.doc()->edges().size()), 1);  // the diagram itself is unchanged
        int dashed = 0;
        for (EdgeItem* e : page.scene()->edge_items())
            if (e->draft()) {
                ++dashed;
                QVERIFY(!(e->flags() & QGraphicsItem::ItemIsSelectable));
            }
        QCOMPARE(dashed, 2);
        QVERIFY2(page.banner().contains("assume") && page.banner().contains("S → X") && page.banner().contains("S → Y"),
                 qPrintable(page.banner()));
        QVERIFY(page.findChild<QPushButton*>("diagram_accept_draft")->isVisibleTo(&page));
        QVERIFY(!page.verdict().computed);
        QVERIFY(!page.verdict_text().contains("Quote"));
        // Discard, and undo the discard.
        page.findChild<QPushButton*>("diagram_discard_draft")->click();
        QVERIFY(page.doc()->draft().empty());
        QCOMPARE(page.scene()->edge_items().size(), 1);
        page.undo_stack()->undo();
        QCOMPARE(int(page.doc()->draft().size()), 2);
        // Accept: one click makes both arrows the reviewer's, and the verdict is read.
        const int steps = page.undo_stack()->index();
        page.findChild<QPushButton*>("diagram_accept_draft")->click();
        QCOMPARE(page.undo_stack()->index(), steps + 1);
        QVERIFY(page.doc()->draft().empty());
        QVERIFY(page.doc()->has_edge("S", "X") && page.doc()->has_edge("S", "Y"));
        QVERIFY(page.doc()->confirmed());
        QVERIFY(page.banner().isEmpty());
        // S causes both: a confounder, so the stratified view answers (back-door criterion,
        // Pearl 2009, sec. 3.3.1).
        QVERIFY(page.verdict().answer == causal::Answer::Stratified);
        QVERIFY(page.verdict().roles.value("S") == causal::Role::Confounder);
        page.undo_stack()->undo();
        QCOMPARE(int(page.doc()->draft().size()), 2);
        QVERIFY(!page.doc()->has_edge("S", "X"));
        QVERIFY(!page.doc()->confirmed());
        QVERIFY(!page.verdict().computed);
        page.undo_stack()->redo();
        QVERIFY(page.doc()->has_edge("S", "X") && page.doc()->confirmed());
    }

    // A finding whose columns are missing from the diagram: the page names them, in core's
    // words (core/causal/missing_columns), and names the finding the verdict is read for.
    void missing_columns_are_named() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {"X", "Y", "S", "T"});
        page.confirm_as_drawn();
        page.set_finding("Reversal: T × U (a vs b)");
        QCOMPARE(page.finding(), QStringLiteral("Reversal: T × U (a vs b)"));
        QVERIFY(page.findChild<QLabel*>("diagram_finding")->text().contains("Reversal: T × U (a vs b)"));
        page.doc()->set_strata({"T", "U"});
        QVERIFY(!page.verdict().computed);
        QVERIFY(!page.verdict().unconfirmed);
        const QString text = page.verdict_text();
        QVERIFY2(text.contains("The diagram lacks the finding's columns &quot;T&quot; and &quot;U&quot;"), qPrintable(text));
        QVERIFY(!text.contains("no causal diagram", Qt::CaseInsensitive));
        QVERIFY(page.add_observed("T"));
        QVERIFY(page.verdict().problem.contains("\"U\"") && !page.verdict().problem.contains("\"T\""));
    }

    // Arrows can be reversed (from the arrow's menu or R), undoably; a reversal that would close
    // a cycle is refused with the reason.
    void arrows_reverse_through_the_menu_and_the_keyboard() {
        DiagramPage page;
        page.resize(1000, 700);
        page.show();
        QVERIFY(QTest::qWaitForWindowExposed(&page));
        page.seed("X", "Y", {"S"}, {"X", "Y", "S"});
        QVERIFY(page.request_edge("X", "S"));
        QVERIFY(page.request_edge("S", "Y"));
        // X → Y cannot turn round: Y → X would close X → S → Y → X.
        QVERIFY(!page.reverse_edge("X", "Y"));
        QVERIFY2(page.message().contains("cycle"), qPrintable(page.message()));
        QVERIFY(page.verdict().roles.value("S") == causal::Role::Mediator);
        // From the arrow's menu.
        page.show_edge_menu("X", "S", QPoint(0, 0));
        QMenu* menu = page.findChild<QMenu*>("edge_menu");
        QVERIFY(menu);
        QAction* rev = menu->findChild<QAction*>("edge_reverse");
        QVERIFY(rev && rev->isEnabled());
        rev->trigger();
        menu->close();
        QVERIFY(page.doc()->has_edge("S", "X") && !page.doc()->has_edge("X", "S"));
        QVERIFY(page.verdict().roles.value("S") == causal::Role::Confounder);
        page.undo_stack()->undo();
        QVERIFY(page.doc()->has_edge("X", "S") && !page.doc()->has_edge("S", "X"));
        // With the keyboard: select the arrow with N, turn it round with R.
        page.activateWindow();
        QVERIFY(QTest::qWaitForWindowActive(&page));
        page.view()->setFocus();
        QApplication::processEvents();
        int guard = 0;
        auto selected_edge = [&]() -> EdgeItem* {
            for (QGraphicsItem* i : page.scene()->selectedItems())
                if (i->type() == EdgeItem::Type) return static_cast<EdgeItem*>(i);
            return nullptr;
        };
        while (guard++ < 10) {
            QTest::keyClick(page.view(), Qt::Key_N);
            if (EdgeItem* e = selected_edge(); e && e->from() == "X" && e->to() == "S") break;
        }
        QVERIFY(selected_edge());
        QTest::keyClick(page.view(), Qt::Key_R);
        QVERIFY(page.doc()->has_edge("S", "X"));
        page.undo_stack()->undo();
        QVERIFY(page.doc()->has_edge("X", "S"));
    }

    // Nodes have a menu: arrows to and from, measured or not, rename (declared variables only),
    // delete; the keyboard moves the selected node. Every change is undoable.
    void node_menu_and_keyboard_edits_are_undoable() {
        DiagramPage page;
        page.resize(1000, 700);
        page.show();
        QVERIFY(QTest::qWaitForWindowExposed(&page));
        page.seed("X", "Y", {"S"}, {"X", "Y", "S"});
        QVERIFY(page.add_unobserved("U"));
        page.show_node_menu("U", QPoint(0, 0));
        QMenu* menu = page.findChild<QMenu*>("node_menu");
        QVERIFY(menu);
        QMenu* to = menu->findChild<QMenu*>("node_arrow_to");
        QVERIFY(to);
        QAction* to_y = nullptr;
        for (QAction* a : to->actions())
            if (a->text() == "Y") to_y = a;
        QVERIFY(to_y && to_y->isEnabled());
        to_y->trigger();
        QVERIFY(page.doc()->has_edge("U", "Y"));
        QAction* rename = menu->findChild<QAction*>("node_rename");
        QVERIFY(rename && rename->isEnabled());
        menu->close();
        QVERIFY(page.rename_node("U", "ability"));
        QVERIFY(page.doc()->has_edge("ability", "Y") && !page.doc()->node("U"));
        page.undo_stack()->undo();
        QVERIFY(page.doc()->has_edge("U", "Y"));
        // Data columns and the question keep their names.
        QVERIFY(!page.rename_node("S", "other"));
        QVERIFY(!page.rename_node("X", "other"));
        // Measured or not: S can be marked not measured and back; U (no such column) cannot be measured.
        QVERIFY(page.set_node_observed("S", false));
        QVERIFY(!page.doc()->node("S")->observed);
        page.undo_stack()->undo();
        QVERIFY(page.doc()->node("S")->observed);
        QVERIFY(!page.set_node_observed("U", true));
        QVERIFY(!page.set_node_observed("X", false));
        // The exposure's menu offers no delete.
        page.show_node_menu("X", QPoint(0, 0));
        QMenu* xm = nullptr;
        for (QMenu* m : page.findChildren<QMenu*>("node_menu"))
            if (m->isVisible()) xm = m;
        QVERIFY(xm);
        QVERIFY(!xm->findChild<QAction*>("node_delete")->isEnabled());
        xm->close();
        // Arrow keys move the selected node, one undoable step.
        page.scene()->clearSelection();
        page.scene()->node_item("S")->setSelected(true);
        const QPointF before = page.doc()->node("S")->pos;
        page.activateWindow();
        QVERIFY(QTest::qWaitForWindowActive(&page));
        page.view()->setFocus();
        QTest::keyClick(page.view(), Qt::Key_Right);
        QCOMPARE(page.doc()->node("S")->pos, before + QPointF(10, 0));
        page.undo_stack()->undo();
        QCOMPARE(page.doc()->node("S")->pos, before);
    }

    // The shapes key lists every role a node can take, plus no role, unobserved and draft.
    void shapes_key_lists_every_role() {
        DiagramPage page;
        QWidget* key = page.findChild<QWidget*>("role_legend");
        QVERIFY(key);
        for (const causal::Role r : all_roles()) {
            QVERIFY(!role_words(r).isEmpty());
        }
        // The words the reviewer reads, including the quiet roles.
        for (const char* w : {"unrelated", "side effect of exposure", "cause of outcome only", "cause of exposure only",
                              "after a mediator", "after a collider", "after the outcome"}) {
            bool found = false;
            for (const causal::Role r : all_roles()) found = found || role_words(r) == QLatin1String(w);
            QVERIFY2(found, w);
        }
        QVERIFY(key->minimumHeight() >= int(all_roles().size() + 3) * 20);
    }

    // Node labels never run out of their box: the box grows with the name up to a limit, then the
    // name is elided (the tooltip keeps it whole).
    void labels_fit_their_boxes() {
        DiagramPage page;
        const QString longer = QStringLiteral("household_income_band");
        const QString longest = QString(200, QLatin1Char('w'));
        page.seed("X", "Y", {longer}, {});
        QVERIFY(page.add_unobserved(longest));
        page.confirm_as_drawn();
        for (NodeItem* n : page.scene()->node_items()) {
            const QFontMetricsF bold = [&] {
                QFont f = QApplication::font();
                f.setBold(true);
                f.setItalic(!n->observed());
                return QFontMetricsF(f);
            }();
            QVERIFY2(bold.horizontalAdvance(n->shown_name()) <= n->box().width() - 20, qPrintable(n->name()));
            QVERIFY(n->box().width() <= NodeItem::kMaxWidth);
        }
        // A name wider than the smallest box but narrower than the largest grows its box.
        QFont bold = QApplication::font();
        bold.setBold(true);
        const double w = QFontMetricsF(bold).horizontalAdvance(longer);
        if (w + 40 <= NodeItem::kMaxWidth) {
            QCOMPARE(page.scene()->node_item(longer)->shown_name(), longer);
            QVERIFY(page.scene()->node_item(longer)->box().width() >= w + 32);
        }
        QVERIFY(page.scene()->node_item(longest)->shown_name() != longest);
        QVERIFY(page.scene()->node_item(longest)->toolTip().contains(longest));
    }

    void cycle_is_refused_with_a_message() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {});
        QVERIFY(page.request_edge("S", "X"));
        QVERIFY(page.request_edge("S", "Y"));
        // S → Y exists (and S → X → Y), so Y → S would close a loop back to S.
        QVERIFY(!page.request_edge("Y", "S"));
        QVERIFY2(page.message().contains("cycle"), qPrintable(page.message()));
        QVERIFY(page.message().contains("\"S\"") && page.message().contains("\"Y\""));
        QVERIFY(!page.doc()->has_edge("Y", "S"));
        QVERIFY(!page.request_edge("X", "X"));
        QVERIFY2(page.message().contains("itself"), qPrintable(page.message()));
        QVERIFY(!page.request_edge("X", "Y"));
        QVERIFY2(page.message().contains("already exists"), qPrintable(page.message()));
        // Node names follow the same rules (core/causal/diagram_edit): blank or used is refused.
        QVERIFY(!page.add_unobserved("   "));
        QVERIFY2(page.message().contains("needs a name"), qPrintable(page.message()));
        QVERIFY(!page.add_unobserved("S"));
        QVERIFY2(page.message().contains("already exists"), qPrintable(page.message()));
        QCOMPARE(page.undo_stack()->count(), 2);  // the two arrows drawn above
    }

    void every_edit_undoes_and_redoes() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {"X", "Y", "S", "M"});
        QVERIFY(page.add_observed("M"));
        QVERIFY(page.request_edge("X", "M"));
        QVERIFY(page.request_edge("M", "Y"));
        QVERIFY(page.add_unobserved("U"));
        QCOMPARE(page.doc()->node("U")->observed, false);
        QCOMPARE(page.undo_stack()->count(), 4);
        // Delete M with its two arrows as one step; undo restores both arrows.
        page.scene()->node_item("M")->setSelected(true);
        page.delete_selected();
        QVERIFY(!page.doc()->node("M"));
        QVERIFY(!page.doc()->has_edge("X", "M"));
        page.undo_stack()->undo();
        QVERIFY(page.doc()->node("M"));
        QVERIFY(page.doc()->has_edge("X", "M") && page.doc()->has_edge("M", "Y"));
        page.undo_stack()->undo();  // U
        QVERIFY(!page.doc()->node("U"));
        page.undo_stack()->redo();
        QVERIFY(page.doc()->node("U"));
        // Exposure and outcome cannot be deleted.
        page.scene()->clearSelection();
        page.scene()->node_item("X")->setSelected(true);
        page.delete_selected();
        QVERIFY(page.doc()->node("X"));
        // Tidy moves nodes as one undoable step.
        page.doc()->move_node("S", {900, 900});
        const int before = page.undo_stack()->index();
        page.auto_layout();
        QCOMPARE(page.undo_stack()->index(), before + 1);
        QVERIFY(page.doc()->node("S")->pos != QPointF(900, 900));
        page.undo_stack()->undo();
        QCOMPARE(page.doc()->node("S")->pos, QPointF(900, 900));
    }

    void dragging_from_the_handle_draws_an_arrow() {
        DiagramPage page;
        page.resize(1000, 700);
        page.show();
        QVERIFY(QTest::qWaitForWindowExposed(&page));
        page.seed("X", "Y", {}, {"X", "Y", "Z"});
        QVERIFY(page.add_observed("Z"));
        QGraphicsView* v = page.view();
        NodeItem* z = page.scene()->node_item("Z");
        NodeItem* y = page.scene()->node_item("Y");
        v->ensureVisible(page.scene()->itemsBoundingRect());
        QApplication::processEvents();
        const QPoint from = v->mapFromScene(z->mapToScene(z->port_rect().center()));
        const QPoint to = v->mapFromScene(y->scenePos());
        QTest::mousePress(v->viewport(), Qt::LeftButton, {}, from);
        QMouseEvent move(QEvent::MouseMove, QPointF(to), v->viewport()->mapToGlobal(QPointF(to)), Qt::NoButton,
                         Qt::LeftButton, Qt::NoModifier);
        QApplication::sendEvent(v->viewport(), &move);
        QTest::mouseRelease(v->viewport(), Qt::LeftButton, {}, to);
        QVERIFY(page.doc()->has_edge("Z", "Y"));
        page.undo_stack()->undo();
        QVERIFY(!page.doc()->has_edge("Z", "Y"));
    }

    void dot_export_into_a_read_only_folder_keeps_the_previous_file() {
        // Mode 0555 (POSIX chmod(2)); root ignores mode bits, so as root the export runs with
        // effective user and group 65534.
        QTemporaryDir dir;
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {});
        const QString path = dir.filePath("audit.dot");
        QVERIFY(page.export_dot(path).ok());
        QFile f(path);
        QVERIFY(f.open(QIODevice::ReadOnly));
        const QByteArray before = f.readAll();
        f.close();
        QVERIFY(page.add_unobserved("U"));
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::ExeOwner | QFile::ReadOther | QFile::ExeOther);
        const bool root = ::geteuid() == 0;
        if (root && (::setegid(65534) != 0 || ::seteuid(65534) != 0)) {
            (void)!::setegid(0);
            QSKIP("cannot drop root privileges here, so a read-only folder cannot be made");
        }
        const auto st = page.export_dot(path);
        if (root) {
            QVERIFY(::seteuid(0) == 0);
            QVERIFY(::setegid(0) == 0);
        }
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::WriteOwner | QFile::ExeOwner);
        QVERIFY(!st.ok());
        QVERIFY2(QString::fromStdString(st.error().to_string()).contains("Permission denied"),
                 st.error().to_string().c_str());
        QVERIFY(f.open(QIODevice::ReadOnly));
        QCOMPARE(f.readAll(), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 1);
    }

    void saves_opens_and_exports() {
        QTemporaryDir dir;
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {});
        QVERIFY(page.add_unobserved("U \"hidden\""));
        QVERIFY(page.request_edge("U \"hidden\"", "Y"));
        const QString path = dir.filePath("audit.diagram.json");
        QVERIFY(page.save_file(path).ok());
        QVERIFY(page.export_dot(dir.filePath("audit.dot")).ok());
        QFile dot(dir.filePath("audit.dot"));
        QVERIFY(dot.open(QIODevice::ReadOnly));
        const QByteArray text = dot.readAll();
        QVERIFY(text.startsWith("digraph"));
        QVERIFY(text.contains("\"U \\\"hidden\\\"\""));  // DOT escapes the inner quotes

        DiagramPage other;
        other.seed("X", "Y", {"S"}, {});
        QVERIFY(other.open_file(path).ok());
        QCOMPARE(int(other.doc()->nodes().size()), 4);
        QVERIFY(other.doc()->has_edge("U \"hidden\"", "Y"));
        QCOMPARE(other.doc()->node("U \"hidden\"")->observed, false);
        QCOMPARE(other.undo_stack()->count(), 0);
        // A broken file is an error naming the file, and the diagram is left as it was.
        QFile bad(dir.filePath("bad.diagram.json"));
        QVERIFY(bad.open(QIODevice::WriteOnly));
        bad.write("{\"nodes\": [ {\"name\": 3} ]}");
        bad.close();
        const Status st = other.open_file(bad.fileName());
        QVERIFY(!st.ok());
        QVERIFY(QString::fromStdString(st.error().to_string()).contains("bad.diagram.json"));
        QCOMPARE(int(other.doc()->nodes().size()), 4);
        // A file that marks the question's exposure unobserved is refused the same way: the
        // exposure is a column of the data (core/causal/diagram_edit's set_question).
        QFile hidden(dir.filePath("hidden.diagram.json"));
        QVERIFY(hidden.open(QIODevice::WriteOnly));
        hidden.write(R"({"nodes": [{"name": "X", "observed": false}, {"name": "Y"}], "edges": []})");
        hidden.close();
        const Status refused = other.open_file(hidden.fileName());
        QVERIFY(!refused.ok());
        const QString why = QString::fromStdString(refused.error().to_string());
        QVERIFY2(why.contains("hidden.diagram.json") && why.contains("unobserved"), qPrintable(why));
        QCOMPARE(int(other.doc()->nodes().size()), 4);
        QVERIFY(other.doc()->node("X")->observed);
    }
};

QTEST_MAIN(DiagramPageTest)
#include "diagram_page_test.moc"
