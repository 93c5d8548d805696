// tests/ui/step_bar_test.cpp <-> ui/step_bar.h, ui/palette.h
#include <QSignalSpy>
#include <QtTest>

#include "ui/palette.h"
#include "ui/step_bar.h"

using namespace foldline::ui;

class StepBarTest : public QObject {
    Q_OBJECT
private slots:
    void only_open_steps_can_be_clicked() {
        StepBar bar({"Source", "Question", "Scan"});
        bar.resize(600, 80);
        bar.show();
        QVERIFY(QTest::qWaitForWindowExposed(&bar));
        QSignalSpy spy(&bar, &StepBar::step_requested);
        QTest::mouseClick(&bar, Qt::LeftButton, {}, bar.card_rect(2).center());
        QCOMPARE(spy.count(), 0);  // Scan is locked
        bar.set_state(2, StepBar::State::Open);
        QTest::mouseClick(&bar, Qt::LeftButton, {}, bar.card_rect(2).center());
        QCOMPARE(spy.count(), 1);
        QCOMPARE(spy.at(0).at(0).toInt(), 2);
        bar.set_current(1);
        QCOMPARE(bar.current(), 1);
        QVERIFY(bar.card_rect(3).isNull());
    }

    void okabe_ito_colours_are_the_published_ones() {
        // Okabe & Ito (2008), "Color Universal Design": orange E69F00, sky blue 56B4E9, bluish
        // green 009E73, yellow F0E442, blue 0072B2, vermillion D55E00, reddish purple CC79A7.
        const QRgb published[] = {0xE69F00, 0x56B4E9, 0x009E73, 0xF0E442, 0x0072B2, 0xD55E00, 0xCC79A7};
        for (int i = 0; i < 7; ++i) QCOMPARE(colors::okabe_ito(i).rgb() & 0xFFFFFF, published[i]);
        QCOMPARE(colors::okabe_ito(8), colors::okabe_ito(0));  // wraps around
        QCOMPARE(colors::focal().rgb() & 0xFFFFFF, QRgb(0xD55E00));
        QCOMPARE(colors::reference().rgb() & 0xFFFFFF, QRgb(0x0072B2));
        QPalette dark;
        dark.setColor(QPalette::Window, QColor(30, 30, 30));
        QVERIFY(colors::dark_theme(dark));
        QVERIFY(!colors::dark_theme(QPalette(QColor(240, 240, 240))));
    }
};

QTEST_MAIN(StepBarTest)
#include "step_bar_test.moc"
