// tests/ui/recovery_dialog_test.cpp <-> ui/recovery_dialog.h: the offer names what the copy holds
// (literally, never as markup) and every answer is reachable from the keyboard.
#include "core/audit/project_file.h"  // core before Qt

#include <QApplication>
#include <QDir>
#include <QLabel>
#include <QPushButton>
#include <QtTest>

#include "ui/recovery_dialog.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

RecoveryOffer sample_offer() {
    RecoveryOffer o;
    o.path = QStringLiteral("/tmp/audit-1-1.foldline-recovery");
    o.project_file = QStringLiteral("/home/analyst/audits/retail_audit.foldline");
    o.written = QDateTime::fromString(QStringLiteral("2026-03-04T05:06:07Z"), Qt::ISODate);
    o.project.data.path = "/home/analyst/data/retail_weeks.csv";
    o.project.question.kind = project::QuestionKind::Slope;
    o.project.question.outcome = "weekly_sales";
    o.project.question.exposure = "<b>promo_spend</b>";
    auto& r = o.project.review_for(project::slope_key({"store_format"}, "<b>promo_spend</b>", "weekly_sales"));
    r.decision = Decision::Upheld;
    r.note = "checked";
    o.project.review_for(project::slope_key({"region"}, "<b>promo_spend</b>", "weekly_sales")).note = "ask";
    return o;
}

}  // namespace

class RecoveryDialogTest : public QObject {
    Q_OBJECT
private slots:
    void summary_names_the_copy_literally() {
        RecoveryDialog d(sample_offer());
        QVERIFY(d.summary().contains("retail_audit.foldline"));
        QVERIFY(d.summary().contains("trend of weekly_sales on <b>promo_spend</b>"));
        QVERIFY(d.summary().contains("1 decision"));
        QVERIFY(d.summary().contains("2 notes"));
        bool literal = false;
        for (QLabel* l : d.findChildren<QLabel*>())
            if (l->text() == d.summary()) literal = l->textFormat() == Qt::PlainText;
        QVERIFY(literal);
        QCOMPARE(d.choice(), RecoveryChoice::Later);
        QVERIFY(d.button(RecoveryChoice::Restore)->isDefault());
    }

    void every_answer_is_reachable_from_the_keyboard() {
        {
            RecoveryDialog d(sample_offer());
            d.show();
            d.activateWindow();
            QVERIFY(QTest::qWaitForWindowActive(&d));
            QTest::keyClick(&d, Qt::Key_Return);
            QCOMPARE(d.choice(), RecoveryChoice::Restore);
            QCOMPARE(d.result(), int(QDialog::Accepted));
        }
        {
            RecoveryDialog d(sample_offer());
            d.show();
            d.activateWindow();
            QVERIFY(QTest::qWaitForWindowActive(&d));
            QTest::keyClick(QApplication::focusWidget(), Qt::Key_D, Qt::AltModifier);
            QTRY_COMPARE(d.choice(), RecoveryChoice::Discard);  // a mnemonic animates the click first
        }
        {
            RecoveryDialog d(sample_offer());
            d.show();
            d.activateWindow();
            QVERIFY(QTest::qWaitForWindowActive(&d));
            QTest::keyClick(&d, Qt::Key_Escape);
            QCOMPARE(d.choice(), RecoveryChoice::Later);
            QVERIFY(!d.isVisible());
        }
        {
            RecoveryDialog d(sample_offer());
            d.show();
            d.activateWindow();
            QVERIFY(QTest::qWaitForWindowActive(&d));
            d.button(RecoveryChoice::Restore)->setFocus();
            QTest::keyClick(QApplication::focusWidget(), Qt::Key_L, Qt::AltModifier);
            QTRY_VERIFY(!d.isVisible());
            QCOMPARE(d.choice(), RecoveryChoice::Later);
            QCOMPARE(d.result(), int(QDialog::Rejected));
        }
    }

    void renders_offscreen() {
        RecoveryDialog d(sample_offer());
        d.show();
        QVERIFY(QTest::qWaitForWindowExposed(&d));
        const QImage img = d.grab().toImage();
        QVERIFY(img.width() >= 460 && img.height() > 100);
        // FOLDLINE_SCREENSHOT_DIR=DIR keeps the picture for a look.
        const QString dir = qEnvironmentVariable("FOLDLINE_SCREENSHOT_DIR");
        if (!dir.isEmpty()) QVERIFY(img.save(QDir(dir).filePath("recovery-dialog.png")));
    }
};

QTEST_MAIN(RecoveryDialogTest)
#include "recovery_dialog_test.moc"
