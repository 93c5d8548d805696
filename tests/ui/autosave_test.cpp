// tests/ui/autosave_test.cpp <-> ui/autosave.h (and the workbench's recovery path in
// ui/main_window.h): the recovery file's format, when it is written and removed, and a
// simulated crash followed by a restore.
#include "core/audit/project_file.h"  // core before Qt

#include <QFile>
#include <QFileInfo>
#include <QSettings>
#include <QSignalSpy>
#include <QTemporaryDir>
#include <QtTest>

#include "ui/autosave.h"
#include "ui/demo.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"
#include "ui/main_window.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

QByteArray slurp(const QString& path) {
    QFile f(path);
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

const QString kNote = QStringLiteral("Promotion is pushed in weak weeks <b>not bold</b>, \"quoted\"; \u05e9\u05dc\u05d5\u05dd");

// The retail trend audit in `w`, with a decision and a note on the top finding; returns its row.
int reviewed_trend_audit(MainWindow& w) {
    const QString err = prepare_slope_demo(w, 120000);
    if (!err.isEmpty()) qWarning("%s", qPrintable(err));
    const int row = w.findings_page()->selected();
    if (row >= 0) w.findings_model()->set_decision(row, Decision::FollowUp, kNote);
    return row;
}

}  // namespace

class AutosaveTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName("FoldlineTest");
        QCoreApplication::setApplicationName("FoldlineAutosaveTest");
        QSettings().clear();
    }

    void recovery_file_round_trips_and_bad_files_are_named() {
        QTemporaryDir dir;
        project::Project p;
        p.data.path = dir.filePath("weeks.csv").toStdString();
        p.question.kind = project::QuestionKind::Slope;
        p.question.outcome = "sales";
        p.question.exposure = "promo";
        auto& r = p.review_for(project::slope_key({"store"}, "promo", "sales"));
        r.decision = Decision::Upheld;
        r.note = kNote.toStdString();
        const QString file = dir.filePath("a.foldline-recovery");
        const QDateTime when = QDateTime::fromString("2026-03-04T05:06:07.089Z", Qt::ISODateWithMs);
        const std::string text = recovery_text(p, {}, file, when);
        QFile f(file);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write(text.data(), qint64(text.size()));
        f.close();
        auto back = read_recovery(file);
        QVERIFY2(back.ok(), back.ok() ? "" : back.error().to_string().c_str());
        QVERIFY(back->project_file.isEmpty());
        QCOMPARE(back->written, when);
        // The project inside is the same document a project file holds.
        QCOMPARE(project::project_to_json_text(back->project, file.toStdString()),
                 project::project_to_json_text(p, file.toStdString()));
        QCOMPARE(QString::fromStdString(back->project.data.path), QFileInfo(dir.filePath("weeks.csv")).absoluteFilePath());

        QFile bad(dir.filePath("b.foldline-recovery"));
        QVERIFY(bad.open(QIODevice::WriteOnly));
        bad.write(R"({"format": "foldline-project", "version": 1})");
        bad.close();
        auto refused = read_recovery(bad.fileName());
        QVERIFY(!refused.ok());
        QVERIFY(QString::fromStdString(refused.error().to_string()).contains("b.foldline-recovery"));
        QVERIFY(!read_recovery(dir.filePath("absent")).ok());
    }

    void a_copy_older_than_its_saved_project_is_not_offered() {
        QTemporaryDir dir;
        project::Project p;
        p.question.outcome = "sales";
        p.question.exposure = "promo";
        const QString audit = dir.filePath("audit.foldline");
        QVERIFY(project::save_project(p, audit.toStdString()).ok());
        const QString copy = dir.filePath("recovery/audit-1-1.foldline-recovery");
        QVERIFY(QDir().mkpath(dir.filePath("recovery")));
        const std::string text = recovery_text(p, audit, audit, QDateTime::currentDateTimeUtc());
        QFile f(copy);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write(text.data(), qint64(text.size()));
        f.close();
        // Newer than the project: offered.
        {
            QFile touch(copy);
            QVERIFY(touch.open(QIODevice::ReadWrite));
            QVERIFY(touch.setFileTime(QDateTime::currentDateTime().addSecs(60), QFileDevice::FileModificationTime));
        }
        QVERIFY(find_recovery(dir.filePath("recovery")).has_value());
        // The project saved after the copy: the copy is stale and removed.
        {
            QFile touch(copy);
            QVERIFY(touch.open(QIODevice::ReadWrite));
            QVERIFY(touch.setFileTime(QDateTime::currentDateTime().addSecs(-600), QFileDevice::FileModificationTime));
        }
        QVERIFY(!find_recovery(dir.filePath("recovery")).has_value());
        QVERIFY(!QFile::exists(copy));
        QCOMPARE(slurp(audit).isEmpty(), false);
    }

    void autosave_writes_the_recovery_file_after_a_change_and_never_the_project() {
        QTemporaryDir dir;
        MainWindow w;
        w.autosave()->set_folder(dir.filePath("recovery"));
        w.autosave()->set_interval(200);
        const int row = reviewed_trend_audit(w);
        QVERIFY(row >= 0);
        const QString audit = dir.filePath("retail.foldline");
        const Status saved = w.save_project_to(audit);
        QVERIFY2(saved.ok(), saved.ok() ? "" : saved.error().to_string().c_str());
        QVERIFY(!QFile::exists(w.autosave()->path()));  // a clean save leaves nothing to recover
        const QByteArray before = slurp(audit);
        // Nothing changed since the save: nothing is written.
        QTest::qWait(3 * w.autosave()->interval());
        QVERIFY(!QFile::exists(w.autosave()->path()));

        // Two edits in quick succession make one write.
        QSignalSpy written(w.autosave(), &Autosave::written);
        w.findings_model()->set_decision(row, Decision::SetAside, kNote);
        w.findings_model()->set_decision(row, Decision::Upheld, kNote + QStringLiteral(" (second look)"));
        QVERIFY(w.autosave()->pending());
        QTRY_VERIFY_WITH_TIMEOUT(QFile::exists(w.autosave()->path()), 5000);
        QTest::qWait(3 * w.autosave()->interval());
        QCOMPARE(written.count(), 1);
        QVERIFY(!w.autosave()->pending());
        QCOMPARE(slurp(audit), before);  // the user's project file is never written by autosave
        auto copy = read_recovery(w.autosave()->path());
        QVERIFY2(copy.ok(), copy.ok() ? "" : copy.error().to_string().c_str());
        QCOMPARE(copy->project_file, audit);
        const FindingView* f = w.findings_model()->at(row);
        std::vector<std::string> strata;
        for (const QString& s : f->strata) strata.push_back(s.toStdString());
        const auto* r = copy->project.review(project::slope_key(strata, "promo_spend", "weekly_sales"));
        QVERIFY(r);
        QCOMPARE(r->decision, Decision::Upheld);
        QCOMPARE(QString::fromStdString(r->note), kNote + QStringLiteral(" (second look)"));
        QCOMPARE(copy->project.question.kind, project::QuestionKind::Slope);
        // No other file appeared beside the project (the write went through QSaveFile).
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files).size(), 1);
    }

    void a_crash_leaves_the_copy_and_the_next_start_restores_it() {
        QTemporaryDir dir;
        const QString folder = dir.filePath("recovery");
        QStringList strata;
        QString recovery;
        {
            MainWindow crashed;
            crashed.autosave()->set_folder(folder);
            const int row = reviewed_trend_audit(crashed);
            QVERIFY(row >= 0);
            strata = crashed.findings_model()->at(row)->strata;
            QVERIFY(crashed.autosave()->write_now());
            recovery = crashed.autosave()->path();
            QVERIFY(QFile::exists(recovery));
        }  // destroyed without a close event: what a crash leaves behind
        QVERIFY(QFile::exists(recovery));

        MainWindow again;
        again.autosave()->set_folder(folder);
        int asked = 0;
        RecoveryOffer seen;
        again.set_recovery_prompt([&](const RecoveryOffer& o) {
            ++asked;
            seen = o;
            return RecoveryChoice::Restore;
        });
        const auto choice = again.check_recovery();
        QVERIFY(choice.has_value());
        QCOMPARE(*choice, RecoveryChoice::Restore);
        QCOMPARE(asked, 1);
        QCOMPARE(seen.path, recovery);
        QVERIFY(seen.project_file.isEmpty());
        // The copy became the new session's own recovery file (a crash while restoring loses
        // nothing).
        QVERIFY(!QFile::exists(recovery));
        QVERIFY(QFile::exists(again.autosave()->path()));
        auto restored = [&] {
            for (const FindingView& g : again.findings_model()->findings())
                if (g.strata == strata) return g.decision == Decision::FollowUp && g.note == kNote;
            return false;
        };
        QTRY_VERIFY_WITH_TIMEOUT(restored(), 120000);
        QVERIFY(again.question_page() != nullptr);
        // Nothing left to offer a third window.
        MainWindow third;
        third.autosave()->set_folder(folder);
        third.set_recovery_prompt([](const RecoveryOffer&) { return RecoveryChoice::Restore; });
        // The second window holds the adopted copy: a third one does not offer it.
        QVERIFY(!third.check_recovery().has_value());
        QVERIFY(QFile::exists(again.autosave()->path()));
        // A restored copy holds changes never saved: closing asks, and discarding removes it.
        QVERIFY(again.unsaved());
        int close_asked = 0;
        again.set_close_prompt([&] {
            ++close_asked;
            return MainWindow::CloseChoice::Discard;
        });
        QVERIFY(again.close());
        QCOMPARE(close_asked, 1);
        QVERIFY(!QFile::exists(again.autosave()->path()));
    }

    void later_keeps_the_copy_and_discard_removes_it() {
        QTemporaryDir dir;
        const QString folder = dir.filePath("recovery");
        QVERIFY(QDir().mkpath(folder));
        project::Project p;
        p.question.outcome = "sales";
        p.question.exposure = "promo";
        const QString copy = QDir(folder).filePath("audit-2-2.foldline-recovery");
        const std::string text = recovery_text(p, {}, copy, QDateTime::currentDateTimeUtc());
        QFile f(copy);
        QVERIFY(f.open(QIODevice::WriteOnly));
        f.write(text.data(), qint64(text.size()));
        f.close();
        MainWindow w;
        w.autosave()->set_folder(folder);
        w.set_recovery_prompt([](const RecoveryOffer&) { return RecoveryChoice::Later; });
        QCOMPARE(w.check_recovery().value(), RecoveryChoice::Later);
        QVERIFY(QFile::exists(copy));
        w.set_recovery_prompt([](const RecoveryOffer&) { return RecoveryChoice::Discard; });
        QCOMPARE(w.check_recovery().value(), RecoveryChoice::Discard);
        QVERIFY(!QFile::exists(copy));
        QVERIFY(!w.check_recovery().has_value());
    }

    void a_failed_write_is_reported_and_stays_pending() {
        // A regular file where the folder should be: the folder cannot be made.
        QTemporaryDir dir;
        QFile blocker(dir.filePath("not_a_folder"));
        QVERIFY(blocker.open(QIODevice::WriteOnly));
        blocker.close();
        project::Project p;
        p.question.outcome = "sales";
        p.question.exposure = "promo";
        Autosave a([p] { return std::optional<project::Project>(p); });
        a.set_folder(dir.filePath("not_a_folder/recovery"));
        QSignalSpy failed(&a, &Autosave::failed);
        a.mark_changed();
        QVERIFY(!a.write_now());
        QCOMPARE(failed.count(), 1);
        QVERIFY(a.last_error().contains("not_a_folder"));
        QVERIFY(a.pending());  // the change is not forgotten: the next write tries again
        a.set_folder(dir.filePath("recovery"));
        QVERIFY(a.write_now());
        QVERIFY(QFile::exists(a.path()));
        a.discard();
        QVERIFY(!QFile::exists(a.path()));
    }

    // Closing never discards unsaved work without asking: Cancel keeps the window and the
    // recovery copy; Save writes the audit file (Ctrl+S saves to it again without asking);
    // only then, or on Discard, the copy goes.
    void closing_with_unsaved_work_asks_first() {
        QTemporaryDir dir;
        MainWindow w;
        w.autosave()->set_folder(dir.filePath("recovery"));
        w.show();
        QVERIFY(reviewed_trend_audit(w) >= 0);
        QVERIFY(w.unsaved());
        QVERIFY(w.windowTitle().contains(QStringLiteral("[*]")));
        QVERIFY(w.isWindowModified());
        QVERIFY(w.autosave()->write_now());
        QVERIFY(QFile::exists(w.autosave()->path()));
        MainWindow::CloseChoice answer = MainWindow::CloseChoice::Cancel;
        int asked = 0;
        w.set_close_prompt([&] {
            ++asked;
            return answer;
        });
        QVERIFY(!w.close());  // Cancel: the audit stays open, the copy stays on disk
        QCOMPARE(asked, 1);
        QVERIFY(w.isVisible());
        QVERIFY(QFile::exists(w.autosave()->path()));
        // Save to a file, then close without being asked again.
        const QString audit = dir.filePath("reviewed.foldline");
        QVERIFY(w.save_project_to(audit).ok());
        QVERIFY(!w.unsaved());
        QVERIFY(!w.isWindowModified());
        QVERIFY(w.windowTitle().contains(QStringLiteral("reviewed.foldline")));
        QCOMPARE(w.recent_audits().value(0), QFileInfo(audit).absoluteFilePath());  // in Open recent
        QVERIFY(!QFile::exists(w.autosave()->path()));
        // A decision changed after the save makes it unsaved again; Ctrl+S writes the same file.
        const int row = w.findings_page()->selected();
        QVERIFY(row >= 0);
        w.findings_page()->decide(Decision::SetAside);
        QVERIFY(w.unsaved());
        QVERIFY(w.save_project_now());
        QVERIFY(!w.unsaved());
        auto saved = project::load_project(audit.toStdString());
        QVERIFY(saved.ok());
        bool set_aside = false;
        for (const auto& r : saved->reviews) set_aside = set_aside || r.decision == Decision::SetAside;
        QVERIFY(set_aside);
        QVERIFY(w.close());
        QCOMPARE(asked, 1);
        QVERIFY(!w.autosave()->pending());
    }

    void discarding_on_close_removes_the_recovery_file() {
        QTemporaryDir dir;
        MainWindow w;
        w.autosave()->set_folder(dir.filePath("recovery"));
        w.show();
        QVERIFY(reviewed_trend_audit(w) >= 0);
        QVERIFY(w.autosave()->write_now());
        QVERIFY(QFile::exists(w.autosave()->path()));
        w.set_close_prompt([] { return MainWindow::CloseChoice::Discard; });
        QVERIFY(w.close());
        QVERIFY(!QFile::exists(w.autosave()->path()));
        QVERIFY(!w.autosave()->pending());
    }
};

QTEST_MAIN(AutosaveTest)
#include "autosave_test.moc"
