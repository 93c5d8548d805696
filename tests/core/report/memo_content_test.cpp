// Tests of core/report/memo_content.h. The figures come from the penicillin-and-rabbits strata of
// R's mantelhaen.test documentation (Agresti 1990, pp. 231-237), so the memo's numbers can be
// checked against published values; the rest checks what the memo says and includes.
#include "core/report/memo_content.h"

#include "core/audit/verdicts.h"

#include <gtest/gtest.h>

#include <algorithm>

#include "core/causal/diagram.h"
#include "core/scan/rate_scan.h"

using namespace foldline;
using namespace foldline::report;

namespace {

// (no delay cured, no delay died, 1.5 h cured, 1.5 h died) per penicillin level; focal = no delay.
stats::Strata penicillin() {
    return {{0, 6, 0, 5}, {3, 3, 0, 6}, {6, 0, 2, 4}, {5, 1, 6, 0}, {2, 0, 5, 0}};
}

ScanResult penicillin_scan(const std::vector<std::string>& levels = {"1/8", "1/4", "1/2", "1", "4"}) {
    std::vector<std::vector<std::string>> labels;
    for (const auto& l : levels) labels.push_back({l});
    RateFinding f = analyse_strata(penicillin(), labels, {"penicillin"}, 0.05);
    f.focal = "no_delay";
    f.reference = "delay_1.5h";
    f.cls = FindingClass::Explained;  // the class itself is the scan's business; fixed for the memo
    f.q_value = 0.03;
    f.stability.share = 0.91;
    ScanResult r;
    r.question.outcome = "cured";
    r.question.positive = "yes";
    r.question.exposure = "delay";
    r.question.reference = "delay_1.5h";
    r.question.focal = {"no_delay"};
    r.candidates = {"penicillin"};
    r.rate_findings = {f};
    r.alpha = 0.05;
    r.bootstrap = 400;
    r.seed = 77;
    return r;
}

const std::vector<std::string>* row_named(const MemoTable& t, const std::string& first) {
    for (const auto& row : t.rows)
        if (!row.empty() && row[0] == first) return &row;
    return nullptr;
}

}  // namespace

TEST(MemoContent, FiguresMatchPublishedPenicillinValues) {
    const ScanResult r = penicillin_scan();
    MemoInput in;
    in.scan = &r;
    in.data = DataInfo{"/data/rabbits.csv", "ab12", 54};
    in.date = "2026-12-02";
    const MemoContent m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    const MemoSection& s = m.sections[0];
    // OR_MH 7, 95% CI 1.026713-47.725133 [src: R mantelhaen.test documentation].
    const auto* orow = row_named(s.figures, "Mantel-Haenszel odds ratio");
    ASSERT_NE(orow, nullptr);
    EXPECT_EQ((*orow)[1], "7.00");
    EXPECT_EQ((*orow)[2], "1.03 to 47.73");
    // RR_MH 1.552632, RD_MH 0.228036 [calc: methods.md, R / statsmodels].
    EXPECT_EQ((*row_named(s.figures, "Mantel-Haenszel risk ratio"))[1], "1.55");
    EXPECT_EQ((*row_named(s.figures, "Adjusted difference (Mantel-Haenszel)"))[1], "+22.8 pp");
    // Pooled rates by hand from the published counts: 16/26 = 61.5%, 13/28 = 46.4%.
    EXPECT_EQ((*row_named(s.figures, "Pooled rate, no_delay"))[1], "61.5%");
    EXPECT_EQ((*row_named(s.figures, "Pooled rate, delay_1.5h"))[1], "46.4%");
    EXPECT_EQ(s.strata.rows[0][1], "16/26 (61.5%)");
    EXPECT_EQ(s.strata.rows[0][2], "13/28 (46.4%)");
    // E-value of RR 1.552632: RR + sqrt(RR (RR - 1)) = 2.4789 [calc, VanderWeele & Ding 2017 formula].
    EXPECT_NE(s.e_value.find("E-value 2.48"), std::string::npos) << s.e_value;
    // Kitagawa parts add up to the pooled gap (15.1 pp = 61.5% - 46.4%).
    EXPECT_NE(s.decomposition.find("pooled gap of +15.1 pp"), std::string::npos) << s.decomposition;
    // One stratum row per level, after the pooled row; the chart has the same categories.
    EXPECT_EQ(s.strata.rows.size(), 6u);
    EXPECT_EQ(s.chart.points.size(), 6u);
    EXPECT_TRUE(s.chart.points[0].pooled);
    EXPECT_EQ(s.chart.points[5].label, "4");
    EXPECT_EQ(s.heading, "1. Explained: penicillin (no_delay vs delay_1.5h)");
    // Small counts (docs/methods.md#small-counts): the exact conditional test and Zelen's test
    // decided; R's mantelhaen.test(exact = TRUE) prints p 0.03994, common OR 10.36102, 95% CI
    // 1.077401 to 529.837399; Zelen p 300/4050 = 0.0741 (by hand).
    const auto* exact = row_named(s.figures, "Exact conditional test p (odds ratio)");
    ASSERT_NE(exact, nullptr);
    EXPECT_EQ((*exact)[1], "0.040 (10.36)") << (*exact)[1];
    EXPECT_EQ((*exact)[2].substr(0, 8), "1.08 to ") << (*exact)[2];
    ASSERT_NE(row_named(s.figures, "Homogeneity, Zelen exact p"), nullptr);
    EXPECT_NE(s.lead.find("Small counts: Mantel-Fleiss distance 4 < 5"), std::string::npos) << s.lead;
    EXPECT_NE(s.lead.find("Zelen's exact test decides (p 0.07407)"), std::string::npos) << s.lead;
}

