// tests/ui/counts_grid_test.cpp <-> ui/counts_grid.h
#include <QtTest>

#include "ui/counts_grid.h"

using namespace foldline;

class CountsGridTest : public QObject {
    Q_OBJECT
private slots:
    void pasted_tsv_with_header_builds_weighted_table() {
        ui::CountsGrid g;
        // As a spreadsheet copies it: header line, CRLF line ends.
        const int n = g.paste_tsv("stratum\tfocal pos\tfocal n\tref pos\tref n\r\n"
                                  "north\t30\t100\t20\t50\r\nsouth\t0\t10\t5\t40\r\n");
        QCOMPARE(n, 2);
        auto t = g.to_table();
        QVERIFY2(t.ok(), t.ok() ? "" : t.error().to_string().c_str());
        QCOMPARE(t->columns.size(), std::size_t(3));
        QCOMPARE(t->columns[0].levels, (std::vector<std::string>{"north", "south"}));
        // Four weighted rows per stratum (positives and the rest, per group), zero cells kept.
        QCOMPARE(t->rows, std::size_t(8));
        QCOMPARE(t->total_weight(), 200.0);
        double focal_pos = 0;
        for (std::size_t i = 0; i < t->rows; ++i)
            if (t->columns[1].levels[t->columns[1].code(i)] == g.focal_name().toStdString() &&
                t->columns[2].levels[t->columns[2].code(i)] == g.positive_label().toStdString())
                focal_pos += t->weight(i);
        QCOMPARE(focal_pos, 30.0);
    }

    void bad_cell_is_named_by_row_and_column() {
        ui::CountsGrid g;
        g.set_rows({{"a", "3", "10", "2", "5"}, {"b", "x", "10", "2", "5"}});
        auto t = g.to_table();
        QVERIFY(!t.ok());
        QCOMPARE(t.error().line, std::size_t(2));
        QCOMPARE(t.error().column, std::size_t(2));
        QVERIFY(QString::fromStdString(t.error().message).contains("\"x\""));
        g.set_rows({{"a", "30", "10", "2", "5"}});
        auto t2 = g.to_table();
        QVERIFY(!t2.ok());
        QVERIFY(QString::fromStdString(t2.error().message).contains("exceed"));
    }
};

QTEST_MAIN(CountsGridTest)
#include "counts_grid_test.moc"
