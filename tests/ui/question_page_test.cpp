// tests/ui/question_page_test.cpp <-> ui/question_page.h: the compared groups formed by two or
// more columns. Ticking columns under "Combined with" forms the groups name (`sex+ethnicity`),
// offers the combinations as focal and reference groups, leaves the parts out of the strata,
// and is undone step by step; a saved combined question comes back as it was.
#include "core/io/csv_reader.h"  // core before Qt (see DEVELOPERS.md)

#include <QComboBox>
#include <QListWidget>
#include <QRadioButton>
#include <QUndoStack>
#include <QtTest>

#include "ui/engine.h"
#include "ui/question_page.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

// An invented hiring file: 6 rows per block, 4 blocks; m+a (8 rows) is the largest combination.
std::shared_ptr<const Table> hiring() {
    std::string text = "sex,ethnicity,dept,region,hired\n";
    for (int i = 0; i < 4; ++i)
        text += "f,a,x,n,1\nm,b,y,s,0\nf,b,x,n,0\nm,a,y,s,1\nm,a,x,n,0\nm,c,y,s,1\n";
    auto t = read_csv_text(text, "hiring.csv");
    if (!t.ok()) qFatal("%s", t.error().to_string().c_str());
    return std::make_shared<const Table>(std::move(*t));
}

QStringList items(const QComboBox* box) {
    QStringList out;
    for (int i = 0; i < box->count(); ++i) out << box->itemText(i);
    return out;
}

QListWidgetItem* item(QListWidget* list, const QString& text) {
    const auto found = list->findItems(text, Qt::MatchExactly);
    return found.isEmpty() ? nullptr : found.front();
}

QString candidate_line(QListWidget* list, const QString& column) {
    for (int i = 0; i < list->count(); ++i)
        if (list->item(i)->data(Qt::UserRole).toString() == column) return list->item(i)->text();
    return {};
}

}  // namespace

class QuestionPageTest : public QObject {
    Q_OBJECT
private slots:
    void ticking_a_column_forms_combined_groups() {
        QuestionPage page;
        page.set_table(hiring());
        auto* exposure = page.findChild<QComboBox*>(QStringLiteral("exposure"));
        auto* focal = page.findChild<QComboBox*>(QStringLiteral("focal"));
        auto* reference = page.findChild<QComboBox*>(QStringLiteral("reference"));
        auto* combine = page.findChild<QListWidget*>(QStringLiteral("combine_groups"));
        auto* candidates = page.findChild<QListWidget*>(QStringLiteral("candidates"));
        QVERIFY(exposure && focal && reference && combine && candidates);
        exposure->setCurrentText(QStringLiteral("sex"));
        QCOMPARE(page.spec().exposure, QStringLiteral("sex"));
        // Offered: the other columns that hold groups; never the groups column or the outcome.
        QVERIFY(item(combine, QStringLiteral("ethnicity")));
        QVERIFY(item(combine, QStringLiteral("dept")));
        QVERIFY(!item(combine, QStringLiteral("sex")));
        QVERIFY(!item(combine, QStringLiteral("hired")));

        item(combine, QStringLiteral("ethnicity"))->setCheckState(Qt::Checked);
        QCOMPARE(page.spec().exposure, QStringLiteral("sex+ethnicity"));
        QCOMPARE(page.combined_with(), QStringList{QStringLiteral("ethnicity")});
        // Each combination that occurs is a group, in order of first appearance; the largest
        // (m+a, 8 rows) is the default reference.
        QCOMPARE(items(focal), (QStringList{"f+a", "m+b", "f+b", "m+a", "m+c"}));
        QCOMPARE(items(reference), items(focal));
        QCOMPARE(reference->currentText(), QStringLiteral("m+a"));
        QCOMPARE(focal->currentText(), QStringLiteral("f+a"));
        // The parts never stratify; the other columns still do.
        QVERIFY2(candidate_line(candidates, "ethnicity").contains("part of the compared groups sex+ethnicity"),
                 qPrintable(candidate_line(candidates, "ethnicity")));
        QVERIFY(candidate_line(candidates, "sex").contains("left out"));
        QVERIFY(page.spec().candidates.contains(QStringLiteral("dept")));
        QVERIFY(!page.spec().candidates.contains(QStringLiteral("ethnicity")));
        focal->setCurrentText(QStringLiteral("f+b"));
        QVERIFY2(page.problems().isEmpty(), qPrintable(page.problems().join("; ")));

        // A third column joins the name last; the groups are the three-way combinations.
        item(combine, QStringLiteral("region"))->setCheckState(Qt::Checked);
        QCOMPARE(page.spec().exposure, QStringLiteral("sex+ethnicity+region"));
        // Every three-way combination has 4 rows: the first of them is the default reference.
        QCOMPARE(reference->currentText(), QStringLiteral("f+a+n"));
        QVERIFY(items(focal).contains(QStringLiteral("f+b+n")));

        // Undo: one step per tick, the chosen groups come back with the combination.
        QUndoStack* undo = page.undo_stack();
        QCOMPARE(undo->count(), 2);
        undo->undo();
        QCOMPARE(page.spec().exposure, QStringLiteral("sex+ethnicity"));
        QCOMPARE(page.spec().focal, QStringLiteral("f+b"));
        QCOMPARE(page.spec().reference, QStringLiteral("m+a"));
        QCOMPARE(item(combine, QStringLiteral("region"))->checkState(), Qt::Unchecked);
        undo->undo();
        QCOMPARE(page.spec().exposure, QStringLiteral("sex"));
        QCOMPARE(items(focal), (QStringList{"f", "m"}));
        QCOMPARE(item(combine, QStringLiteral("ethnicity"))->checkState(), Qt::Unchecked);
        undo->redo();
        QCOMPARE(page.spec().exposure, QStringLiteral("sex+ethnicity"));
        QCOMPARE(page.spec().focal, QStringLiteral("f+a"));  // as it was right after the tick
        QCOMPARE(item(combine, QStringLiteral("ethnicity"))->checkState(), Qt::Checked);

        // Another data set starts with one groups column and no history.
        page.set_table(hiring());
        QVERIFY(page.combined_with().isEmpty());
        QCOMPARE(undo->count(), 0);
    }