TEST(MemoContent, FrontMatterMethodNotesAndCaution) {
    const ScanResult r = penicillin_scan();
    MemoInput in;
    in.scan = &r;
    in.data = DataInfo{"/data/rabbits.csv", "ab12", 54};
    in.date = "2026-12-02";
    in.data_change = "the data file changed since the project was saved";
    const MemoContent m = build_memo(in);
    EXPECT_EQ(m.title, "Audit of rabbits.csv");
    EXPECT_EQ(m.date, "2026-12-02");
    EXPECT_EQ(m.data_warning, in.data_change);
    EXPECT_NE(m.question.find("rate of cured = yes"), std::string::npos) << m.question;
    EXPECT_NE(m.summary.find("1 comparisons"), std::string::npos) << m.summary;
    EXPECT_NE(m.summary.find("No causal diagram"), std::string::npos) << m.summary;
    bool seed = false, fdr = false;
    for (const auto& n : m.method_notes) {
        seed = seed || (n.find("400 multinomial bootstrap") != std::string::npos && n.find("seed 77") != std::string::npos);
        fdr = fdr || n.find("false discovery rate of 0.05") != std::string::npos;
    }
    EXPECT_TRUE(seed);
    EXPECT_TRUE(fdr);
    EXPECT_NE(m.caution.find("statistical screen, not a legal or clinical determination"), std::string::npos);
    EXPECT_NE(m.caution.find("local law, counsel and licensed practice"), std::string::npos);
    ASSERT_EQ(m.findings.rows.size(), 1u);
    EXPECT_EQ(m.findings.rows[0][1], "explained");
    EXPECT_EQ(m.findings.rows[0][8], "undecided");

    // A diagram drawn but never confirmed gives no verdict; the memo says it exists instead of
    // claiming that none was given.
    in.draft_diagram = true;
    const MemoContent draft = build_memo(in);
    EXPECT_EQ(draft.summary.find("No causal diagram"), std::string::npos) << draft.summary;
    EXPECT_NE(draft.summary.find("unconfirmed draft"), std::string::npos) << draft.summary;
    for (const auto& s : draft.sections)
        EXPECT_NE(s.verdict.find("unconfirmed draft"), std::string::npos) << s.verdict;
}

