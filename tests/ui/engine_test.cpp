// tests/ui/engine_test.cpp <-> ui/engine.h: one audit, one truth. A saved audit with settings off
// every default (a seed above 2^32, a level limit of 7, 6 bins, alpha 0.5, a diagram whose verdict
// on one finding points to another set) is opened in the workbench and re-run by `foldline run`;
// the JSON documents and the memos' text must be identical, because both front ends call the one
// audit service in core/audit.
#include "core/audit/project_file.h"  // core before Qt (see DEVELOPERS.md)
#include "core/io/csv_reader.h"
#include "core/report/scan_json.h"

#include <QProcess>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QtTest>

#include <nlohmann/json.hpp>

#include "ui/demo.h"
#include "ui/engine.h"
#include "ui/findings_model.h"
#include "ui/main_window.h"
#include "ui/question_page.h"
#include "ui/scan_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

constexpr std::uint64_t kSeed = 5000000011ull;  // above 2^32

QString pdf_text(const QString& pdftotext, const QString& pdf) {
    QProcess p;
    p.start(pdftotext, {pdf, QStringLiteral("-")});
    if (!p.waitForFinished(60000) || p.exitCode() != 0) return {};
    return QString::fromUtf8(p.readAllStandardOutput());
}

}  // namespace

class EngineTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName("FoldlineTest");
        QCoreApplication::setApplicationName("FoldlineEngineTest");
        // Both memos carry the same date (core/audit today() honours SOURCE_DATE_EPOCH).
        qputenv("SOURCE_DATE_EPOCH", "1764806400");
    }

    // The Question step's settings map to the audit's specification and back without loss.
    void question_settings_round_trip() {
        project::AuditSpec base;
        base.trend = project::TrendSettings{"x", "y", {}};
        base.scan.bootstrap = 77;
        ui::QuestionSpec q;
        q.slope = true;
        q.outcome = "sales";
        q.exposure = "spend";
        q.candidates = {"region", "size", "footfall"};
        q.covariates = {"footfall"};
        q.bins = 6;
        q.max_levels = 7;
        q.alpha = 0.5;
        q.bootstrap = 30;
        q.seed = kSeed;
        q.find_groups = true;
        q.rows = "  year>=2024 AND \"job grade\" is missing ";
        const project::AuditSpec s = audit_spec(q, base);
        QCOMPARE(s.question.rows, std::string("year >= 2024 and \"job grade\" is missing"));  // its normal form
        QCOMPARE(s.scan.seed, kSeed);
        QCOMPARE(s.scan.max_levels, std::uint64_t(7));
        QCOMPARE(s.scan.slope_bootstrap, 30);
        QCOMPARE(s.scan.bootstrap, 77);  // the other kind's count is the base's
        QVERIFY(s.trend.has_value());    // what the workbench does not edit survives
        QVERIFY(s.scan.find_groups);
        QCOMPARE(s.scan.strata, (std::vector<std::string>{"region", "size"}));  // a covariate never stratifies
        const ui::QuestionSpec back = question_spec(s);
        QCOMPARE(back.seed, kSeed);
        QCOMPARE(back.max_levels, std::uint64_t(7));
        QCOMPARE(back.bins, 6);
        QCOMPARE(back.alpha, 0.5);
        QCOMPARE(back.bootstrap, 30);
        QVERIFY(back.find_groups);
        QCOMPARE(back.rows, QStringLiteral("year >= 2024 and \"job grade\" is missing"));
        QVERIFY(!back.all_candidates);
        // "auto" stays auto.
        q.all_candidates = true;
        QVERIFY(audit_spec(q, base).scan.strata.empty());
        QVERIFY(question_spec(audit_spec(q, base)).all_candidates);
    }

    void workbench_and_run_agree_on_json_and_memo() {
        const QString sample = find_sample("clinic_audit.foldline");
        if (sample.isEmpty()) QSKIP("sample_data/clinic_audit.foldline not found");
        const QString pdftotext = QStandardPaths::findExecutable("pdftotext");
        if (pdftotext.isEmpty()) QSKIP("poppler-utils (pdftotext) not installed");
        auto loaded = project::load_project(sample.toStdString());
        QVERIFY(loaded.ok());
        project::Project p = std::move(*loaded);
        p.scan.seed = kSeed;
        p.scan.max_levels = 7;
        p.scan.bins = 6;
        p.scan.alpha = 0.5;
        p.scan.bootstrap = 40;  // enough resamples to make the seed matter, few enough to be quick
        p.question.rows = "site <> 'Weyford' or age_band is missing";  // a rows filter (version 3)
        auto table = read_csv(p.data.path, project::reading_options(p.data));
        QVERIFY(table.ok());
        QVERIFY(project::record_data(p.data, *table).ok());
        QTemporaryDir dir;
        const QString path = dir.filePath(QStringLiteral("clinic settings.foldline"));
        QVERIFY(project::save_project(p, path.toStdString()).ok());

        // foldline run, as a scheduled re-audit would call it.
        QProcess run;
        run.start(QStringLiteral(FOLDLINE_CLI),
                  {QStringLiteral("run"), path, QStringLiteral("--json"), dir.filePath("run.json"), QStringLiteral("--memo"),
                   dir.filePath("run.pdf")});
        QVERIFY(run.waitForFinished(300000));
        QVERIFY2(run.exitCode() == 0 || run.exitCode() == 4, run.readAllStandardError().constData());
        QFile json_file(dir.filePath("run.json"));
        QVERIFY(json_file.open(QIODevice::ReadOnly));
        const auto from_run = nlohmann::json::parse(json_file.readAll().toStdString());

        // The workbench opens the same file and re-runs it.
        MainWindow w;
        QVERIFY(w.open_project(path).ok());
        QTRY_VERIFY_WITH_TIMEOUT(w.scan_page()->scan_result() && !w.scan_page()->running() &&
                                     w.findings_model()->size() > 0,
                                 300000);
        QTest::qWait(200);  // the restore finishes on the event loop after the scan
        const ui::QuestionSpec q = w.question_page()->spec();
        QCOMPARE(q.seed, kSeed);
        QCOMPARE(q.max_levels, std::uint64_t(7));
        QCOMPARE(q.bins, 6);
        QCOMPARE(q.alpha, 0.5);
        QCOMPARE(q.rows, QStringLiteral("site <> 'Weyford' or age_band is missing"));
        const auto result = w.scan_page()->scan_result();
        QCOMPARE(result->rows_filter, std::string("site <> 'Weyford' or age_band is missing"));
        QCOMPARE(from_run["question"]["rows"].get<std::string>(), result->rows_filter);
        QVERIFY(w.scan_page()->scanned_table()->rows < std::size_t(8000));
        QCOMPARE(double(w.scan_page()->scanned_table()->rows), from_run["data"]["rows_kept"].get<double>());
        const DataInfo info{p.data.path, from_run["data"]["sha256"].get<std::string>(),
                            from_run["data"]["rows"].get<double>()};
        const auto from_workbench = nlohmann::json::parse(scan_json_text(*result, info));
        QCOMPARE(from_workbench["settings"].dump(), from_run["settings"].dump());
        QCOMPARE(from_workbench["summary"].dump(), from_run["summary"].dump());
        QCOMPARE(from_workbench["findings"].size(), from_run["findings"].size());
        for (std::size_t i = 0; i < from_run["findings"].size(); ++i)
            QVERIFY2(from_workbench["findings"][i] == from_run["findings"][i],
                     qPrintable(QString::fromStdString(from_run["findings"][i]["strata"].dump())));
        QVERIFY(from_workbench == from_run);
        // The verdict that points to another set carries its estimate, computed with 6 bins.
        bool other_set = false;
        for (const auto& f : from_run["findings"])
            if (f["verdict"].is_object() && f["verdict"]["answer"] == "other_set")
                other_set = other_set || f["verdict"]["adjusted_estimate"].is_object();
        QVERIFY(other_set);

        // The memos: the same words, figures and verdicts.
        QVERIFY(w.export_memo_to(dir.filePath("workbench.pdf")).ok());
        const QString a = pdf_text(pdftotext, dir.filePath("run.pdf"));
        const QString b = pdf_text(pdftotext, dir.filePath("workbench.pdf"));
        QVERIFY(!a.isEmpty());
        QVERIFY(a.contains(QStringLiteral("not a legal or clinical determination")));
        if (a != b) {
            const QStringList la = a.split(QLatin1Char('\n')), lb = b.split(QLatin1Char('\n'));
            for (int i = 0; i < std::min(la.size(), lb.size()); ++i)
                if (la[i] != lb[i]) QFAIL(qPrintable(QStringLiteral("line %1:\n run: %2\n workbench: %3").arg(i + 1).arg(la[i], lb[i])));
            QFAIL("the memos differ in length");
        }
    }

    // Groups formed by two columns (treatment+sex): the workbench opens the audit, shows the
    // combination on the Question step, scans it and judges it with the diagram drawn with both
    // parts read as one node, and the JSON equals `foldline run`'s on the same file.
    void workbench_and_run_agree_on_combined_groups() {
        const QString sample = find_sample("clinic_audit.foldline");
        if (sample.isEmpty()) QSKIP("sample_data/clinic_audit.foldline not found");
        auto loaded = project::load_project(sample.toStdString());
        QVERIFY(loaded.ok());
        project::Project p = std::move(*loaded);
        p.question.exposure = "treatment+sex";
        p.question.focal = {"new_protocol+female"};
        p.question.reference = "standard+female";
        p.question.rows = "age_band <> '75+'";
        p.scan.seed = kSeed;
        p.scan.bootstrap = 40;
        p.reviews.clear();
        auto table = read_csv(p.data.path, project::reading_options(p.data));
        QVERIFY(table.ok());
        QVERIFY(project::record_data(p.data, *table).ok());
        QTemporaryDir dir;
        const QString path = dir.filePath(QStringLiteral("clinic combined.foldline"));
        QVERIFY(project::save_project(p, path.toStdString()).ok());
        const QByteArray saved = [&] {
            QFile f(path);
            return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
        }();

        QProcess run;
        run.start(QStringLiteral(FOLDLINE_CLI), {QStringLiteral("run"), path, QStringLiteral("--json"), dir.filePath("run.json")});
        QVERIFY(run.waitForFinished(300000));
        QVERIFY2(run.exitCode() == 0 || run.exitCode() == 4, run.readAllStandardError().constData());
        QFile json_file(dir.filePath("run.json"));
        QVERIFY(json_file.open(QIODevice::ReadOnly));
        const auto from_run = nlohmann::json::parse(json_file.readAll().toStdString());
        QCOMPARE(from_run["question"]["exposure"].get<std::string>(), std::string("treatment+sex"));

        MainWindow w;
        QVERIFY(w.open_project(path).ok());
        QTRY_VERIFY_WITH_TIMEOUT(w.scan_page()->scan_result() && !w.scan_page()->running() &&
                                     w.findings_model()->size() > 0,
                                 300000);
        QTest::qWait(200);
        const ui::QuestionSpec q = w.question_page()->spec();
        QCOMPARE(q.exposure, QStringLiteral("treatment+sex"));
        QCOMPARE(q.focal, QStringLiteral("new_protocol+female"));
        QCOMPARE(q.reference, QStringLiteral("standard+female"));
        QCOMPARE(w.question_page()->combined_with(), QStringList{QStringLiteral("sex")});
        const auto result = w.scan_page()->scan_result();
        // The scanned rows carry the combined column the verdicts and the memo read.
        QVERIFY(w.scan_page()->scanned_table()->column("treatment+sex"));
        const DataInfo info{p.data.path, from_run["data"]["sha256"].get<std::string>(),
                            from_run["data"]["rows"].get<double>()};
        const auto from_workbench = nlohmann::json::parse(scan_json_text(*result, info));
        QCOMPARE(from_workbench["question"].dump(), from_run["question"].dump());
        QCOMPARE(from_workbench["summary"].dump(), from_run["summary"].dump());
        QCOMPARE(from_workbench["findings"].size(), from_run["findings"].size());
        for (std::size_t i = 0; i < from_run["findings"].size(); ++i)
            QVERIFY2(from_workbench["findings"][i] == from_run["findings"][i],
                     qPrintable(QString::fromStdString(from_run["findings"][i]["strata"].dump())));
        QVERIFY(from_workbench == from_run);
        // The diagram drawn with treatment and sex judged the combined groups as one node: every
        // finding has a verdict, and neither part is offered as a stratifier.
        QVERIFY(!from_run["findings"].empty());
        for (const auto& f : from_run["findings"]) {
            QVERIFY2(f["verdict"].is_object(), f.dump().c_str());
            for (const auto& s : f["strata"]) QVERIFY(s != "treatment" && s != "sex");
        }
        // Opening and scanning changed nothing in the file.
        QFile f(path);
        QVERIFY(f.open(QIODevice::ReadOnly));
        QCOMPARE(f.readAll(), saved);
    }
};

QTEST_MAIN(EngineTest)
#include "engine_test.moc"