    void a_saved_combination_comes_back_in_its_order() {
        QuestionPage page;
        page.set_table(hiring());
        QuestionSpec q = page.spec();
        q.outcome = QStringLiteral("hired");
        q.positive = QStringLiteral("1");
        q.exposure = QStringLiteral("ethnicity+sex");  // not the table's order: the name's order wins
        q.focal = QStringLiteral("b+f");
        q.reference = QStringLiteral("a+m");
        q.candidates = {QStringLiteral("dept")};
        page.set_spec(q);
        QCOMPARE(page.spec().exposure, QStringLiteral("ethnicity+sex"));
        QCOMPARE(page.spec().focal, QStringLiteral("b+f"));
        QCOMPARE(page.spec().reference, QStringLiteral("a+m"));
        QCOMPARE(page.spec().candidates, QStringList{QStringLiteral("dept")});
        QCOMPARE(page.combined_with(), QStringList{QStringLiteral("sex")});
        QCOMPARE(page.findChild<QComboBox*>(QStringLiteral("exposure"))->currentText(), QStringLiteral("ethnicity"));
        QVERIFY(page.problems().isEmpty());
        // Through the audit's specification and back: nothing lost.
        const QuestionSpec back = question_spec(audit_spec(page.spec(), {}));
        QCOMPARE(back.exposure, q.exposure);
        QCOMPARE(back.focal, q.focal);
        QCOMPARE(back.reference, q.reference);
        // Opening a question asked of one groups column clears the combination.
        q.exposure = QStringLiteral("dept");
        q.focal = QStringLiteral("y");
        q.reference = QStringLiteral("x");
        q.candidates = {QStringLiteral("sex")};
        page.set_spec(q);
        QCOMPARE(page.spec().exposure, QStringLiteral("dept"));
        QVERIFY(page.combined_with().isEmpty());
        QCOMPARE(page.spec().focal, QStringLiteral("y"));
    }

    void a_trend_has_no_combined_groups() {
        QuestionPage page;
        page.set_table(hiring());
        page.combine_with({QStringLiteral("dept")});
        QVERIFY(page.spec().exposure.endsWith(QStringLiteral("+dept")));
        page.findChild<QRadioButton*>(QStringLiteral("kind_slopes"))->setChecked(true);
        QVERIFY(!page.spec().exposure.contains(QLatin1Char('+')));
    }

    void engine_checks_the_combined_question() {
        // check_question names a focal combination that does not occur, as `foldline scan` does.
        const auto t = hiring();
        QuestionSpec q;
        q.outcome = QStringLiteral("hired");
        q.positive = QStringLiteral("1");
        q.exposure = QStringLiteral("sex+ethnicity");
        q.focal = QStringLiteral("f+c");
        q.reference = QStringLiteral("m+a");
        q.candidates = {QStringLiteral("dept")};
        const QStringList p = check_question(*t, q);
        QVERIFY(!p.isEmpty());
        QVERIFY2(p.join(" ").contains(QStringLiteral("f+c")), qPrintable(p.join("; ")));
        q.focal = QStringLiteral("m+c");
        QVERIFY2(check_question(*t, q).isEmpty(), qPrintable(check_question(*t, q).join("; ")));
        q.outcome = QStringLiteral("sex");
        QVERIFY(!check_question(*t, q).isEmpty());
        QCOMPARE(combined_group_parts(*t, q), (QStringList{"sex", "ethnicity"}));
    }
};

QTEST_MAIN(QuestionPageTest)
#include "question_page_test.moc"
