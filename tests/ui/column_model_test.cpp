// tests/ui/column_model_test.cpp <-> ui/column_model.h: the Source step's list of columns shows a
// statistical file's variable label beside the column's name, and the codes behind its value
// labels beside the levels. The file is written by R's haven (Debian r-cran-haven, an independent
// writer; tests/core/io/data/formats/make_stat_files.R), its labels as that script sets them.
#include "core/io/table_reader.h"  // core before Qt (see DEVELOPERS.md)

#include <QtTest>

#include "ui/column_model.h"

using namespace foldline;
using namespace foldline::ui;

class ColumnModelTest : public QObject {
    Q_OBJECT
private slots:
    void labels_are_shown_beside_names_and_codes_beside_levels() {
        const std::string path = FOLDLINE_SOURCE_DIR "/tests/core/io/data/formats/clinic_followup.sav";
        auto t = read_table(path, {});
        QVERIFY2(t.ok(), t.ok() ? "" : t.error().to_string().c_str());
        ColumnModel m;
        m.set_table(std::make_shared<const Table>(std::move(*t)));
        int site = -1, recov = -1;
        for (int r = 0; r < m.rowCount(); ++r) {
            const QString name = m.data(m.index(r, ColumnModel::Name)).toString();
            if (name.startsWith(QStringLiteral("site"))) site = r;
            if (name.startsWith(QStringLiteral("recov"))) recov = r;
        }
        QVERIFY(site >= 0 && recov >= 0);
        QCOMPARE(m.data(m.index(site, ColumnModel::Name)).toString(), QStringLiteral("site  \u2014 Clinic site"));
        QCOMPARE(m.data(m.index(site, ColumnModel::Name), Qt::ToolTipRole).toString(), QStringLiteral("Clinic site"));
        // Value labels are the levels; the codes are in the description.
        const QString levels = m.data(m.index(site, ColumnModel::Levels)).toString();
        QVERIFY2(levels.contains(QStringLiteral("North clinic")) && levels.contains(QStringLiteral("South clinic")),
                 qPrintable(levels));
        QVERIFY(!levels.contains(QStringLiteral("1 =")));
        QVERIFY(m.data(m.index(site, ColumnModel::Levels), Qt::ToolTipRole)
                    .toString()
                    .endsWith(QStringLiteral("codes: 1 = North clinic; 2 = South clinic")));
        QVERIFY(m.data(m.index(recov, ColumnModel::Levels), Qt::ToolTipRole)
                    .toString()
                    .contains(QStringLiteral("codes: 0 = no; 1 = yes; 9 = not recorded")));
        // The user-defined missing code 9 counts as missing, not as a level.
        QVERIFY(m.data(m.index(recov, ColumnModel::Missing)).toString() != QStringLiteral("0"));
        QVERIFY(!m.data(m.index(recov, ColumnModel::Levels)).toString().contains(QStringLiteral("not recorded")));
    }
};

QTEST_MAIN(ColumnModelTest)
#include "column_model_test.moc"