TEST(MemoContent, ReviewDecisionsNotesAndChoices) {
    ScanResult r = penicillin_scan();
    RateFinding stable = r.rate_findings[0];
    stable.strata = {"cage"};
    stable.cls = FindingClass::Stable;
    r.rate_findings.push_back(stable);
    project::Project p;
    p.memo.title = "Rabbit trial";
    p.memo.analyst = "Analyst <i>name</i>";
    p.memo.page_size = project::PageSize::Letter;
    auto& rv = p.review_for(project::rate_key({"penicillin"}, "no_delay", "delay_1.5h"));
    rv.decision = Decision::FollowUp;
    rv.note = "<b>x</b> & \u05e9\u05dc\u05d5\u05dd";
    MemoInput in;
    in.scan = &r;
    in.project = &p;
    MemoContent m = build_memo(in);
    EXPECT_EQ(m.title, "Rabbit trial");
    EXPECT_EQ(m.page_size, project::PageSize::Letter);
    ASSERT_EQ(m.sections.size(), 1u);  // "flagged": the stable one is listed nowhere
    EXPECT_EQ(m.findings.rows.size(), 1u);
    EXPECT_EQ(m.sections[0].decision, "Reviewer's decision: follow up.");
    EXPECT_EQ(m.sections[0].note, rv.note);  // kept verbatim: the renderer prints it literally
    EXPECT_EQ(m.findings.rows[0][8], "follow up");
    // A decision applied from the family's lead says where it came from, in the section and in
    // the findings table (project file `applied_from`).
    rv.applied_from = "product";
    m = build_memo(in);
    EXPECT_EQ(m.sections[0].decision, "Reviewer's decision: follow up (from the lead product).");
    EXPECT_EQ(m.findings.rows[0][8], "follow up (from the lead product)");
    rv.applied_from.clear();
    m = build_memo(in);
    const auto analyst = std::find_if(m.facts.begin(), m.facts.end(), [](auto& f) { return f.first == "Analyst"; });
    ASSERT_NE(analyst, m.facts.end());
    EXPECT_EQ(analyst->second, "Analyst <i>name</i>");

    // "chosen": only in_memo true, even a stable finding.
    p.memo.findings = "chosen";
    rv.in_memo = false;
    p.review_for(project::rate_key({"cage"}, "no_delay", "delay_1.5h")).in_memo = true;
    m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    EXPECT_NE(m.sections[0].heading.find("cage"), std::string::npos);
    EXPECT_FALSE(included_in_memo(r.rate_findings[0], &p));
    EXPECT_TRUE(included_in_memo(r.rate_findings[1], &p));
    EXPECT_TRUE(included_in_memo(r.rate_findings[0], nullptr));
    EXPECT_FALSE(included_in_memo(r.rate_findings[1], nullptr));
}

TEST(MemoContent, DiagramGivesVerdictAndRoles) {
    ScanResult r = penicillin_scan();
    causal::Diagram d;
    d.nodes = {{"penicillin", true, 0.0, 0.0}, {"delay", true, -50.0, 80.0}, {"cured", true, 50.0, 80.0},
               {"weight", false, std::nullopt, std::nullopt}};
    d.edges = {{"penicillin", "delay"}, {"penicillin", "cured"}, {"delay", "cured"}, {"weight", "cured"}};
    d.exposure = "delay";
    d.outcome = "cured";
    project::Project p;
    p.diagrams.push_back({"rabbits", d});
    // The verdicts come with the findings, as core/audit attaches them.
    EXPECT_EQ(audit::attach_verdicts(r, nullptr, d, audit::EstimateSettings{}), "");
    MemoInput in;
    in.scan = &r;
    in.project = &p;
    const MemoContent m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    const auto& s = m.sections[0];
    // A common cause of exposure and outcome: the stratified view answers (back-door criterion).
    EXPECT_NE(s.verdict.find("the stratified view (within penicillin)"), std::string::npos) << s.verdict;
    EXPECT_NE(m.summary.find("\"rabbits\""), std::string::npos) << m.summary;
    ASSERT_TRUE(s.diagram.has_value());
    ASSERT_EQ(s.diagram->nodes.size(), 4u);
    EXPECT_EQ(s.diagram->nodes[0].role, causal::Role::Confounder);
    EXPECT_TRUE(s.diagram->nodes[0].in_stratifier);
    EXPECT_EQ(s.diagram->nodes[1].role, causal::Role::Exposure);
    EXPECT_EQ(s.diagram->nodes[2].role, causal::Role::Outcome);
    EXPECT_FALSE(s.diagram->nodes[3].observed);
    EXPECT_EQ(s.diagram->edges.size(), 4u);

    // A stratifier missing from the diagram: the memo says so instead of guessing.
    r.rate_findings[0].strata = {"cage"};
    EXPECT_NE(audit::attach_verdicts(r, nullptr, d, audit::EstimateSettings{}).find("cage"), std::string::npos);
    const MemoContent m2 = build_memo(in);
    EXPECT_NE(m2.sections[0].verdict.find("cannot judge"), std::string::npos) << m2.sections[0].verdict;
    EXPECT_NE(m2.sections[0].verdict.find("cage"), std::string::npos) << m2.sections[0].verdict;
    EXPECT_EQ(m2.sections[0].diagram->nodes[0].role, causal::Role::Confounder);
    // The same sentence in the section and on page 1, never "No causal diagram was given" while
    // the audit has one (core/causal/missing_columns words it).
    const std::string lacks = "the diagram lacks the finding's column \"cage\"";
    EXPECT_NE(m2.sections[0].verdict.find(lacks), std::string::npos) << m2.sections[0].verdict;
    EXPECT_NE(m2.summary.find(lacks), std::string::npos) << m2.summary;
    EXPECT_EQ(m2.summary.find("No causal diagram"), std::string::npos) << m2.summary;
}

