// Tests of ui/memo/memo_writer.h: the PDF bytes (page size, page count, text kept as text is
// checked with poppler in tests/reference/memo_reference.py), literal printing of control and
// bidi characters, and atomic writing: a failure before the rename, a full disk (RLIMIT_FSIZE
// makes write(2) fail as ENOSPC does) and a read-only folder (mode 0555; as root, who ignores
// permission bits, the write runs with the effective user and group 65534) each give a message
// naming the file and leave the previous memo byte for byte, with nothing left beside it.
#include "ui/memo/memo_writer.h"

#include <QApplication>
#include <QDir>
#include <QFile>
#include <QRegularExpression>
#include <QTemporaryDir>
#include <QtTest>

#include "core/common/atomic_file.h"

#include <csignal>
#include <sys/resource.h>
#include <unistd.h>

using namespace foldline;

namespace {

report::MemoContent sample_memo(project::PageSize size) {
    report::MemoContent m;
    m.title = "<b>Title</b>";
    m.date = "2026-12-02";
    m.page_size = size;
    m.summary = "Summary text.";
    m.findings.header = {"#", "Class"};
    m.findings.widths = {1, 3};
    m.findings.numeric = {true, false};
    for (int i = 0; i < 120; ++i) m.findings.rows.push_back({std::to_string(i + 1), "reversal"});
    m.caution = report::kMemoCaution;
    return m;
}

QByteArray slurp(const std::string& path) {
    QFile f(QString::fromStdString(path));
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

// Writes a first memo into a fresh folder and returns its path.
std::string previous_memo(const QTemporaryDir& dir) {
    const std::string path = QDir(dir.path()).filePath("memo.pdf").toStdString();
    if (!ui::write_memo_pdf(sample_memo(project::PageSize::A4), path).ok()) return {};
    return path;
}

int page_count(const QByteArray& pdf) {
    return static_cast<int>(pdf.count("/Type /Page\n") + pdf.count("/Type /Page\r") + pdf.count("/Type /Page "));
}

}  // namespace

class MemoWriterTest : public QObject {
    Q_OBJECT
private slots:
    void printableShowsControlsLiterally() {
        QCOMPARE(ui::printable("<b>x</b> & \"q\""), QStringLiteral("<b>x</b> & \"q\""));
        QCOMPARE(ui::printable("a\u202Eb"), QStringLiteral("a[U+202E]b"));
        QCOMPARE(ui::printable(std::string("a\x01z", 3)), QStringLiteral("a[U+0001]z"));
        QCOMPARE(ui::printable("line\nnext\ttab"), QStringLiteral("line\nnext\ttab"));
        const QString hebrew = ui::printable("\u05e9\u05dc\u05d5\u05dd");
        QCOMPARE(hebrew, QString::fromUtf8("\u05e9\u05dc\u05d5\u05dd"));
        QVERIFY(ui::printable("").isEmpty());
    }

    void pageSizesAndPagination() {
        // A4 = 595 x 842 pt, US Letter = 612 x 792 pt (ISO 216; ANSI/ASME Y14.1).
        const QByteArray a4 = ui::memo_pdf(sample_memo(project::PageSize::A4));
        const QByteArray letter = ui::memo_pdf(sample_memo(project::PageSize::Letter));
        QVERIFY(a4.startsWith("%PDF-"));
        QVERIFY(a4.contains("/MediaBox [0 0 595.000000 842.000000]"));
        QVERIFY(letter.contains("/MediaBox [0 0 612.000000 792.000000]"));
        // 120 table rows do not fit one page: the table continues on a second page or more.
        QVERIFY2(page_count(a4) >= 2, qPrintable(QString::number(page_count(a4))));
        QVERIFY(a4.contains("/FontFile2"));  // TrueType font program embedded
        const QByteArray empty = ui::memo_pdf(report::MemoContent{});
        QCOMPARE(page_count(empty), 1);
    }

