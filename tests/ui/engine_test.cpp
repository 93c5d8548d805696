// tests/ui/engine_test.cpp <-> ui/engine.h: the workbench's adjusted estimate over a set of any
// size (the diagram step's "estimate to quote"), through the same core function the CLI's
// verdicts use. Checked by hand and against statsmodels.
#include "core/table/table.h"  // core before Qt (see DEVELOPERS.md)

#include <QtTest>

#include "ui/demo.h"
#include "ui/engine.h"

using namespace foldline;
using namespace foldline::ui;

namespace {

Column categorical(const std::string& name, const std::vector<std::string>& cells) {
    std::vector<std::string> levels;
    std::vector<std::uint32_t> codes;
    for (const auto& cell : cells) {
        auto it = std::find(levels.begin(), levels.end(), cell);
        if (it == levels.end()) it = levels.insert(levels.end(), cell);
        codes.push_back(static_cast<std::uint32_t>(it - levels.begin()));
    }
    return Column::categorical(name, levels, codes);
}

}  // namespace

class EngineTest : public QObject {
    Q_OBJECT
private slots:
    // Three joint strata of (a, b, c): focal/reference 6/10 vs 3/10, 1/5 vs 6/15, 10/20 vs 4/20.
    // By hand (direct standardisation to the pooled mix, weights 0.25, 0.25, 0.5):
    // 0.25 × 0.3 + 0.25 × (−0.2) + 0.5 × 0.3 = 0.175; Wald 95% limits −0.0299779 and 0.3799779
    // (Var = 0.0109375; z = scipy.stats.norm.ppf(0.975)).
    void rate_estimate_over_three_columns() {
        std::vector<std::string> out, grp, a, b, c;
        auto add = [&](const char* ga, const char* gb, const char* gc, const char* group, int n, int pos) {
            for (int i = 0; i < n; ++i) {
                out.push_back(i < pos ? "1" : "0");
                grp.push_back(group);
                a.push_back(ga), b.push_back(gb), c.push_back(gc);
            }
        };
        add("x", "x", "x", "F", 10, 6);
        add("x", "x", "x", "R", 10, 3);
        add("x", "y", "x", "F", 5, 1);
        add("x", "y", "x", "R", 15, 6);
        add("y", "y", "y", "F", 20, 10);
        add("y", "y", "y", "R", 20, 4);
        Table t;
        t.rows = out.size();
        t.columns = {categorical("cured", out), categorical("group", grp), categorical("a", a), categorical("b", b),
                     categorical("c", c)};
        QuestionSpec q;
        q.outcome = "cured";
        q.positive = "1";
        q.exposure = "group";
        q.focal = "F";
        q.reference = "R";
        auto f = adjusted_over(t, q, {"a", "b", "c"});
        QVERIFY2(f.ok(), f.ok() ? "" : f.error().message.c_str());
        QVERIFY(qAbs(f->adjusted.value - 0.175) < 1e-12);
        QVERIFY(qAbs(f->adjusted.lo - -0.02997793991388928) < 1e-9);
        QVERIFY(qAbs(f->adjusted.hi - 0.3799779399138893) < 1e-9);
        QCOMPARE(f->strata, (QStringList{"a", "b", "c"}));
        QVERIFY(!f->slope);
        // Two columns go the same way: over (a, c) the strata are those of (a, b, c) merged where
        // b varies within a level of (a, c): (x, x) holds 7 of 15 focal and 9 of 25 reference
        // positives, so by hand
        // 0.5 × (7/15 − 9/25) + 0.5 × 0.3 = 0.2033333.
        auto two = adjusted_over(t, q, {"a", "c"});
        QVERIFY(two.ok());
        QVERIFY(qAbs(two->adjusted.value - (0.5 * (7.0 / 15.0 - 9.0 / 25.0) + 0.5 * 0.3)) < 1e-12);
        // Errors say what is wrong.
        QVERIFY(!adjusted_over(t, q, {}).ok());
        auto unknown = adjusted_over(t, q, {"a", "b", "nope"});
        QVERIFY(!unknown.ok());
        QVERIFY(QString::fromStdString(unknown.error().message).contains("nope"));
        auto none = adjusted_over(t, q, {"group", "a", "b"});
        QVERIFY(!none.ok());
        QVERIFY(QString::fromStdString(none.error().message).contains("both groups"));
    }

    // sample_data/retail_weeks.csv; statsmodels 0.13.5 OLS weekly_sales ~ promo_spend +
    // C(store_format:region:quarter) [calc]: slope −3.7510981662171075, 95% CI
    // −3.978314799084222 to −3.523881533349993 (80 joint strata).
    void slope_estimate_over_three_columns() {
        const QString path = find_sample("retail_weeks.csv");
        if (path.isEmpty()) QSKIP("sample_data/retail_weeks.csv not found");
        auto t = load_table(path, {}, Work{});
        QVERIFY(t.ok());
        QuestionSpec q;
        q.slope = true;
        q.outcome = "weekly_sales";
        q.exposure = "promo_spend";
        auto f = adjusted_over(*t, q, {"store_format", "region", "quarter"});
        QVERIFY2(f.ok(), f.ok() ? "" : f.error().message.c_str());
        QVERIFY(f->slope);
        QVERIFY(qAbs(f->adjusted.value - -3.7510981662171075) < 1e-9);
        QVERIFY(qAbs(f->adjusted.lo - -3.978314799084222) < 1e-8);
        QVERIFY(qAbs(f->adjusted.hi - -3.523881533349993) < 1e-8);
    }
};

QTEST_MAIN(EngineTest)
#include "engine_test.moc"
