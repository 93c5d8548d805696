// tests/ui/diagram_page_test.cpp <-> ui/diagram_page.h, ui/diagram_scene.h, ui/diagram_doc.h,
// ui/diagram_commands.h
#include <QDir>
#include <QFile>
#include <QGraphicsView>
#include <QTemporaryDir>
#include <QMouseEvent>
#include <QUndoStack>
#include <QtTest>

#include <unistd.h>

#include "ui/diagram_page.h"
#include "ui/diagram_scene.h"

using namespace foldline;
using namespace foldline::ui;

class DiagramPageTest : public QObject {
    Q_OBJECT
private slots:
    void seed_draws_exposure_outcome_and_strata() {
        DiagramPage page;
        page.seed("group", "approved", {"product"}, {"group", "approved", "product", "branch"});
        QCOMPARE(int(page.doc()->nodes().size()), 3);
        QVERIFY(page.doc()->has_edge("group", "approved"));
        QVERIFY(page.doc()->has_edge("product", "group"));
        QVERIFY(page.doc()->has_edge("product", "approved"));
        QCOMPARE(page.scene()->edge_items().size(), 3);
        QCOMPARE(page.undo_stack()->count(), 0);
    }

    void cycle_is_refused_with_a_message() {
        DiagramPage page;
        page.seed("X", "Y", {"S"}, {});
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
        QCOMPARE(page.undo_stack()->count(), 0);
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
