// Tests of core/report/csv_export.h against RFC 4180 section 2 (rules 2, 5, 6 and 7, with the
// RFC's own examples), and a read-back of the strata file through the CSV reader.
#include "core/report/csv_export.h"

#include <gtest/gtest.h>

#include "core/io/csv_reader.h"
#include "core/scan/rate_scan.h"
#include "core/scan/slope_scan.h"

using namespace foldline;
using namespace foldline::report;

TEST(CsvExport, FieldQuotingFollowsRfc4180) {
    // Rule 5: fields may be quoted; plain fields stay as they are.
    EXPECT_EQ(csv_field("aaa"), "aaa");
    EXPECT_EQ(csv_field(""), "");
    // Rule 6: fields with line breaks, double quotes and commas are enclosed in double quotes.
    EXPECT_EQ(csv_field("b\r\nbb"), "\"b\r\nbb\"");
    EXPECT_EQ(csv_field("a,b"), "\"a,b\"");
    // Rule 7: a double quote inside is escaped by another one ("b""bb").
    EXPECT_EQ(csv_field("b\"bb"), "\"b\"\"bb\"");
    EXPECT_EQ(csv_field("<b>x</b>"), "<b>x</b>");
    EXPECT_EQ(csv_number(0.25), "0.25");
    EXPECT_EQ(csv_number(std::nan("")), "");
    EXPECT_EQ(csv_number(1.0 / 0.0), "");
}

TEST(CsvExport, RowsPerFindingAndStratumReadBackExactly) {
    const std::vector<std::vector<std::string>> labels = {{"a,b"}, {"say \"hi\""}, {"line\nbreak"}, {"<b>x</b>"}};
    RateFinding f = analyse_strata({{5, 5, 2, 8}, {6, 4, 3, 7}, {7, 3, 4, 6}, {1, 9, 0, 10}}, labels, {"<b>x</b>"}, 0.05);
    f.focal = "B";
    f.reference = "A";
    ScanResult r;
    r.rate_findings = {f, f};
    project::Project p;
    p.review_for(project::rate_key({"<b>x</b>"}, "B", "A")).note = "checked, \"twice\"\nsee file";
    p.review_for(project::rate_key({"<b>x</b>"}, "B", "A")).decision = Decision::SetAside;

    const std::string findings = findings_csv(r, &p);
    // Rule 2: every record ends with CRLF; header + 2 findings.
    std::size_t crlf = 0;
    for (std::size_t i = 0; (i = findings.find("\r\n", i)) != std::string::npos; i += 2) ++crlf;
    EXPECT_EQ(crlf, 3u);  // the note's own line feed stays a bare LF inside its quotes
    auto ft = read_csv_text(findings, "findings.csv");
    ASSERT_TRUE(ft.ok()) << ft.error().to_string();
    EXPECT_EQ(ft->rows, 2u);
    const Column* note = ft->column("note");
    ASSERT_NE(note, nullptr);
    EXPECT_EQ(note->levels.at(0), "checked, \"twice\"\nsee file");
    EXPECT_EQ(ft->column("decision")->levels.at(0), "set aside");
    EXPECT_EQ(ft->column("strata")->levels.at(0), "<b>x</b>");

    const std::string strata = strata_csv(r);
    auto st = read_csv_text(strata, "strata.csv");
    ASSERT_TRUE(st.ok()) << st.error().to_string();
    EXPECT_EQ(st->rows, 8u);  // 4 strata x 2 findings
    const Column* level = st->column("stratum");
    ASSERT_NE(level, nullptr);
    ASSERT_EQ(level->levels.size(), 4u);
    EXPECT_EQ(level->levels[0], "a,b");
    EXPECT_EQ(level->levels[1], "say \"hi\"");
    EXPECT_EQ(level->levels[2], "line\nbreak");
    EXPECT_EQ(level->levels[3], "<b>x</b>");
    // Counts come through as numbers: stratum 1 has 5 positives out of 10 in the focal group.
    EXPECT_DOUBLE_EQ(st->column("positives_focal")->values[0], 5);
    EXPECT_DOUBLE_EQ(st->column("n_focal")->values[0], 10);

    ScanResult empty;
    EXPECT_EQ(findings_csv(empty).find("\r\n"), findings_csv(empty).size() - 2);  // header only
}

