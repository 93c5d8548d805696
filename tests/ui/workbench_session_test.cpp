// tests/ui/workbench_session_test.cpp <-> ui/main_window.h: a reviewer's whole session driven
// through the real main window with QTest key and mouse events where a reviewer would use them.
// On the clinic sample (sample_data/clinic_outcomes.csv): open the file, move on from the
// Source step, scan, draw a diagram, switch findings from the keyboard, decide two findings
// with notes, close with unsaved changes (the Save / Discard / Cancel box is found and answered
// Save), open the saved audit in a new window and find the diagram, decisions and notes back.
#include "core/audit/project_file.h"  // core before Qt (see DEVELOPERS.md)

#include <QAbstractButton>
#include <QApplication>
#include <QMessageBox>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QSettings>
#include <QSpinBox>
#include <QScrollBar>
#include <QTableView>
#include <QTreeView>
#include <QToolButton>
#include <QTimer>
#include <QUndoStack>
#include <QtTest>
#include <set>
#include <vector>

#include "ui/demo.h"
#include "ui/diagram_doc.h"
#include "ui/diagram_page.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"
#include "ui/main_window.h"
#include "ui/question_page.h"
#include "ui/source_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

struct Kept {
    QStringList strata;
    Decision decision;
    QString note;
};

const FindingView* find_by_strata(const FindingsModel* m, const QStringList& strata) {
    for (const FindingView& f : m->findings())
        if (f.strata == strata) return &f;
    return nullptr;
}

}  // namespace

class WorkbenchSessionTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName("FoldlineSessionTest");
        QCoreApplication::setApplicationName("FoldlineSessionTest");
        QSettings().clear();
    }

    void a_reviewers_session_survives_closing_and_reopening() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        const QString data = find_sample("clinic_outcomes.csv");
        if (data.isEmpty()) QSKIP("sample_data/clinic_outcomes.csv not found");
        QTemporaryDir dir;
        const QString audit = dir.filePath("clinic-review.foldline");

        std::set<std::pair<QString, QString>> edges;
        std::vector<Kept> kept;
        bool prompt_seen = false;
        {
            MainWindow w;
            w.resize(1440, 900);
            w.show();
            QVERIFY(QTest::qWaitForWindowExposed(&w));

            // 1. Source: the file loads and stays in view until the reviewer moves on.
            w.source_page()->open_path(data);
            QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading() && w.source_page()->table(), 30000);
            QCOMPARE(w.step(), int(MainWindow::Source));
            QTest::mouseClick(w.source_page()->findChild<QPushButton*>("source_next"), Qt::LeftButton);
            QCOMPARE(w.step(), int(MainWindow::Question));

            // 2. Question: the clinic's question (sample_data/README.md), no resampling.
            QuestionSpec q = w.question_page()->spec();
            q.outcome = "recovered";
            q.positive = "yes";
            q.exposure = "treatment";
            q.focal = "new_protocol";
            q.reference = "standard";
            q.candidates = {"severity", "site", "age_band", "sex"};
            q.pairs = false;
            q.bootstrap = 0;
            w.question_page()->set_spec(q);
            QVERIFY2(w.question_page()->problems().isEmpty(), qPrintable(w.question_page()->problems().join("; ")));
            QTest::mouseClick(w.question_page()->findChild<QPushButton*>("start_scan"), Qt::LeftButton);
            QTRY_VERIFY_WITH_TIMEOUT(w.step() == int(MainWindow::Findings), 120000);
            QVERIFY(w.findings_model()->size() >= 2);
            {
                // At 1440 x 900 the list shows class, strata, gaps, q-value and decision without
                // scrolling sideways, and rate gaps in percentage points as the memo writes them.
                QTreeView* list = w.findings_page()->list();
                QApplication::processEvents();
                QVERIFY(!list->horizontalScrollBar()->isVisible());
                for (int c = 0; c < list->model()->columnCount(); ++c)
                    QVERIFY2(list->columnViewportPosition(c) + list->columnWidth(c) <= list->viewport()->width(),
                             qPrintable(list->model()->headerData(c, Qt::Horizontal).toString()));
                QVERIFY(list->model()->index(0, FindingsModel::Crude).data().toString().endsWith(" pp"));
                // The class filters say whether they are on and how many findings they hold.
                auto* chip = w.findings_page()->findChild<QToolButton*>("show_stable");
                QVERIFY(chip && chip->text().startsWith(QStringLiteral("☑")) && chip->text().contains('('));
            }

            // 3. Diagram: the reviewer draws arrows of their own.
            w.go_to(MainWindow::Diagram);
            DiagramPage* d = w.diagram_page();
            for (const char* c : {"severity", "age_band"})
                if (!d->doc()->node(c)) QVERIFY(d->add_observed(c));
            for (const auto& [from, to] : {std::pair{"severity", "treatment"}, std::pair{"severity", "recovered"},
                                           std::pair{"age_band", "severity"}, std::pair{"treatment", "recovered"}})
                if (!d->doc()->has_edge(from, to)) QVERIFY2(d->request_edge(from, to), from);
            for (const DiagramEdge& e : d->doc()->edges()) edges.insert({e.from, e.to});
            QVERIFY(edges.count({"age_band", "severity"}));

            // 4. Findings: switch with the keyboard, decide two findings, each with a note.
            w.go_to(MainWindow::Findings);
            FindingsPage* fp = w.findings_page();
            QTreeView* list = fp->list();
            list->setFocus();
            const Decision choices[2] = {Decision::Upheld, Decision::FollowUp};
            for (int k = 0; k < 2; ++k) {
                if (k > 0) {
                    const int before = fp->selected();
                    QTest::keyClick(list, Qt::Key_Down);
                    QTRY_VERIFY(fp->selected() != before);
                }
                // Tab leaves the list for the decision buttons.
                list->setFocus();
                QTest::keyClick(list, Qt::Key_Tab);
                QWidget* focus = QApplication::focusWidget();
                QVERIFY2(focus && focus->objectName().startsWith("decide_"),
                         qPrintable(focus ? focus->objectName() : QStringLiteral("(none)")));
                auto* button = fp->findChild<QPushButton*>(QStringLiteral("decide_%1").arg(int(choices[k])));
                QTest::mouseClick(button, Qt::LeftButton);
                auto* note = fp->findChild<QPlainTextEdit*>("finding_note");
                note->setFocus();
                note->selectAll();
                const QString text = QStringLiteral("reviewed in the session test, finding %1").arg(k + 1);
                QTest::keyClicks(note, text);
                const FindingView* f = w.findings_model()->at(fp->selected());
                QCOMPARE(f->decision, choices[k]);
                QCOMPARE(f->note, text);
                kept.push_back({f->strata, f->decision, f->note});
            }
            QVERIFY(kept[0].strata != kept[1].strata);

            // 5. Save once, change the note again, then close: the box asks, and Save writes
            // the audit where it was saved.
            QVERIFY2(w.save_project_to(audit).ok(), "first save");
            QVERIFY(!w.unsaved());
            auto* note = fp->findChild<QPlainTextEdit*>("finding_note");
            note->setFocus();
            QTest::keyClicks(note, " (final)");
            kept[1].note += " (final)";
            QVERIFY(w.unsaved());
            QTimer::singleShot(0, [&prompt_seen] {
                // The modal box runs its own loop: find it and answer Save.
                QTRY_VERIFY_WITH_TIMEOUT(qobject_cast<QMessageBox*>(QApplication::activeModalWidget()), 10000);
                auto* box = qobject_cast<QMessageBox*>(QApplication::activeModalWidget());
                prompt_seen = box->text().contains("not saved");
                QTest::mouseClick(box->button(QMessageBox::Save), Qt::LeftButton);
            });
            QVERIFY(w.close());
        }
        QVERIFY(prompt_seen);

        // 6. Reopen: the diagram, decisions and notes are back.
        MainWindow w2;
        w2.resize(1440, 900);
        w2.show();
        QVERIFY(QTest::qWaitForWindowExposed(&w2));
        w2.open_file(audit);
        QTRY_VERIFY_WITH_TIMEOUT(w2.step() == int(MainWindow::Findings) && !w2.unsaved() &&
                                     w2.findings_model()->size() > 0,
                                 120000);
        for (const Kept& k : kept) {
            const FindingView* f = find_by_strata(w2.findings_model(), k.strata);
            QVERIFY2(f, qPrintable(k.strata.join(" x ")));
            QCOMPARE(f->decision, k.decision);
            QCOMPARE(f->note, k.note);
        }
        QTRY_VERIFY_WITH_TIMEOUT(w2.diagram_page()->doc()->edges().size() == edges.size(), 10000);
        for (const DiagramEdge& e : w2.diagram_page()->doc()->edges()) QVERIFY(edges.count({e.from, e.to}));
    }
};

QTEST_MAIN(WorkbenchSessionTest)
#include "workbench_session_test.moc"
