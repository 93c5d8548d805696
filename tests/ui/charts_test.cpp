// Tests of ui/charts.h `save`: each format's file starts with its signature (PNG: the 8-byte
// signature of the PNG specification, ISO/IEC 15948 section 5.2; PDF: "%PDF-", ISO 32000-1
// section 7.5.2; SVG: an XML document with an <svg> root, W3C SVG 1.1), an unknown suffix is
// refused, and a failed save leaves the previous chart byte for byte with nothing beside it: a
// full disk (RLIMIT_FSIZE with SIGXFSZ ignored, so write(2) fails as with ENOSPC) and a
// read-only folder (mode 0555; as root, who ignores mode bits, with effective user and group
// 65534).
#include "ui/charts.h"

#include <QDir>
#include <QFile>
#include <QTemporaryDir>
#include <QtTest>
#include <qcustomplot.h>

#include <csignal>
#include <sys/resource.h>
#include <unistd.h>

using namespace foldline;

namespace {

QByteArray slurp(const QString& path) {
    QFile f(path);
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

void draw(QCustomPlot& plot) {
    plot.resize(400, 300);
    plot.addGraph();
    plot.graph(0)->setData(QVector<double>{0, 1, 2}, QVector<double>{0.2, 0.5, 0.4});
    plot.rescaleAxes();
}

}  // namespace

class ChartsTest : public QObject {
    Q_OBJECT
private slots:
    void savesEachFormatBySuffix() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        QCustomPlot plot;
        draw(plot);
        QVERIFY(ui::charts::save(&plot, dir.filePath("c.png")).ok());
        QVERIFY(slurp(dir.filePath("c.png")).startsWith(QByteArray("\x89PNG\r\n\x1a\n", 8)));
        QVERIFY(ui::charts::save(&plot, dir.filePath("c.PDF")).ok());
        QVERIFY(slurp(dir.filePath("c.PDF")).startsWith("%PDF-"));
        QVERIFY(ui::charts::save(&plot, dir.filePath("c.svg")).ok());
        const QByteArray svg = slurp(dir.filePath("c.svg"));
        QVERIFY(svg.startsWith("<?xml") && svg.contains("<svg"));
        const auto st = ui::charts::save(&plot, dir.filePath("c.bmp"));
        QVERIFY(!st.ok());
        QVERIFY(QString::fromStdString(st.error().message).contains(".png, .svg or .pdf"));
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 3);
    }

    void fullDiskKeepsThePreviousChart() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        QCustomPlot plot;
        draw(plot);
        const QString path = dir.filePath("chart.png");
        QVERIFY(ui::charts::save(&plot, path).ok());
        const QByteArray before = slurp(path);
        plot.graph(0)->setData(QVector<double>{0, 1, 2}, QVector<double>{0.9, 0.1, 0.7});
        rlimit old{};
        QVERIFY(::getrlimit(RLIMIT_FSIZE, &old) == 0);
        rlimit small = old;
        small.rlim_cur = 256;  // a 400 x 300 chart at 2x is far larger
        auto* const previous_handler = std::signal(SIGXFSZ, SIG_IGN);
        QVERIFY(::setrlimit(RLIMIT_FSIZE, &small) == 0);
        const auto st = ui::charts::save(&plot, path);
        ::setrlimit(RLIMIT_FSIZE, &old);
        std::signal(SIGXFSZ, previous_handler);
        QVERIFY(!st.ok());
        QVERIFY2(QString::fromStdString(st.error().to_string()).contains(path), st.error().to_string().c_str());
        QCOMPARE(slurp(path), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 1);
    }

    void readOnlyFolderKeepsThePreviousChart() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        QCustomPlot plot;
        draw(plot);
        const QString path = dir.filePath("chart.svg");
        QVERIFY(ui::charts::save(&plot, path).ok());
        const QByteArray before = slurp(path);
        plot.graph(0)->setData(QVector<double>{0, 1, 2}, QVector<double>{0.9, 0.1, 0.7});
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::ExeOwner | QFile::ReadGroup | QFile::ExeGroup |
                                              QFile::ReadOther | QFile::ExeOther);
        const bool root = ::geteuid() == 0;
        if (root && (::setegid(65534) != 0 || ::seteuid(65534) != 0)) {
            (void)!::setegid(0);
            QSKIP("cannot drop root privileges here, so a read-only folder cannot be made");
        }
        const auto st = ui::charts::save(&plot, path);
        if (root) {
            QVERIFY(::seteuid(0) == 0);
            QVERIFY(::setegid(0) == 0);
        }
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::WriteOwner | QFile::ExeOwner);
        QVERIFY(!st.ok());
        const QString message = QString::fromStdString(st.error().to_string());
        QVERIFY2(message.contains(path) && message.contains("Permission denied"), qPrintable(message));
        QCOMPARE(slurp(path), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 1);
    }
};

QTEST_MAIN(ChartsTest)
#include "charts_test.moc"
