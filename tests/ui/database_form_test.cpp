// tests/ui/database_form_test.cpp <-> ui/database_form.h (and the Source step's database path,
// ui/source_page.h). Without a database server: the form's checks, what it remembers (never a
// password), and a request through the page to a data source unixODBC does not know, which
// must end in the driver manager's own error (SQLSTATE IM002, "data source name not found",
// from the ODBC specification's SQLDriverConnect diagnostics [from memory]). The counting itself
// is checked against a PostgreSQL server by tests/reference/sql_pushdown_test.py.
#include "ui/database_form.h"

#include <QComboBox>
#include <QElapsedTimer>
#include <QLineEdit>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QSettings>
#include <QSignalSpy>
#include <QtTest>

#include "ui/source_page.h"

using namespace foldline;

class DatabaseFormTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName(QStringLiteral("foldline-test"));
        QCoreApplication::setApplicationName(QStringLiteral("database-form-test"));
        QSettings().clear();
    }

    void refuses_what_cannot_be_sent() {
        if (!ui::database_available()) QSKIP("this build has no database support");
        ui::DatabaseForm f;
        QSignalSpy spy(&f, &ui::DatabaseForm::count_requested);
        // No connection and no table.
        f.connection_field()->clear();
        f.table_field()->clear();
        f.submit();
        QCOMPARE(spy.count(), 0);
        QVERIFY(f.problems().contains(QStringLiteral("connection string")));
        QVERIFY(f.problems().contains(QStringLiteral("either a table or a query")));
        // A password written into the connection string is refused, not stored.
        f.connection_field()->setText(QStringLiteral("DSN=warehouse;Uid=reader;PWD=hunter2;"));
        f.table_field()->setText(QStringLiteral("decisions"));
        f.submit();
        QCOMPARE(spy.count(), 0);
        QVERIFY(f.problems().contains(QStringLiteral("password")));
        // A query that is not one read-only statement names the problem.
        f.connection_field()->setText(QStringLiteral("DSN=warehouse;Uid=reader;"));
        f.kind_field()->setCurrentIndex(1);
        f.query_field()->setPlainText(QStringLiteral("SELECT * FROM decisions; DROP TABLE decisions"));
        f.submit();
        QCOMPARE(spy.count(), 0);
        QVERIFY(f.problems().contains(QStringLiteral("';'")));
        // An environment variable that is not set.
        f.query_field()->setPlainText(QStringLiteral("SELECT * FROM decisions WHERE year = 2025"));
        f.password_env_field()->setText(QStringLiteral("FOLDLINE_TEST_UNSET_VARIABLE"));
        f.submit();
        QCOMPARE(spy.count(), 0);
        QVERIFY(f.problems().contains(QStringLiteral("FOLDLINE_TEST_UNSET_VARIABLE")));
    }

    void sends_the_password_once_and_never_saves_it() {
        if (!ui::database_available()) QSKIP("this build has no database support");
        ui::DatabaseForm f;
        QSignalSpy spy(&f, &ui::DatabaseForm::count_requested);
        f.connection_field()->setText(QStringLiteral("DSN=warehouse;Uid=reader;"));
        f.password_field()->setText(QStringLiteral("s3cr;et}"));
        f.password_env_field()->clear();
        f.kind_field()->setCurrentIndex(0);
        f.table_field()->setText(QStringLiteral("audit.decisions"));
        f.submit();
        QCOMPARE(spy.count(), 1);
        const auto r = spy.at(0).at(0).value<ui::DatabaseRequest>();
        QCOMPARE(r.password, QStringLiteral("s3cr;et}"));
        QCOMPARE(r.table, QStringLiteral("audit.decisions"));
        QVERIFY(r.query.isEmpty());
        QVERIFY(f.password_field()->text().isEmpty());  // cleared after use
        QSettings settings;
        for (const QString& key : settings.allKeys())
            QVERIFY2(!settings.value(key).toString().contains(QStringLiteral("s3cr")), qPrintable(key));
        // A new form starts from what was remembered, without the password.
        ui::DatabaseForm again;
        QCOMPARE(again.connection_field()->text(), QStringLiteral("DSN=warehouse;Uid=reader;"));
        QCOMPARE(again.table_field()->text(), QStringLiteral("audit.decisions"));
        QVERIFY(again.password_field()->text().isEmpty());
        QCOMPARE(again.password_field()->echoMode(), QLineEdit::Password);
    }

    void unknown_data_source_gives_the_driver_managers_error() {
        if (!ui::database_available()) QSKIP("this build has no database support");
        ui::SourcePage page;
        ui::DatabaseRequest r;
        r.connection = QStringLiteral("DSN=foldline_no_such_source;");
        r.password = QStringLiteral("typed-secret");
        r.table = QStringLiteral("decisions");
        page.count_in_database(r);
        QVERIFY(page.loading());
        QVERIFY(!page.database_form()->count_button()->isEnabled());  // busy while the query runs
        QTRY_VERIFY_WITH_TIMEOUT(!page.loading(), 20000);
        const QString msg = page.message();
        QVERIFY2(msg.contains(QStringLiteral("cannot connect")) && msg.contains(QStringLiteral("IM002")), qPrintable(msg));
        QVERIFY2(!msg.contains(QStringLiteral("typed-secret")), qPrintable(msg));
        QVERIFY(!page.table());
        QVERIFY(!page.database_record());
        QVERIFY(page.database_form()->count_button()->isEnabled());
    }

    // Against a real server when the PostgreSQL reference test runs this suite with
    // FOLDLINE_TEST_ODBC (a connection string without the password) and FOLDLINE_TEST_ODBC_PASSWORD_VAR
    // (the name of the variable holding it): a table loads as its counted cells with the
    // source recorded, and Cancel during a slow query ends it in the engine with nothing loaded.
    void counts_a_table_and_cancels_a_slow_query() {
        const QString conn = qEnvironmentVariable("FOLDLINE_TEST_ODBC");
        if (conn.isEmpty() || !ui::database_available()) QSKIP("no test database (run by sql_pushdown_reference)");
        ui::SourcePage page;
        ui::DatabaseRequest r;
        r.connection = conn;
        r.password_env = qEnvironmentVariable("FOLDLINE_TEST_ODBC_PASSWORD_VAR");
        r.table = QStringLiteral("clinic");
        page.count_in_database(r);
        QTRY_VERIFY_WITH_TIMEOUT(!page.loading(), 60000);
        QVERIFY2(page.table(), qPrintable(page.message()));
        QVERIFY(page.table()->weighted());
        QCOMPARE(page.table()->total_weight(), 8000.0);  // the clinic sample's rows
        QVERIFY(page.database_record());
        QCOMPARE(QString::fromStdString(page.database_record()->table), QStringLiteral("clinic"));
        QVERIFY(QString::fromStdString(page.database_record()->queried_at).endsWith(QLatin1Char('Z')));

        r.table.clear();
        r.query = QStringLiteral("SELECT s.* FROM clinic s, (SELECT pg_sleep(30)) AS pause");
        QElapsedTimer clock;
        clock.start();
        page.count_in_database(r);
        QTest::qWait(1500);
        QVERIFY(page.loading());
        page.cancel_load();
        QTRY_VERIFY_WITH_TIMEOUT(!page.loading(), 10000);
        QVERIFY2(clock.elapsed() < 8000, "the cancel did not end the query promptly");
        QVERIFY2(page.message().contains(QStringLiteral("cancelled")), qPrintable(page.message()));
        QVERIFY(!page.table() || page.table()->total_weight() == 8000.0);  // the earlier table stays; nothing half-loaded
    }
};

QTEST_MAIN(DatabaseFormTest)
#include "database_form_test.moc"
