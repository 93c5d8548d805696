// tests/ui/main_window_test.cpp <-> ui/main_window.h (and the path through every step)
#include "core/audit/project_file.h"  // core before Qt (see DEVELOPERS.md)
#include "core/common/sha256.h"

#include <QComboBox>
#include <QAction>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QMenu>
#include <QPushButton>
#include <QRadioButton>
#include <QSpinBox>
#include <QTableView>
#include <QTimer>
#include <QProcess>
#include <QStandardPaths>
#include <QSettings>
#include <QSplitter>
#include <QTabWidget>
#include <QTableWidget>
#include <QUndoStack>
#include <QtTest>
#include <qcustomplot.h>

#include "ui/caution_band.h"
#include "ui/counts_grid.h"
#include "ui/database_form.h"
#include "ui/demo.h"
#include "ui/diagram_commands.h"
#include "ui/diagram_page.h"
#include "ui/family_tree_model.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"
#include "ui/main_window.h"
#include "ui/memo_page.h"
#include "ui/question_page.h"
#include "ui/scan_page.h"
#include "ui/source_page.h"
#include "ui/step_bar.h"

using namespace foldline;
using namespace foldline::ui;

class MainWindowTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName("FoldlineTest");
        QCoreApplication::setApplicationName("FoldlineTest");
        QSettings().clear();
    }

    void every_action_has_a_menu_and_the_main_ones_a_shortcut() {
        MainWindow w;
        for (const char* name : {"action_open", "action_type_counts", "action_scan", "action_stop", "action_undo",
                                 "action_redo", "action_copy_table", "action_save_chart", "action_upheld",
                                 "action_set_aside", "action_follow_up", "action_tidy", "action_draw_arrows",
                                 "action_step_0", "action_step_5", "action_find"}) {
            QAction* a = w.action(name);
            QVERIFY2(a, name);
            QVERIFY2(!a->shortcut().isEmpty(), name);
            QVERIFY2(!a->associatedObjects().isEmpty(), name);
        }
    }

    // Every key reaches one action: no two actions of the window (menus, and the canvas's own
    // keys) share a shortcut.
    void no_two_actions_share_a_key() {
        MainWindow w;
        QHash<QString, QString> owner;
        int keys = 0;
        for (QAction* a : w.findChildren<QAction*>()) {
            for (const QKeySequence& k : a->shortcuts()) {
                if (k.isEmpty()) continue;
                const QString key = k.toString(QKeySequence::PortableText);
                const QString name = a->objectName().isEmpty() ? a->text() : a->objectName();
                QVERIFY2(!owner.contains(key), qPrintable(QStringLiteral("%1 is both %2 and %3").arg(key, owner.value(key), name)));
                owner.insert(key, name);
                ++keys;
            }
        }
        QVERIFY(keys > 20);
        QVERIFY(owner.contains(QStringLiteral("N")) && owner.contains(QStringLiteral("Shift+F10")));  // the canvas's keys
    }

    // A fresh audit claims no causes: the Diagram step starts from exposure, outcome and the
    // finding's columns with the one arrow exposure → outcome, gives no verdict, names the
    // finding, and the audit saves no diagram the reviewer never touched.
    void fresh_diagram_claims_nothing_and_names_the_finding() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        const QString csv = find_sample("lender_approvals.csv");
        if (csv.isEmpty()) QSKIP("sample_data/lender_approvals.csv not found");
        MainWindow w;
        w.source_page()->open_path(csv);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading(), 60000);
        QVERIFY(w.source_page()->table());
        QuestionSpec q = w.question_page()->spec();
        q.outcome = QStringLiteral("approved");
        q.positive = QStringLiteral("1");
        q.exposure = QStringLiteral("applicant_group");
        q.focal = QStringLiteral("B");
        q.reference = QStringLiteral("A");
        w.question_page()->set_spec(q);
        QVERIFY(w.start_scan());
        QTRY_VERIFY_WITH_TIMEOUT(!w.scan_page()->running(), 120000);
        QTRY_VERIFY_WITH_TIMEOUT(w.findings_model()->size() > 0, 10000);
        w.go_to(MainWindow::Findings);
        const int top = w.findings_page()->select_top();
        QVERIFY(top >= 0);
        const FindingView* f = w.findings_model()->at(top);
        w.go_to(MainWindow::Diagram);
        DiagramPage* d = w.diagram_page();
        QCOMPARE(int(d->doc()->edges().size()), 1);
        QVERIFY(d->doc()->has_edge("applicant_group", "approved"));
        for (const QString& s : f->strata) QVERIFY(d->doc()->node(s));
        QCOMPARE(int(d->doc()->nodes().size()), 2 + int(f->strata.size()));
        QVERIFY(!d->verdict().computed);
        QVERIFY(!d->verdict_text().contains("Quote"));
        QVERIFY(!d->banner().isEmpty());
        // The step names the finding its verdict is read for, and follows the selection.
        QVERIFY2(d->finding().contains(f->strata.join(QStringLiteral(" × "))) && d->finding().contains("B vs A"),
                 qPrintable(d->finding()));
        auto p = w.current_project();
        QVERIFY(p.ok());
        QVERIFY(p->diagrams.empty());
        int other = -1;
        for (int i = 0; i < w.findings_model()->size() && other < 0; ++i)
            if (w.findings_model()->at(i)->strata != f->strata) other = i;
        QVERIFY(other >= 0);
        const QStringList other_strata = w.findings_model()->at(other)->strata;
        w.go_to(MainWindow::Findings);
        QVERIFY(w.findings_page()->select(other));
        w.go_to(MainWindow::Diagram);
        QVERIFY2(d->finding().contains(other_strata.join(QStringLiteral(" × "))), qPrintable(d->finding()));
        // Confirmed as drawn, a column of the other finding that the diagram lacks is named.
        d->confirm_as_drawn();
        QStringList absent;
        for (const QString& s : other_strata)
            if (!d->doc()->node(s)) absent << s;
        if (!absent.isEmpty()) {
            QVERIFY(!d->verdict().computed);
            QVERIFY2(d->verdict().problem.contains(QStringLiteral("\"%1\"").arg(absent.first())), qPrintable(d->verdict().problem));
        } else {
            QVERIFY(d->verdict().computed);
        }
        p = w.current_project();
        QVERIFY(p.ok());
        QCOMPARE(int(p->diagrams.size()), 1);
    }

    void steps_open_in_order_and_caution_is_shown_with_findings() {
        MainWindow w;
        QCOMPARE(w.step(), int(MainWindow::Source));
        QCOMPARE(w.step_bar()->state(MainWindow::Findings), StepBar::State::Locked);
        QVERIFY(w.findings_page()->findChild<CautionBand*>());
        QVERIFY(w.diagram_page()->findChild<CautionBand*>());
        QVERIFY(w.findings_page()->findChild<CautionBand*>()->text().contains("not a legal or clinical determination"));
        // Without ODBC the Database tab is plainly off and says why.
        QTabWidget* tabs = w.source_page()->tabs();
        const int db = tabs->indexOf(w.source_page()->database_form());
        QCOMPARE(tabs->isTabEnabled(db), database_available());
        if (!database_available()) QVERIFY(tabs->tabToolTip(db).contains("unixODBC"));
        // Typed-in counts open the Question step.
        CountsGrid* g = w.source_page()->counts_grid();
        g->set_rows({{"a", "5", "10", "3", "10"}, {"b", "2", "10", "6", "10"}});
        g->use_table();
        QCOMPARE(w.step(), int(MainWindow::Question));
        QCOMPARE(w.step_bar()->state(MainWindow::Source), StepBar::State::Done);
        const QuestionSpec q = w.question_page()->spec();
        QCOMPARE(q.outcome, QStringLiteral("positive"));
        QCOMPARE(q.positive, QStringLiteral("positive"));  // the label typed, not "1"
        QCOMPARE(q.exposure, QStringLiteral("group"));
        QCOMPARE(q.candidates, QStringList{"stratum"});
        // An invalid choice is explained inline.
        QuestionSpec bad = q;
        bad.focal = bad.reference;
        w.question_page()->set_spec(bad);
        QVERIFY(w.question_page()->problems().join(' ').contains("must differ"));
        auto* label = w.question_page()->findChild<QLabel*>("question_problems");
        QVERIFY(label->text().contains("must differ"));
    }

    // A typed-in table keeps the reviewer's groups and labels: Focal A / Reference B stays so
    // even when A is as large as B (the default reference is otherwise the largest group), the
    // outcome reads as typed, the scan's gaps are A minus B, and settings chosen for the
    // previous data (10,000 resamples) do not carry over to new data.
    // Counts: Charig et al., BMJ 1986, kidney stones (as in tests/core/table/typed_table_test.cpp).
    void typed_in_table_keeps_the_reviewers_groups() {
        MainWindow w;
        CountsGrid* g = w.source_page()->counts_grid();
        g->findChild<QLineEdit*>("typed_stratum")->setText("stone_size");
        g->findChild<QLineEdit*>("typed_outcome")->setText("success");
        g->findChild<QLineEdit*>("typed_focal")->setText("A");
        g->findChild<QLineEdit*>("typed_reference")->setText("B");
        g->set_rows({{"small", "81", "87", "234", "270"}, {"large", "192", "263", "55", "80"}});
        auto* boot = w.question_page()->findChild<QSpinBox*>("bootstrap");
        QVERIFY(boot);
        boot->setValue(10000);  // chosen before any data: a previous session's habit
        g->use_table();
        QCOMPARE(w.step(), int(MainWindow::Question));
        QuestionSpec q = w.question_page()->spec();
        QCOMPARE(q.focal, QStringLiteral("A"));
        QCOMPARE(q.reference, QStringLiteral("B"));
        QCOMPARE(q.outcome, QStringLiteral("success"));
        QCOMPARE(q.positive, QStringLiteral("success"));
        QCOMPARE(q.bootstrap, 200);  // new data: the scan settings are the defaults again
        QVERIFY(w.question_page()->problems().isEmpty());
        if (scan_available()) {
            boot->setValue(0);  // no resampling needed for the groups' order
            w.question_page()->findChild<QPushButton*>("start_scan")->click();
            QTRY_VERIFY_WITH_TIMEOUT(w.findings_model()->size() > 0 && w.step() != int(MainWindow::Scan), 60000);
            const FindingView* f = w.findings_model()->at(0);
            QCOMPARE(f->focal, QStringLiteral("A"));
            QCOMPARE(f->reference, QStringLiteral("B"));
            // Pooled A 273/350 against B 289/350: A minus B is -4.6 points (the source's 78% and 83%).
            QCOMPARE(format_points(f->crude, false), QStringLiteral("-4.6 pp"));
        }
        // A choice made for this data does not leak into the next data set.
        boot->setValue(10000);
        g->use_table();
        QCOMPARE(w.question_page()->spec().bootstrap, 200);
    }

    // A pre-counted file read as rows is recognised: the Source step keeps the file in view
    // (no jump to the Question step) with a notice proposing the count column; one click reads
    // it with that column, and the reviewer moves on when done.
    void pre_counted_file_is_recognised_on_the_source_step() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        const QString counts = find_sample("clinic_outcomes_counts.csv");
        if (counts.isEmpty()) QSKIP("sample_data/clinic_outcomes_counts.csv not found");
        MainWindow w;
        w.source_page()->open_path(counts);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading() && w.source_page()->table(), 20000);
        QCOMPARE(w.step(), int(MainWindow::Source));
        QCOMPARE(w.source_page()->proposed_count_column(), QStringLiteral("patients"));
        auto* notice = w.source_page()->findChild<QWidget*>("count_notice");
        QVERIFY(notice && !notice->isHidden());
        QVERIFY(!w.source_page()->table()->weighted());
        w.source_page()->findChild<QPushButton*>("use_count_column")->click();
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading() && w.source_page()->table()->weighted(), 20000);
        QCOMPARE(QString::fromStdString(w.source_page()->table()->weight_column), QStringLiteral("patients"));
        QVERIFY(notice->isHidden());
        QCOMPARE(w.step(), int(MainWindow::Source));
        w.source_page()->findChild<QPushButton*>("source_next")->click();
        QCOMPARE(w.step(), int(MainWindow::Question));

        // The same clinic read row by row: nothing to propose.
        const QString rows = find_sample("clinic_outcomes.csv");
        w.source_page()->open_path(rows);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading() && w.source_page()->source() == rows, 20000);
        QVERIFY(w.source_page()->proposed_count_column().isEmpty());
        QVERIFY(notice->isHidden());
    }

    // The column menu offers every type, the one the reader inferred included ("As read"); a
    // type the file cannot be read with is reported and not remembered.
    void column_types_can_be_chosen_and_undone() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        QTemporaryDir dir;
        const QString path = dir.filePath("types.csv");
        QFile f(path);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write("code,label\n1,x\n2,y\n3,x\n");
        f.close();
        MainWindow w;
        SourcePage* s = w.source_page();
        s->open_path(path);
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading() && s->table(), 10000);
        QVERIFY(s->table()->columns[0].is_numeric());
        // The menu lists the three readings with the current one checked.
        QStringList offered;
        QTimer::singleShot(0, [&offered] {
            if (auto* m = qobject_cast<QMenu*>(QApplication::activePopupWidget())) {
                for (QAction* a : m->actions())
                    if (!a->isSeparator()) offered << a->text() + (a->isChecked() ? "*" : "");
                m->close();
            }
        });
        QTableView* v = s->column_view();
        emit v->customContextMenuRequested(v->visualRect(v->model()->index(0, 0)).center());
        QCOMPARE(offered, (QStringList{"As read (numeric)*", "As categorical", "As numeric"}));

        s->read_column_as("code", ColumnType::Categorical);
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading() && s->table()->columns[0].is_categorical(), 10000);
        s->read_column_as("code", std::nullopt);  // back to the reader's own choice
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading() && s->table()->columns[0].is_numeric(), 10000);
        QVERIFY(s->options().type_overrides.empty());

        s->read_column_as("label", ColumnType::Numeric);  // "x" is no number
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading(), 10000);
        QVERIFY2(s->message().contains("types.csv:2"), qPrintable(s->message()));
        QVERIFY(s->options().type_overrides.empty());  // not remembered for the next reload
        QVERIFY(s->table()->columns[1].is_categorical());
    }

    // The missing-markers field shows what a saved audit holds without a leading comma (the
    // empty cell is always missing) and gives the same markers back.
    void missing_markers_round_trip() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        QTemporaryDir dir;
        const QString path = dir.filePath("m.csv");
        QFile f(path);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write("g,y\na,1\nb,NA\n");
        f.close();
        MainWindow w;
        SourcePage* s = w.source_page();
        LoadOptions o;
        o.missing_markers = {QString(), "NA", "-"};
        s->open_path(path, o);
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading() && s->table(), 10000);
        QCOMPARE(s->missing_markers_text(), QStringLiteral("NA, -"));
        for (QPushButton* b : s->findChildren<QPushButton*>())
            if (b->text() == QStringLiteral("Reload")) b->click();
        QTRY_VERIFY_WITH_TIMEOUT(!s->loading(), 10000);
        QCOMPARE(s->options().missing_markers, (QStringList{QString(), "NA", "-"}));
        QCOMPARE(s->missing_markers_text(), QStringLiteral("NA, -"));
    }

    // Where the data came from is a kind, never the display name: a data file literally named
    // like the grid's source ("typed-in table") is still a file a project can point to, and
    // typed-in counts are never one.
    void the_source_kind_decides_not_its_name() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        MainWindow w;
        QCOMPARE(w.source_page()->kind(), SourceKind::None);
        CountsGrid* g = w.source_page()->counts_grid();
        g->set_rows({{"a", "5", "10", "3", "10"}, {"b", "2", "10", "6", "10"}});
        g->use_table();
        QCOMPARE(w.source_page()->kind(), SourceKind::TypedIn);
        QVERIFY(!w.current_project().ok());

        QTemporaryDir dir;
        const QString old_cwd = QDir::currentPath();
        QVERIFY(QDir::setCurrent(dir.path()));
        const QString name = typed_in_source_name();
        QFile f(name);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write("region,group,approved\nnorth,a,1\nsouth,b,0\nnorth,b,1\n");
        f.close();
        w.source_page()->open_path(name);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading() && w.source_page()->kind() == SourceKind::File, 10000);
        QCOMPARE(w.source_page()->source(), name);
        auto p = w.current_project();
        QDir::setCurrent(old_cwd);
        QVERIFY2(p.ok(), p.ok() ? "" : p.error().to_string().c_str());
        QCOMPARE(QString::fromStdString(p->data.path), name);
        QCOMPARE(p->data.rows, std::uint64_t(3));
    }

    // The data file's digest is computed on a worker: when the table arrives it is not known
    // yet, the GUI thread keeps turning its event loop (a 0 ms timer keeps firing) until the
    // worker reports, and a save straight after the load waits for it rather than writing an
    // empty digest. The digest saved is core's sha256_file of the file (FIPS 180-4; core's own
    // tests check it against published vectors).
    void data_digest_is_computed_off_the_gui_thread() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        QTemporaryDir dir;
        const QString path = dir.filePath("branches.csv");
        {
            QFile f(path);
            QVERIFY(f.open(QIODevice::WriteOnly));
            f.write("region,group,approved,remark\n");
            const QByteArray remark(400, 'x');
            for (int i = 0; i < 100000; ++i)  // about 42 MB
                f.write((i % 2 ? "north,a," : "south,b,") + QByteArray::number(i % 3 == 0) + "," + remark + "\n");
        }
        const auto expected = sha256_file(path.toStdString());
        QVERIFY(expected.ok());

        MainWindow w;
        bool known_at_load = true;
        bool saved = false;
        QString save_error;
        connect(w.source_page(), &SourcePage::table_loaded, &w, [&](std::shared_ptr<const Table> t, const QString&) {
            if (!t) return;
            known_at_load = w.data_digest().has_value();
            // A save straight after the load, before the worker is done.
            const Status st = w.save_project_to(dir.filePath("early.foldline"));
            saved = st.ok();
            if (!st.ok()) save_error = QString::fromStdString(st.error().to_string());
        });
        int ticks = 0;
        qint64 longest_gap = 0;
        QElapsedTimer since_tick;
        QTimer tick;
        tick.setInterval(0);
        connect(&tick, &QTimer::timeout, &w, [&] {
            if (ticks++ > 0) longest_gap = std::max(longest_gap, since_tick.elapsed());
            since_tick.restart();
        });
        bool done = false;
        connect(&w, &MainWindow::data_digest_done, &w, [&] { done = true; });
        tick.start();
        w.source_page()->open_path(path);
        QTRY_VERIFY_WITH_TIMEOUT(saved || !save_error.isEmpty(), 60000);
        tick.stop();
        QVERIFY2(saved, qPrintable(save_error));
        QVERIFY(done);
        QVERIFY(!known_at_load);
        QVERIFY(ticks > 1);
        // Generous on purpose (a shared machine): only a GUI thread blocked for the whole hash
        // of a much larger file would miss it.
        QVERIFY2(longest_gap < 5000, qPrintable(QString::number(longest_gap)));
        QCOMPARE(w.data_digest().value_or(""), *expected);
        auto p = project::load_project(dir.filePath("early.foldline").toStdString());
        QVERIFY(p.ok());
        QCOMPARE(p->data.sha256, *expected);
        // The project produced before the digest is known is still produced (autosave never
        // waits); now it carries the digest too.
        QCOMPARE(w.current_project()->data.sha256, *expected);
    }

    void layout_is_remembered() {
        QList<int> sizes;
        {
            MainWindow w;
            w.resize(1300, 850);
            w.show();
            QVERIFY(QTest::qWaitForWindowExposed(&w));
            QSplitter* s = w.source_page()->splitter();
            s->setSizes({900, 300});
            sizes = s->sizes();
            w.close();
        }
        MainWindow again;
        again.show();
        QVERIFY(QTest::qWaitForWindowExposed(&again));
        QCOMPARE(again.source_page()->splitter()->sizes(), sizes);
        QCOMPARE(again.size(), QSize(1300, 850));
    }

    void load_error_names_file_line_and_column() {
        if (!reader_available()) QSKIP("this build has no CSV reader");
        QTemporaryDir dir;
        const QString path = dir.filePath("ragged.csv");
        QFile f(path);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write("a,b\n1,2\n3,4,5\n");
        f.close();
        MainWindow w;
        w.source_page()->open_path(path);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading(), 10000);
        const QString msg = w.source_page()->message();
        QVERIFY2(msg.contains("ragged.csv:3"), qPrintable(msg));
        QVERIFY(!w.source_page()->table());
    }

    // A pay review through the workbench (sample_data/pay_review.csv, an invented employer):
    // open the rows, choose "Means", scan, open the grade finding: group means per stratum beside
    // the pooled ones, the gap, mix, decomposition and group-means charts, the pay-review caution
    // in view. Saved and opened again, the audit keeps its kind, settings and the reviewer's note.
    // With FOLDLINE_SHOT_DIR set the window is also grabbed to a PNG there, for a person to look at.
    void mean_audit_opens_scans_shows_and_reopens() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        const QString csv = find_sample("pay_review.csv");
        if (csv.isEmpty()) QSKIP("sample_data/pay_review.csv not found");
        QTemporaryDir dir;
        MainWindow w;
        w.resize(1500, 950);
        w.show();
        w.source_page()->open_path(csv);
        QTRY_VERIFY_WITH_TIMEOUT(!w.source_page()->loading(), 60000);
        QVERIFY(w.source_page()->table());
        auto* means = w.question_page()->findChild<QRadioButton*>("kind_means");
        QVERIFY(means);
        means->click();
        QuestionSpec q = w.question_page()->spec();
        QVERIFY(q.mean && !q.slope);
        q.outcome = QStringLiteral("base_pay");
        q.exposure = QStringLiteral("gender");
        q.focal = QStringLiteral("woman");
        q.reference = QStringLiteral("man");
        q.pay_gap = true;
        q.candidates = {QStringLiteral("grade"), QStringLiteral("site")};
        w.question_page()->set_spec(q);
        QVERIFY2(w.question_page()->problems().isEmpty(), qPrintable(w.question_page()->problems().join("; ")));
        QVERIFY(w.start_scan());
        QTRY_VERIFY_WITH_TIMEOUT(!w.scan_page()->running(), 120000);
        QTRY_VERIFY_WITH_TIMEOUT(w.findings_model()->size() == 3, 10000);  // grade, site, grade × site
        w.go_to(MainWindow::Findings);
        int grade = -1;
        for (int i = 0; i < w.findings_model()->size(); ++i)
            if (w.findings_model()->at(i)->strata == QStringList{"grade"}) grade = i;
        QVERIFY(grade >= 0);
        QVERIFY(w.findings_page()->select(grade));
        const FindingView* f = w.findings_model()->at(grade);
        QVERIFY(f->mean);
        QCOMPARE(f->cls, FindingClass::Reversal);  // as `foldline run sample_data/pay_audit.foldline` says
        FindingsPage* page = w.findings_page();
        QVERIFY(page->pay_caution()->isVisible());
        QVERIFY(page->pay_caution()->text().contains("equal-pay law"));
        QVERIFY(page->pay_caution()->text().contains("counsel"));
        QCOMPARE(page->strata_table()->rowCount(), int(f->rows.size()));
        QVERIFY(page->strata_table()->horizontalHeaderItem(2)->text().contains("Mean woman"));
        QTabWidget* tabs = page->chart_tabs();
        QVERIFY(tabs->isTabVisible(0) && tabs->isTabVisible(1) && tabs->isTabVisible(2) && tabs->isTabVisible(5));
        QVERIFY(!tabs->isTabVisible(3) && !tabs->isTabVisible(4));
        tabs->setCurrentIndex(5);
        QCOMPARE(page->current_chart()->objectName(), QStringLiteral("chart_means"));
        QVERIFY(page->current_chart()->graphCount() == 2);  // focal and reference
        if (const QByteArray shots = qgetenv("FOLDLINE_SHOT_DIR"); !shots.isEmpty()) {
            QVERIFY(w.grab().save(QDir(QString::fromLocal8Bit(shots)).filePath("mean-findings-means.png")));
            tabs->setCurrentIndex(0);
            QVERIFY(w.grab().save(QDir(QString::fromLocal8Bit(shots)).filePath("mean-findings-gaps.png")));
        }
        w.findings_model()->set_decision(grade, Decision::FollowUp, QStringLiteral("ask about G4"));

        const QString path = dir.filePath("pay.foldline");
        QVERIFY(w.save_project_to(path).ok());
        auto saved = project::load_project(path.toStdString());
        QVERIFY(saved.ok());
        QCOMPARE(saved->question.kind, project::QuestionKind::Mean);
        QVERIFY(saved->question.pay_gap && !saved->question.log_outcome);
        QCOMPARE(saved->question.outcome, std::string("base_pay"));
        const auto* r = saved->review(project::mean_key({"grade"}, "base_pay", "woman", "man"));
        QVERIFY(r);
        QCOMPARE(r->note, std::string("ask about G4"));

        MainWindow again;
        QVERIFY(again.open_project(path).ok());
        QTRY_VERIFY_WITH_TIMEOUT(again.findings_model()->size() == 3, 120000);
        const QuestionSpec back = again.question_page()->spec();
        QVERIFY(back.mean && back.pay_gap && !back.log_outcome);
        QCOMPARE(back.outcome, QStringLiteral("base_pay"));
        QCOMPARE(back.focal, QStringLiteral("woman"));
        QTRY_VERIFY_WITH_TIMEOUT([&] {
            for (const FindingView& g : again.findings_model()->findings())
                if (g.strata == QStringList{"grade"} && g.note == QStringLiteral("ask about G4") &&
                    g.decision == Decision::FollowUp)
                    return true;
            return false;
        }(), 60000);
    }

    // The audit has one diagram: selecting another finding (a click, or the keyboard moving
    // through the list) changes which finding the verdict is read for, never the diagram the
    // reviewer drew, nor its undo history.
    void selecting_another_finding_keeps_the_diagram() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        if (find_sample("lender_approvals.csv").isEmpty()) QSKIP("sample_data/lender_approvals.csv not found");
        MainWindow w;
        const QString err = prepare_demo(w, 120000);
        QVERIFY2(err.isEmpty(), qPrintable(err));
        w.go_to(MainWindow::Diagram);
        DiagramPage* d = w.diagram_page();
        const std::size_t nodes = d->doc()->nodes().size(), edges = d->doc()->edges().size();
        QVERIFY(nodes > 0);
        // The reviewer adds an arrow the sample's diagram lacks.
        QString from, to;
        for (const DiagramNode& a : d->doc()->nodes())
            for (const DiagramNode& b : d->doc()->nodes())
                if (from.isEmpty() && a.name != b.name && !d->doc()->has_edge(a.name, b.name) &&
                    !d->doc()->has_edge(b.name, a.name) && d->request_edge(a.name, b.name))
                    from = a.name, to = b.name;
        QVERIFY(!from.isEmpty());
        QCOMPARE(d->doc()->edges().size(), edges + 1);
        const int undo_steps = d->undo_stack()->count();
        QVERIFY(undo_steps > 0);
        // Another finding, with other strata.
        const int first = w.findings_page()->selected();
        int other = -1;
        for (int i = 0; i < w.findings_model()->size() && other < 0; ++i)
            if (w.findings_model()->at(i)->strata != w.findings_model()->at(first)->strata) other = i;
        QVERIFY(other >= 0);
        w.go_to(MainWindow::Findings);
        QVERIFY(w.findings_page()->select(other));
        w.go_to(MainWindow::Diagram);
        // The step names the finding its verdict is now read for.
        QVERIFY2(d->finding().contains(w.findings_model()->at(other)->strata.join(QStringLiteral(" × "))),
                 qPrintable(d->finding()));
        QCOMPARE(d->doc()->nodes().size(), nodes);
        QCOMPARE(d->doc()->edges().size(), edges + 1);
        QVERIFY(d->doc()->has_edge(from, to));
        QCOMPARE(d->undo_stack()->count(), undo_steps);
        QVERIFY(d->undo_stack()->canUndo());
        // The saved audit holds the diagram as drawn.
        auto p = w.current_project();
        QVERIFY(p.ok());
        QCOMPARE(p->diagram()->edges.size(), edges + 1);
    }

    void whole_path_on_the_lender_sample() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        if (find_sample("lender_approvals.csv").isEmpty()) QSKIP("sample_data/lender_approvals.csv not found");
        MainWindow w;
        w.resize(1400, 900);
        w.show();
        QVERIFY(QTest::qWaitForWindowExposed(&w));
        const QString err = prepare_demo(w, 120000);
        QVERIFY2(err.isEmpty(), qPrintable(err));
        QCOMPARE(w.step(), int(MainWindow::Findings));
        const int top = w.findings_page()->selected();
        QVERIFY(top >= 0);
        const FindingView* f = w.findings_model()->at(top);
        // The tables show the engine's numbers for the top finding.
        QTableWidget* s = w.findings_page()->strata_table();
        QCOMPARE(s->rowCount(), int(f->rows.size()));
        QCOMPARE(s->item(0, 0)->text(), f->rows[0].level);
        QCOMPARE(s->item(0, 1)->text(), QStringLiteral("%1 / %2").arg(f->rows[0].pos_focal, 0, 'f', 0).arg(f->rows[0].n_focal, 0, 'f', 0));
        QCOMPARE(w.findings_page()->pooled_table()->item(2, 2)->text(), format_points(f->crude));
        // Record a decision and write the memo; the PDF carries it (checked by size and header
        // here; the memo's wording is tested with the memo writer).
        w.findings_page()->decide(Decision::Upheld);
        QCOMPARE(w.findings_model()->at(top)->decision, Decision::Upheld);
        QTemporaryDir memo_dir;
        const QString pdf = memo_dir.filePath("memo.pdf");
        const Status written = w.export_memo_to(pdf);
        QVERIFY2(written.ok(), written.ok() ? "" : written.error().to_string().c_str());
        QFile memo(pdf);
        QVERIFY(memo.open(QIODevice::ReadOnly));
        QVERIFY(memo.read(5) == "%PDF-");
        QVERIFY(memo.size() > 10000);

        // Save the audit and open it in a fresh window: the data is read again, the question
        // asked again, and the decision comes back on the same finding.
        const QString audit = memo_dir.filePath("lender.foldline");
        const Status saved = w.save_project_to(audit);
        QVERIFY2(saved.ok(), saved.ok() ? "" : saved.error().to_string().c_str());
        {
            MainWindow again;
            QVERIFY(again.open_project(audit).ok());
            auto restored = [&] {
                for (const FindingView& g : again.findings_model()->findings())
                    if (g.strata == f->strata) return g.decision == Decision::Upheld;
                return false;
            };
            QTRY_VERIFY_WITH_TIMEOUT(restored(), 60000);
            QCOMPARE(again.findings_model()->size(), w.findings_model()->size());
            QVERIFY(!again.open_project(memo_dir.filePath("absent.foldline")).ok());
        }
        // Diagram: draw an edge that changes the verdict, then undo it.
        w.go_to(MainWindow::Diagram);
        DiagramPage* d = w.diagram_page();
        if (!d->verdict().computed) QSKIP("this build has no causal engine");
        const std::optional<causal::Answer> before = d->verdict().answer;
        const QString exposure = w.question_page()->spec().exposure;
        const QString stratum = f->strata.first();
        // Whichever way the arrow between the stratifier and the exposure points, reversing it
        // swaps confounder and mediator, and with them the answer: the back-door criterion
        // (Pearl 2009, Causality, sec. 3.3.1) admits a confounder and excludes a descendant of
        // the exposure. The sample diagram draws the product as a mediator (sample_data/README.md).
        const bool was_mediator = d->doc()->has_edge(exposure, stratum);
        QVERIFY(d->verdict().roles.contains(stratum));
        const causal::Role role_before = d->verdict().roles.value(stratum);
        QVERIFY(role_before == (was_mediator ? causal::Role::Mediator : causal::Role::Confounder));
        QVERIFY(before == (was_mediator ? causal::Answer::Pooled : causal::Answer::Stratified));
        const QString from = was_mediator ? exposure : stratum, to = was_mediator ? stratum : exposure;
        d->undo_stack()->beginMacro("reverse");
        d->undo_stack()->push(new RemoveEdgeCommand(d->doc(), from, to));
        QVERIFY(d->request_edge(to, from));
        d->undo_stack()->endMacro();
        QVERIFY(d->verdict().roles.contains(stratum));
        QVERIFY(d->verdict().roles.value(stratum) == (was_mediator ? causal::Role::Confounder : causal::Role::Mediator));
        QVERIFY(d->verdict().answer == (was_mediator ? causal::Answer::Stratified : causal::Answer::Pooled));
        // Drawing the old arrow back as well would close a cycle: refused with a message.
        QVERIFY(!d->request_edge(from, to));
        QVERIFY(d->message().contains("cycle"));
        d->undo_stack()->undo();
        QVERIFY(d->doc()->has_edge(from, to));
        QVERIFY(!d->doc()->has_edge(to, from));
        QVERIFY(d->verdict().roles.value(stratum) == role_before);

        // Neither view valid: income band made a common cause of group and approval while the
        // product stays a mediator. The verdict names {income_band} and the page shows the
        // engine's standardised estimate over it, the same figure as the scan's income_band finding.
        QVERIFY(was_mediator);  // the demo opens the sample's own diagram
        QVERIFY(d->doc()->node("income_band").has_value());
        {
            QVERIFY(d->request_edge("income_band", exposure));
            QVERIFY(d->verdict().answer == causal::Answer::OtherSet);
            QCOMPARE(d->verdict().standardise_over, QStringList{"income_band"});
            const FindingView* ib = nullptr;
            for (const FindingView& g : w.findings_model()->findings())
                if (g.strata == QStringList{"income_band"}) ib = &g;
            QVERIFY(ib);
            QVERIFY2(d->verdict().adjusted.endsWith(format_points(ib->standardised)), qPrintable(d->verdict().adjusted));
            d->undo_stack()->undo();
            QVERIFY(d->verdict().answer == before);
        }
        QVERIFY(d->verdict().answer == before);
    }

    // The lender sample's one family (product and its pairs): the lead's decision applied to the
    // family is one step of Edit > Undo on the Findings step, and the members' decisions, with
    // the lead they came from, survive saving and reopening the audit.
    void family_decision_survives_save_and_reopen() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        if (find_sample("lender_approvals.csv").isEmpty()) QSKIP("sample_data/lender_approvals.csv not found");
        QTemporaryDir dir;
        const QString audit = dir.filePath("family.foldline");
        int members = 0;
        {
            MainWindow w;
            const QString err = prepare_demo(w, 120000);
            QVERIFY2(err.isEmpty(), qPrintable(err));
            w.go_to(MainWindow::Findings);
            int lead = -1;
            for (int i = 0; i < w.findings_model()->size(); ++i)
                if (w.findings_model()->at(i)->strata == QStringList{"product"}) lead = i;
            QVERIFY(lead >= 0);
            members = int(w.findings_page()->family_tree()->folded_under(lead).size());
            QCOMPARE(members, 7);  // sample_data/README.md: one family led by product
            QVERIFY(w.findings_page()->select(lead));
            w.action("action_upheld")->trigger();
            QVERIFY(w.action("action_apply_family")->isEnabled());
            w.action("action_apply_family")->trigger();
            auto count = [&](Decision d, bool applied) {
                int n = 0;
                for (const FindingView& f : w.findings_model()->findings())
                    n += f.decision == d && f.applied_from == (applied ? QString("product") : QString()) ? 1 : 0;
                return n;
            };
            QCOMPARE(count(Decision::Upheld, true), members);
            w.action("action_undo")->trigger();  // one step takes back the whole family
            QCOMPARE(count(Decision::Upheld, true), 0);
            QCOMPARE(w.findings_model()->at(lead)->decision, Decision::Upheld);
            w.action("action_redo")->trigger();
            QCOMPARE(count(Decision::Upheld, true), members);
            QVERIFY(w.unsaved());
            QVERIFY(w.save_project_to(audit).ok());
        }
        auto saved = project::load_project(audit.toStdString());
        QVERIFY(saved.ok());
        int recorded = 0;
        for (const auto& r : saved->reviews) recorded += r.applied_from == "product" && r.decision == Decision::Upheld;
        QCOMPARE(recorded, members);
        MainWindow again;
        QVERIFY(again.open_project(audit).ok());
        auto restored = [&] {
            int n = 0;
            for (const FindingView& f : again.findings_model()->findings())
                n += f.decision == Decision::Upheld && f.applied_from == "product" ? 1 : 0;
            return n;
        };
        QTRY_VERIFY_WITH_TIMEOUT(restored() == members, 120000);
    }

    // The memo's detail is chosen on the Memo step: the choice makes the audit unsaved, is saved
    // as memo.detail (docs/project-file.md) and comes back when the audit is reopened.
    void memo_detail_choice_is_saved_and_restored() {
        if (!reader_available() || !scan_available()) QSKIP("this build lacks the CSV reader or the scan engine");
        if (find_sample("lender_approvals.csv").isEmpty()) QSKIP("sample_data/lender_approvals.csv not found");
        QTemporaryDir dir;
        const QString audit = dir.filePath("detail.foldline");
        {
            MainWindow w;
            const QString err = prepare_demo(w, 120000);
            QVERIFY2(err.isEmpty(), qPrintable(err));
            QVERIFY(w.save_project_to(audit).ok());
            QVERIFY(!w.unsaved());
            auto* combo = w.findChild<QComboBox*>(QStringLiteral("memo_detail"));
            QVERIFY(combo);
            QCOMPARE(combo->currentData().toString(), QString("families"));
            w.go_to(MainWindow::Memo);
            combo->setCurrentIndex(combo->findData(QStringLiteral("full")));
            QVERIFY(w.unsaved());
            QVERIFY(w.save_project_to(audit).ok());
        }
        auto saved = project::load_project(audit.toStdString());
        QVERIFY(saved.ok());
        QCOMPARE(QString::fromStdString(saved->memo.detail), QString("full"));
        MainWindow again;
        QVERIFY(again.open_project(audit).ok());
        auto* combo = again.findChild<QComboBox*>(QStringLiteral("memo_detail"));
        QVERIFY(combo);
        QCOMPARE(combo->currentData().toString(), QString("full"));
    }

    void trend_path_on_the_retail_sample() {
        if (find_sample("retail_weeks.csv").isEmpty()) QSKIP("sample_data/retail_weeks.csv not found");
        MainWindow w;
        const QString err = prepare_slope_demo(w, 120000);
        QVERIFY2(err.isEmpty(), qPrintable(err));
        const FindingView* f = w.findings_model()->at(w.findings_page()->selected());
        QVERIFY(f && f->slope);
        // The sample's planted story (sample_data/README.md): weekly sales rise with promotion
        // spend pooled, and fall within every store format.
        QCOMPARE(f->strata, QStringList{"store_format"});
        QCOMPARE(f->cls, FindingClass::Reversal);
        QVERIFY(f->crude.value > 0);
        QVERIFY(f->adjusted.value < 0);
        QTableWidget* s = w.findings_page()->strata_table();
        QCOMPARE(s->rowCount(), int(f->slope_rows.size()));
        for (int i = 0; i < s->rowCount(); ++i) {
            QCOMPARE(s->item(i, 2)->text(), format_estimate(f->slope_rows[std::size_t(i)].slope));
            QVERIFY(f->slope_rows[std::size_t(i)].slope.value < 0);
        }
        QVERIFY(f->points.size() <= 4000 && !f->points.empty());
        QVERIFY(f->points_note.contains("drawn"));
    }

    // "Also look for hidden groups" on the retail sample: core's hint (ScanResult::latent) is
    // shown above the findings as a labelled hint, and never becomes a finding row.
    void hidden_group_hint_is_shown_as_a_hint() {
        if (find_sample("retail_weeks.csv").isEmpty()) QSKIP("sample_data/retail_weeks.csv not found");
        MainWindow w;
        const QString err = prepare_slope_demo(w, 120000);
        QVERIFY2(err.isEmpty(), qPrintable(err));
        QVERIFY(w.findings_page()->hidden_group_hint().isEmpty());  // not asked for
        const int rows_without = w.findings_model()->size();
        QuestionSpec q = w.question_page()->spec();
        QVERIFY(q.slope);
        QCOMPARE(q.outcome, QStringLiteral("weekly_sales"));
        QCOMPARE(q.exposure, QStringLiteral("promo_spend"));
        q.find_groups = true;
        w.question_page()->set_spec(q);
        QVERIFY(w.start_scan());
        QVERIFY(w.findings_page()->hidden_group_hint().isEmpty());  // cleared while it runs
        QTRY_VERIFY_WITH_TIMEOUT(!w.scan_page()->running(), 120000);
        QApplication::processEvents();
        // Core's note as the engine hands it over (ScanResult::latent).
        const QString note = hidden_group_note(w.scan_page()->scan_result().get());
        QVERIFY(!note.isEmpty());
        QCOMPARE(w.findings_page()->hidden_group_hint(), QStringLiteral("Hidden-group hint (not a finding): ") + note);
        auto* label = w.findings_page()->findChild<QLabel*>("hidden_group_hint");
        QVERIFY(label && !label->isHidden());
        // The same findings as without the hint; none of them is the hint.
        QCOMPARE(w.findings_model()->size(), rows_without);
        for (int i = 0; i < w.findings_model()->size(); ++i)
            for (int c = 0; c < w.findings_model()->columnCount(); ++c)
                QVERIFY(!w.findings_model()->index(i, c).data().toString().contains(note));
        // Asked off again, the hint goes.
        q.find_groups = false;
        w.question_page()->set_spec(q);
        QVERIFY(w.start_scan());
        QTRY_VERIFY_WITH_TIMEOUT(!w.scan_page()->running(), 120000);
        QApplication::processEvents();
        QVERIFY(w.findings_page()->hidden_group_hint().isEmpty());
    }

    void trend_project_opens_with_its_decision() {
        const QString audit = find_sample("retail_audit.foldline");
        if (audit.isEmpty() || find_sample("retail_weeks.csv").isEmpty()) QSKIP("sample_data/retail_audit.foldline not found");
        MainWindow w;
        QVERIFY(w.open_project(audit).ok());
        auto restored = [&] {
            for (const FindingView& g : w.findings_model()->findings())
                if (g.slope && g.strata == QStringList{"store_format"})
                    return g.decision == Decision::Upheld && g.note.contains("trading desk");
            return false;
        };
        QTRY_VERIFY_WITH_TIMEOUT(restored(), 120000);
        QVERIFY(w.question_page()->spec().slope);
        QCOMPARE(w.project_path(), audit);
        // Opening is not an edit: nothing is unsaved, and the title names the audit.
        QTest::qWait(300);
        QVERIFY(!w.unsaved());
        QVERIFY(w.windowTitle().contains(QStringLiteral("retail_audit.foldline")));
        // Saved again from the workbench, it is still a version 2 trend audit with the same
        // question, decision and note (memo settings kept from the opened file).
        QTemporaryDir dir;
        const QString copy = dir.filePath("again.foldline");
        QVERIFY(w.save_project_to(copy).ok());
        auto p = project::load_project(copy.toStdString());
        QVERIFY(p.ok());
        QCOMPARE(p->question.kind, project::QuestionKind::Slope);
        QCOMPARE(p->memo.analyst, std::string("Trading analytics desk (fictional)"));
        const auto* r = p->review(project::slope_key({"store_format"}, "promo_spend", "weekly_sales"));
        QVERIFY(r && r->decision == Decision::Upheld && r->saved_class == FindingClass::Reversal);
        QVERIFY(w.data_change().isEmpty());

        // The data file grew by one row since the save: the reopened audit says what changed.
        QFile::copy(find_sample("retail_weeks.csv"), dir.filePath("retail_weeks.csv"));
        {
            QFile data(dir.filePath("retail_weeks.csv"));
            QVERIFY(data.open(QIODevice::Append));
            data.write("kiosk,Lowmarch,Q1,300.5,7000.25,240\n");
        }
        auto moved = project::load_project(audit.toStdString());
        QVERIFY(moved.ok());
        moved->data.path = dir.filePath("retail_weeks.csv").toStdString();
        QVERIFY(project::save_project(*moved, dir.filePath("grown.foldline").toStdString()).ok());
        MainWindow again;
        QVERIFY(again.open_project(dir.filePath("grown.foldline")).ok());
        QTRY_VERIFY_WITH_TIMEOUT(!again.data_change().isEmpty(), 120000);
        QVERIFY2(again.data_change().contains(QStringLiteral("rows: 5,000 \u2192 5,001")), qPrintable(again.data_change()));
        QVERIFY(again.data_change().contains(QStringLiteral("same columns")));
    }

    // A saved trend question with a covariate re-runs adjusted in the workbench, as `foldline run`
    // does. statsmodels 0.13.5 OLS on sample_data/retail_weeks.csv, 4,972 rows with footfall
    // [calc]: weekly_sales ~ promo_spend + footfall → 1.739468503482215;
    // + C(store_format) → −1.4589542471516073.
    // An audit whose groups are formed by two columns opens with the combination on the Question
    // step (the groups column and "Combined with"), scans it, keeps it when saved again, and the
    // Edit menu's Undo takes a change of the combination back while the Question step is shown.
    void combined_groups_audit_opens_and_keeps_its_question() {
        QTemporaryDir dir;
        const QString csv = dir.filePath("hiring.csv");
        {
            QFile f(csv);
            QVERIFY(f.open(QIODevice::WriteOnly));
            QByteArray rows = "sex,ethnicity,dept,hired\n";
            for (int i = 0; i < 8; ++i) rows += "f,a,x,1\nm,b,y,0\nf,b,x,0\nm,a,y,1\nf,a,y,0\nm,b,x,1\n";
            f.write(rows);
        }
        project::Project p;
        p.data.path = csv.toStdString();
        p.data.columns = {"sex", "ethnicity", "dept", "hired"};
        p.question.outcome = "hired";
        p.question.positive = "1";
        p.question.exposure = "sex+ethnicity";
        p.question.focal = {"f+b"};
        p.question.reference = "m+a";
        p.scan.bootstrap = 0;
        const QString path = dir.filePath("combined.foldline");
        QVERIFY(project::save_project(p, path.toStdString()).ok());
        MainWindow w;
        const Status st = w.open_project(path);
        QVERIFY2(st.ok(), st.ok() ? "" : st.error().message.c_str());
        QTRY_VERIFY_WITH_TIMEOUT(w.scan_page()->scan_result() && !w.scan_page()->running(), 60000);
        QTest::qWait(100);
        QuestionPage* q = w.question_page();
        QCOMPARE(q->spec().exposure, QStringLiteral("sex+ethnicity"));
        QCOMPARE(q->spec().focal, QStringLiteral("f+b"));
        QCOMPARE(q->spec().reference, QStringLiteral("m+a"));
        QCOMPARE(q->combined_with(), QStringList{QStringLiteral("ethnicity")});

        // Saved again: the question is the one opened.
        const QString again = dir.filePath("again.foldline");
        QVERIFY(w.save_project_to(again).ok());
        auto back = project::load_project(again.toStdString());
        QVERIFY(back.ok());
        QCOMPARE(back->question.exposure, std::string("sex+ethnicity"));
        QCOMPARE(back->question.focal, std::vector<std::string>{"f+b"});
        QCOMPARE(back->question.reference.value_or(""), std::string("m+a"));

        // Undo follows the step on screen: on the Question step it takes the combination back.
        w.go_to(MainWindow::Question);
        auto* list = w.findChild<QListWidget*>(QStringLiteral("combine_groups"));
        QVERIFY(list);
        QListWidgetItem* eth = list->findItems(QStringLiteral("ethnicity"), Qt::MatchExactly).value(0);
        QVERIFY(eth);
        eth->setCheckState(Qt::Unchecked);
        QCOMPARE(q->spec().exposure, QStringLiteral("sex"));
        QAction* undo = w.findChild<QAction*>(QStringLiteral("action_undo"));
        QVERIFY(undo && undo->isEnabled());
        undo->trigger();
        QCOMPARE(q->spec().exposure, QStringLiteral("sex+ethnicity"));
        QCOMPARE(q->spec().focal, QStringLiteral("f+b"));
        QCOMPARE(q->spec().reference, QStringLiteral("m+a"));
        eth = list->findItems(QStringLiteral("ethnicity"), Qt::MatchExactly).value(0);  // the list was refilled
        QVERIFY(eth);
        QCOMPARE(eth->checkState(), Qt::Checked);
        // On the Diagram step, Undo is the diagram's again.
        w.go_to(MainWindow::Diagram);
        QVERIFY(!undo->isEnabled());
    }

    void trend_project_with_a_covariate_runs_adjusted() {
        const QString audit = find_sample("retail_audit.foldline");
        if (audit.isEmpty() || find_sample("retail_weeks.csv").isEmpty()) QSKIP("sample_data/retail_audit.foldline not found");
        auto p = project::load_project(audit.toStdString());
        QVERIFY(p.ok());
        p->question.covariates = {"footfall"};
        p->reviews.clear();
        QTemporaryDir dir;
        QVERIFY(QFile::copy(find_sample("retail_weeks.csv"), dir.filePath("retail_weeks.csv")));
        p->data.path = dir.filePath("retail_weeks.csv").toStdString();
        const QString path = dir.filePath("adjusted.foldline");
        QVERIFY(project::save_project(*p, path.toStdString()).ok());
        MainWindow w;
        QVERIFY(w.open_project(path).ok());
        const FindingView* format = nullptr;
        auto found = [&] {
            for (const FindingView& g : w.findings_model()->findings())
                if (g.slope && g.strata == QStringList{"store_format"}) format = &g;
            return format != nullptr;
        };
        QTRY_VERIFY_WITH_TIMEOUT(found(), 120000);
        QCOMPARE(w.question_page()->spec().covariates, QStringList{"footfall"});
        QVERIFY(qAbs(format->crude.value - 1.739468503482215) < 1e-9);
        QVERIFY(qAbs(format->adjusted.value - -1.4589542471516073) < 1e-9);
        // Footfall adjusts; it is not also a stratifier.
        for (const FindingView& g : w.findings_model()->findings()) QVERIFY(!g.strata.contains("footfall"));
        // Saved again, the covariate stays.
        QVERIFY(w.save_project_to(dir.filePath("again.foldline")).ok());
        auto again = project::load_project(dir.filePath("again.foldline").toStdString());
        QVERIFY(again.ok());
        QCOMPARE(again->question.covariates, std::vector<std::string>{"footfall"});
    }

    // The workbench's memo of a trend audit goes through the same content builder and writer as
    // `foldline memo`: the reviewer's section, the side-by-side slopes, the chart (drawn as
    // vector graphics, so its title and legend are text), the verdict, the decision and note,
    // the method notes and the caution. The figures are checked against statsmodels.
    void trend_memo_from_the_workbench() {
        const QString audit = find_sample("retail_audit.foldline");
        if (audit.isEmpty() || find_sample("retail_weeks.csv").isEmpty()) QSKIP("sample_data/retail_audit.foldline not found");
        const QString pdftotext = QStandardPaths::findExecutable("pdftotext");
        const QString pdftoppm = QStandardPaths::findExecutable("pdftoppm");
        if (pdftotext.isEmpty() || pdftoppm.isEmpty()) QSKIP("poppler-utils (pdftotext, pdftoppm) not installed");
        MainWindow w;
        QTemporaryDir dir;
        // No scan yet: the memo says what is missing and writes nothing.
        const Status early = w.export_memo_to(dir.filePath("early.pdf"));
        QVERIFY(!early.ok());
        QVERIFY(QString::fromStdString(early.error().to_string()).contains("early.pdf"));
        QVERIFY(!QFile::exists(dir.filePath("early.pdf")));
        QVERIFY(w.memo_preview_image(400).isNull());

        QVERIFY(w.open_project(audit).ok());
        auto restored = [&] {
            for (const FindingView& g : w.findings_model()->findings())
                if (g.slope && g.strata == QStringList{"store_format"}) return g.decision == Decision::Upheld;
            return false;
        };
        QTRY_VERIFY_WITH_TIMEOUT(restored(), 120000);

        // The Memo step previews page 1 of the PDF: a white page with ink on it.
        w.go_to(MainWindow::Memo);
        const QImage page = w.memo_page()->page_preview();
        QVERIFY(!page.isNull());
        QCOMPARE(page.width(), int(MainWindow::kMemoPreviewWidth));
        QVERIFY(page.height() > page.width());
        int ink = 0;
        for (int y = 0; y < page.height(); y += 2)
            for (int x = 0; x < page.width(); x += 2) ink += qGray(page.pixel(x, y)) < 128;
        QVERIFY2(ink > 200, qPrintable(QString::number(ink)));

        const QString pdf = dir.filePath("retail memo.pdf");
        const Status written = w.export_memo_to(pdf);
        QVERIFY2(written.ok(), written.ok() ? "" : written.error().to_string().c_str());
        QProcess text;
        text.start(pdftotext, {pdf, QStringLiteral("-")});
        QVERIFY(text.waitForFinished(60000));
        QCOMPARE(text.exitCode(), 0);
        const QString all = QString::fromUtf8(text.readAllStandardOutput()).simplified();

        // statsmodels 0.13.5 OLS on sample_data/retail_weeks.csv [calc]:
        //   weekly_sales ~ promo_spend                    slope 21.5657
        //   weekly_sales ~ promo_spend + C(store_format)  slope -3.96884, 95% CI -4.24139 to -3.69629
        //   per format, weekly_sales ~ promo_spend: high_street -4.32244, kiosk -3.88712,
        //   mall -3.71856, superstore -4.08282
        const int section = all.indexOf(QStringLiteral("Reversal: store_format (weekly_sales on promo_spend)"));
        QVERIFY2(section > 0, "no section for the finding the reviewer upheld");
        const QString s = all.mid(section, 4000);
        QVERIFY(s.contains(QStringLiteral("Pooled slope +21.57 +21.36 to +21.78")));
        QVERIFY(s.contains(QStringLiteral("Within slope (one intercept per stratum) -3.969 -4.241 to -3.696")));
        // The side-by-side table: pooled row, then each format.
        QVERIFY(s.contains(QStringLiteral("Side by side: pooled and each stratum")));
        QVERIFY(s.contains(QStringLiteral("All (pooled) 5,000 +21.57")));
        QVERIFY(s.contains(QStringLiteral("high_street 1,460 -4.322")));
        QVERIFY(s.contains(QStringLiteral("kiosk 1,526 -3.887")));
        // mall: a page break may fall between the label and its figures (the header repeats).
        QVERIFY(s.contains(QStringLiteral("mall 1,270 -3.719")) ||
                (s.contains(QStringLiteral("Stratum mall")) && s.contains(QStringLiteral("1,270 -3.719"))));
        QVERIFY(s.contains(QStringLiteral("744 -4.083")));  // superstore (its label may be read after the row)
        // The chart, drawn as vectors: its title and legend are selectable text.
        QVERIFY(s.contains(QStringLiteral("weekly_sales on promo_spend by store_format")));
        QVERIFY(s.contains(QStringLiteral("superstore (slope -4.083)")));
        QVERIFY(s.contains(QStringLiteral("All (pooled) (slope 21.57)")));
        // Verdict, decision and note; the diagram with roles.
        QVERIFY(s.contains(QStringLiteral("Which view answers the question: the within-strata slope (by store_format)")));
        QVERIFY(s.contains(QStringLiteral("Reviewer's decision: upheld.")));
        QVERIFY(s.contains(QStringLiteral("ask the trading desk for the weekly demand forecast")));
        QVERIFY(s.contains(QStringLiteral("Causal diagram")));
        // A finding stratified by footfall (which follows sales) points to the within-format slope, which
        // the memo computes and quotes (statsmodels figures above).
        QVERIFY(all.contains(QStringLiteral("The estimate to quote, the within slope over store_format: -3.969 "
                                            "(95% CI -4.241 to -3.696)")));
        // The memo settings of the opened audit, the method notes of a trend audit (no rate
        // estimators) and the caution.
        QVERIFY(all.startsWith(QStringLiteral("Promotion spend and weekly sales at Tallow & Pine Outfitters")));
        QVERIFY(all.contains(QStringLiteral("Trading analytics desk (fictional)")));
        QVERIFY(all.contains(QStringLiteral("Method notes")));
        QVERIFY(all.contains(QStringLiteral("ordinary least squares slope of weekly_sales on promo_spend")));
        QVERIFY(all.contains(QStringLiteral("Benjamini-Hochberg over all 10 checks")));
        QVERIFY(!all.contains(QStringLiteral("Wilson score")));
        QVERIFY(all.contains(QStringLiteral("not a legal or clinical determination")));

        // Pages 1 and 2 render.
        QProcess render;
        render.start(pdftoppm, {QStringLiteral("-png"), QStringLiteral("-r"), QStringLiteral("40"), QStringLiteral("-f"),
                                QStringLiteral("1"), QStringLiteral("-l"), QStringLiteral("2"), pdf, dir.filePath("page")});
        QVERIFY(render.waitForFinished(60000));
        QCOMPARE(render.exitCode(), 0);
        const QStringList pngs = QDir(dir.path()).entryList({QStringLiteral("page*.png")});
        QCOMPARE(pngs.size(), 2);
        for (const QString& png : pngs) QVERIFY(!QImage(dir.filePath(png)).isNull());
    }
};

QTEST_MAIN(MainWindowTest)
#include "main_window_test.moc"