TEST(MemoContent, EmptyScanAndNumberFormats) {
    ScanResult r;
    r.question.outcome = "y";
    r.question.positive = "1";
    r.question.exposure = "g";
    r.question.reference = "a";
    r.question.focal = {"b"};
    MemoInput in;
    in.scan = &r;
    const MemoContent m = build_memo(in);
    EXPECT_TRUE(m.sections.empty());
    EXPECT_TRUE(m.findings.rows.empty());
    EXPECT_NE(m.summary.find("None changes"), std::string::npos) << m.summary;
    EXPECT_FALSE(m.caution.empty());
    EXPECT_TRUE(build_memo(MemoInput{}).title.empty());

    EXPECT_EQ(percent(0.4775), "47.8%");
    EXPECT_EQ(percent(std::nan("")), "n/a");
    EXPECT_EQ(points(-0.19912), "-19.9 pp");
    EXPECT_EQ(points(0.04), "+4.0 pp");
    EXPECT_EQ(points(-0.0001), "+0.0 pp");
    EXPECT_EQ(p_text(0.00001), "< 0.0001");
    EXPECT_EQ(p_text(0.0321), "0.032");
    EXPECT_EQ(p_text(0.41), "0.41");
    EXPECT_EQ(fixed(std::nan(""), 2), "n/a");
}

TEST(MemoContent, SlopeFindingsGetTheirOwnSections) {
    // iris (R datasets) [src, methods.md]: pooled slope of Sepal.Width on Sepal.Length -0.0618848,
    // species fixed effects 0.3498801 [calc]; the figures are set directly, the memo only words them.
    ScanResult r;
    r.slope_question.x = "Sepal.Length";
    r.slope_question.y = "Sepal.Width";
    SlopeFinding f;
    f.x = "Sepal.Length";
    f.y = "Sepal.Width";
    f.strata = {"Species"};
    f.cls = FindingClass::Reversal;
    f.pooled.slope = -0.0618848;
    f.pooled.n = 150;
    f.within.slope = 0.3498801;
    f.within.strata = 3;
    f.q_value = 0.0001;
    SlopeGroup g;
    g.level = "setosa";
    g.n = 50;
    g.slope = 0.7985283;
    g.informative = true;
    f.groups = {g};
    SlopeFinding stable = f;
    stable.strata = {"petal_bin"};
    stable.cls = FindingClass::Stable;
    r.slope_findings = {f, stable};
    MemoInput in;
    in.scan = &r;
    const MemoContent m = build_memo(in);
    EXPECT_NE(m.question.find("Does Sepal.Width rise or fall with Sepal.Length"), std::string::npos) << m.question;
    ASSERT_EQ(m.sections.size(), 1u);
    const auto& s = m.sections[0];
    EXPECT_EQ(s.heading, "1. Reversal: Species (Sepal.Width on Sepal.Length)");
    EXPECT_EQ((*row_named(s.figures, "Pooled slope"))[1], "-0.06188");
    EXPECT_EQ((*row_named(s.figures, "Within slope (one intercept per stratum)"))[1], "+0.3499");
    EXPECT_EQ(s.strata.rows.size(), 2u);
    EXPECT_EQ(s.strata.rows[1][0], "setosa");
    EXPECT_EQ(s.strata.rows[1][2], "+0.7985");
    EXPECT_TRUE(s.chart.points.empty());  // no rate chart for a trend
    EXPECT_FALSE(s.scatter);              // no rows given: no trend chart (core/report/slope_chart)
    // A trend audit's method notes name its own estimators, not the rate ones.
    auto noted = [&](const char* what) {
        return std::any_of(m.method_notes.begin(), m.method_notes.end(),
                           [&](const std::string& n) { return n.find(what) != std::string::npos; });
    };
    EXPECT_TRUE(noted("ordinary least squares slope of Sepal.Width on Sepal.Length"));
    EXPECT_TRUE(noted("Benjamini-Hochberg over all 2 checks"));
    EXPECT_FALSE(noted("Wilson"));
    EXPECT_FALSE(noted("Mantel-Haenszel"));
    EXPECT_TRUE(s.e_value.empty());
    EXPECT_NE(s.lead.find("The trend reverses"), std::string::npos) << s.lead;
    ASSERT_EQ(m.findings.rows.size(), 1u);
    EXPECT_EQ(m.findings.rows[0][0], "s1");
    project::Project p;
    p.review_for(project::slope_key({"petal_bin"}, "Sepal.Length", "Sepal.Width")).in_memo = true;
    EXPECT_TRUE(included_in_memo(stable, &p));
    EXPECT_FALSE(included_in_memo(stable, nullptr));
}