    void previewImageOfPageOne() {
        const auto memo = sample_memo(project::PageSize::A4);
        const QImage img = ui::memo_page_image(memo, 1, 600);
        QVERIFY(!img.isNull());
        if (qEnvironmentVariableIsSet("FOLDLINE_SAVE_PREVIEW"))  // to look at it by eye
            img.save(qEnvironmentVariable("FOLDLINE_SAVE_PREVIEW"));
        QCOMPARE(img.width(), 600);
        QVERIFY(std::abs(img.height() - 600 * 842 / 595) <= 1);  // A4 aspect, 595 x 842 pt
        int dark = 0;
        for (int y = 0; y < img.height(); y += 2)
            for (int x = 0; x < img.width(); x += 2)
                if (qGray(img.pixel(x, y)) < 128) ++dark;
        QVERIFY2(dark > 500, qPrintable(QString::number(dark)));  // text was drawn
        QVERIFY(ui::memo_page_image(memo, 99, 600).isNull());
        QVERIFY(ui::memo_page_image(memo, 0, 600).isNull());
    }

    void writesAtomically() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        const std::string path = QDir(dir.path()).filePath("memo.pdf").toStdString();
        QVERIFY(ui::write_memo_pdf(sample_memo(project::PageSize::A4), path).ok());
        QFile f(QString::fromStdString(path));
        QVERIFY(f.open(QIODevice::ReadOnly));
        const QByteArray before = f.readAll();
        f.close();
        set_atomic_write_fault_for_testing(true);
        const auto st = ui::write_memo_pdf(sample_memo(project::PageSize::Letter), path);
        set_atomic_write_fault_for_testing(false);
        QVERIFY(!st.ok());
        QVERIFY(f.open(QIODevice::ReadOnly));
        QCOMPARE(f.readAll(), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files).size(), 1);

        const std::string missing = QDir(dir.path()).filePath("no/such/memo.pdf").toStdString();
        const auto st2 = ui::write_memo_pdf(sample_memo(project::PageSize::A4), missing);
        QVERIFY(!st2.ok());
        QCOMPARE(QString::fromStdString(st2.error().file), QString::fromStdString(missing));
    }
    void fullDiskKeepsThePreviousMemo() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        const std::string path = previous_memo(dir);
        QVERIFY(!path.empty());
        const QByteArray before = slurp(path);
        // Files of this process may not grow past 4 KiB (a memo is tens of KiB); SIGXFSZ is
        // ignored so write(2) fails with EFBIG, as it fails with ENOSPC on a full disk.
        rlimit old{};
        QVERIFY(::getrlimit(RLIMIT_FSIZE, &old) == 0);
        rlimit small = old;
        small.rlim_cur = 4096;
        auto* const previous_handler = std::signal(SIGXFSZ, SIG_IGN);
        QVERIFY(::setrlimit(RLIMIT_FSIZE, &small) == 0);
        const auto st = ui::write_memo_pdf(sample_memo(project::PageSize::Letter), path);
        ::setrlimit(RLIMIT_FSIZE, &old);
        std::signal(SIGXFSZ, previous_handler);
        QVERIFY(!st.ok());
        const QString message = QString::fromStdString(st.error().to_string());
        QVERIFY2(message.contains(QString::fromStdString(path)) && message.contains("cannot write"), qPrintable(message));
        QCOMPARE(slurp(path), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 1);
    }

    void readOnlyFolderKeepsThePreviousMemo() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        const std::string path = previous_memo(dir);
        QVERIFY(!path.empty());
        const QByteArray before = slurp(path);
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::ExeOwner | QFile::ReadGroup | QFile::ExeGroup |
                                              QFile::ReadOther | QFile::ExeOther);
        const bool root = ::geteuid() == 0;
        if (root && (::setegid(65534) != 0 || ::seteuid(65534) != 0)) {
            (void)!::setegid(0);
            QSKIP("cannot drop root privileges here, so a read-only folder cannot be made");
        }
        const auto st = ui::write_memo_pdf(sample_memo(project::PageSize::Letter), path);
        if (root) {
            QVERIFY(::seteuid(0) == 0);
            QVERIFY(::setegid(0) == 0);
        }
        QFile::setPermissions(dir.path(), QFile::ReadOwner | QFile::WriteOwner | QFile::ExeOwner);
        QVERIFY(!st.ok());
        const QString message = QString::fromStdString(st.error().to_string());
        QVERIFY2(message.contains(QString::fromStdString(path)) &&
                     message.contains("cannot create a temporary file beside it: Permission denied"),
                 qPrintable(message));
        QCOMPARE(slurp(path), before);
        QCOMPARE(QDir(dir.path()).entryList(QDir::Files | QDir::Hidden).size(), 1);
    }
};

QTEST_MAIN(MemoWriterTest)
#include "memo_writer_test.moc"