TEST(CsvExport, SlopeFindingsAndTheirStrataReadBackExactly) {
    // Two stores with three weeks each: within "a,b" y = 2x (slope Sxy/Sxx = 4/2 = 2), within
    // "<i>m</i>" y = 4 - x (slope -2/2 = -1); least-squares slopes worked by hand from the
    // textbook formula b = Sxy / Sxx.
    auto t = read_csv_text("store,x,y\n\"a,b\",1,2\n\"a,b\",2,4\n\"a,b\",3,6\n<i>m</i>,1,3\n<i>m</i>,2,2\n<i>m</i>,3,1\n",
                           "weeks.csv");
    ASSERT_TRUE(t.ok()) << t.error().to_string();
    SlopeQuestion q;
    q.x = "x";
    q.y = "y";
    auto f = check_slope(*t, q, {t->column("store")});
    ASSERT_TRUE(f.ok()) << f.error().to_string();
    ScanResult r;
    r.slope_question = q;
    r.slope_findings = {*f, *f};
    project::Project p;
    auto& rv = p.review_for(project::slope_key({"store"}, "x", "y"));
    rv.decision = Decision::FollowUp;
    rv.note = "weak weeks, \"promo\" pushed\nask the desk";

    const std::string findings = slope_findings_csv(r, &p);
    auto ft = read_csv_text(findings, "slope-findings.csv");
    ASSERT_TRUE(ft.ok()) << ft.error().to_string();
    EXPECT_EQ(ft->rows, 2u);
    EXPECT_EQ(ft->column("kind")->levels.at(0), "slope");
    EXPECT_EQ(ft->column("decision")->levels.at(0), "follow up");
    EXPECT_EQ(ft->column("note")->levels.at(0), rv.note);
    EXPECT_DOUBLE_EQ(ft->column("pooled_slope")->values[0], f->pooled.slope);
    EXPECT_DOUBLE_EQ(ft->column("strata_count")->values[0], 2);
    // The within slope pools the two groups' Sxy and Sxx: (4 - 2) / (2 + 2) = 0.5.
    EXPECT_NEAR(ft->column("within_slope")->values[0], 0.5, 1e-9);

    const std::string strata = slope_strata_csv(r);
    auto st = read_csv_text(strata, "slope-strata.csv");
    ASSERT_TRUE(st.ok()) << st.error().to_string();
    EXPECT_EQ(st->rows, 4u);  // 2 strata x 2 findings
    const Column* level = st->column("stratum");
    ASSERT_NE(level, nullptr);
    EXPECT_EQ(level->levels.at(0), "a,b");
    EXPECT_EQ(level->levels.at(1), "<i>m</i>");
    EXPECT_NEAR(st->column("slope")->values[0], 2.0, 1e-12);
    EXPECT_NEAR(st->column("slope")->values[1], -1.0, 1e-12);
    EXPECT_DOUBLE_EQ(st->column("n")->values[0], 3);

    // Which files a scan writes: a trend-only scan its slope pair, a rate scan with trend checks
    // both pairs, an empty scan the rate pair.
    EXPECT_EQ(csv_export_paths(r, "out"), (std::vector<std::string>{"out-slope-findings.csv", "out-slope-strata.csv"}));
    ScanResult both = r;
    both.question.outcome = "approved";
    EXPECT_EQ(csv_export_paths(both, "out").size(), 4u);
    EXPECT_EQ(csv_export_paths(ScanResult{}, "out"), (std::vector<std::string>{"out-findings.csv", "out-strata.csv"}));
    ScanResult none;
    EXPECT_EQ(slope_findings_csv(none).find("\r\n"), slope_findings_csv(none).size() - 2);  // header only
}