// A database source is named by its database and table, with the driver and the time of the
// query instead of a file digest; the connection string (even masked) is not printed.
TEST(MemoContent, DatabaseSourceRecordsDriverTableAndQueryTime) {
    const ScanResult r = penicillin_scan();
    MemoInput in;
    in.scan = &r;
    in.data = DataInfo{"odbc:DSN=clinic;Uid=reader;PWD=*** table trials", "", 54};
    DatabaseRecord db;
    db.connection = "DSN=clinic;Uid=reader;PWD=***";
    db.driver = "psqlodbcw.so 13.02.0000 (PostgreSQL)";
    db.database = "audit";
    db.table = "trials";
    db.rows = 54;
    db.queried_at = "2026-12-02T05:00:00Z";
    in.data.database = db;
    const MemoContent m = build_memo(in);
    auto fact = [&](const std::string& label) -> std::string {
        for (const auto& [k, v] : m.facts)
            if (k == label) return v;
        return "<absent>";
    };
    EXPECT_EQ(fact("Data source"), "database audit, table trials");
    EXPECT_EQ(fact("Driver"), db.driver);
    EXPECT_EQ(fact("Queried at"), db.queried_at);
    EXPECT_EQ(fact("SHA-256"), "<absent>");
    EXPECT_EQ(fact("Query"), "<absent>");
    bool note = false;
    for (const auto& n : m.method_notes) {
        EXPECT_EQ(n.find("Uid=reader"), std::string::npos) << n;
        note = note || n.find("counted inside the database (" + db.driver + ") at " + db.queried_at) != std::string::npos;
    }
    EXPECT_TRUE(note);
    in.data.database->table.clear();
    in.data.database->query = "SELECT * FROM trials WHERE site = 'north'";
    EXPECT_EQ(build_memo(in).facts[0].second, "database audit, a query");
}

// A flip of the point estimates that is not significant is named, never "nothing changed": the
// penicillin finding (class Explained) with its within-strata estimate set to the other side of
// the pooled one, against the same finding with both on one side.
TEST(MemoContent, ExplainedFindingNamesAFlipOfPointEstimates) {
    ScanResult r = penicillin_scan();
    RateFinding& f = r.rate_findings.front();
    MemoInput in;
    in.scan = &r;
    in.data = DataInfo{"/data/rabbits.csv", "ab12", 54};
    f.adjusted.mh_rd.greenland_robins.estimate = 0.5 * f.crude.rd;
    MemoContent m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    EXPECT_EQ(m.sections[0].lead.find("points the other way"), std::string::npos) << m.sections[0].lead;
    f.adjusted.mh_rd.greenland_robins.estimate = -0.5 * f.crude.rd;
    m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    EXPECT_NE(m.sections[0].lead.find("points the other way"), std::string::npos) << m.sections[0].lead;
    ASSERT_FALSE(m.answer.empty());
    EXPECT_NE(m.answer[0].find("points the other way"), std::string::npos) << m.answer[0];
}

// Memo detail: "families" gives the lead a section and lists its member inside it; "full" gives
// the member its own section too.
TEST(MemoContent, MemoDetailFamiliesOrFull) {
    ScanResult r = penicillin_scan();
    RateFinding member = r.rate_findings.front();
    member.strata = {"penicillin", "cage"};
    member.family.role = FamilyRole::Member;
    member.family.lead = r.rate_findings.front().label();
    member.family.reason = "adds nothing beyond penicillin";
    r.rate_findings.push_back(member);
    MemoInput in;
    in.scan = &r;
    in.data = DataInfo{"/data/rabbits.csv", "ab12", 54};
    MemoContent m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 1u);
    EXPECT_FALSE(m.sections[0].compact);  // the lead page 1 answers keeps its charts
    ASSERT_EQ(m.sections[0].related.rows.size(), 1u);
    EXPECT_EQ(m.sections[0].related.rows[0][0], "penicillin × cage");
    EXPECT_EQ(m.appendix.rows.size(), 2u);
    EXPECT_EQ(m.appendix.rows[1].back(), "member of " + member.family.lead);
    in.detail = "full";
    m = build_memo(in);
    ASSERT_EQ(m.sections.size(), 2u);
    EXPECT_TRUE(m.sections[1].related.rows.empty());
    EXPECT_FALSE(m.sections[1].compact);
}
