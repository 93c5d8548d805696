// Tests of core/audit/audit_spec.h: the settings' one rule, and that a spec maps losslessly to
// and from the project file (a Project is an AuditSpec plus reviews and memo settings).
#include "core/audit/audit_spec.h"

#include <gtest/gtest.h>

#include <filesystem>

#include "core/audit/project_file.h"

using namespace foldline;
using namespace foldline::project;

TEST(AuditSpec, SettingsProblemsNameEachSettingOutOfRange) {
    ScanSettings s;
    EXPECT_TRUE(settings_problems(s).empty());
    s.alpha = 0.5;  // the upper end is allowed, in the workbench as on the command line
    s.seed = 18446744073709551615ull;
    s.max_levels = 7;
    s.bins = 0;
    EXPECT_TRUE(settings_problems(s).empty());
    s.alpha = 0.51;
    s.bins = 1001;
    s.max_levels = 1;
    s.bootstrap = -1;
    s.slope_bootstrap = 2000000;
    EXPECT_EQ(settings_problems(s).size(), 5u);
    s = {};
    s.alpha = 0;
    ASSERT_EQ(settings_problems(s).size(), 1u);
    EXPECT_NE(settings_problems(s)[0].find("alpha"), std::string::npos);
}

TEST(AuditSpec, NonDefaultSpecRoundTripsThroughTheProjectFile) {
    Project p;
    p.data.path = "/tmp/some/where/data.csv";
    p.data.count_column = "n";
    p.question.kind = QuestionKind::Rate;
    p.question.outcome = "approved";
    p.question.positive = "1";
    p.question.exposure = "applicant_group";
    p.question.focal = {"B"};
    p.question.reference = "A";
    p.scan.strata = {"product", "branch"};
    p.scan.pairs = false;
    p.scan.bins = 6;
    p.scan.max_levels = 7;
    p.scan.alpha = 0.5;
    p.scan.bootstrap = 17;
    p.scan.seed = (1ull << 40) + 3;  // above 2^32: the workbench once kept seeds as 32 bits
    p.scan.slope_bootstrap = 9;
    p.scan.find_groups = true;
    p.trend = TrendSettings{"income", "loan_amount", {"credit_score"}};
    causal::Diagram d;
    d.nodes = {{"applicant_group", true, 1.0, 2.0}, {"approved", true, 3.0, 4.0}};
    d.edges = {{"applicant_group", "approved"}};
    p.diagrams = {{"first", d}, {"second", d}};
    p.active_diagram = "second";
    const std::string path = (std::filesystem::temp_directory_path() / "audit_spec_test.foldline").string();
    const std::string text = project_to_json_text(p, path);
    auto back = parse_project(text, path);
    ASSERT_TRUE(back.ok()) << back.error().to_string();
    const AuditSpec& a = *back;
    EXPECT_EQ(a.scan.seed, (1ull << 40) + 3);
    EXPECT_EQ(a.scan.max_levels, 7u);
    EXPECT_EQ(a.scan.bins, 6);
    EXPECT_EQ(a.scan.alpha, 0.5);
    EXPECT_EQ(a.scan.bootstrap, 17);
    EXPECT_EQ(a.scan.slope_bootstrap, 9);
    EXPECT_TRUE(a.scan.find_groups);
    EXPECT_FALSE(a.scan.pairs);
    EXPECT_EQ(a.scan.strata, (std::vector<std::string>{"product", "branch"}));
    EXPECT_EQ(a.question.focal, (std::vector<std::string>{"B"}));
    EXPECT_EQ(*a.question.reference, "A");
    EXPECT_EQ(*a.question.positive, "1");
    ASSERT_TRUE(a.trend.has_value());
    EXPECT_EQ(*a.trend, (TrendSettings{"income", "loan_amount", {"credit_score"}}));
    EXPECT_EQ(a.data.path, p.data.path);
    EXPECT_EQ(a.data.count_column, "n");
    ASSERT_EQ(a.diagrams.size(), 2u);
    EXPECT_EQ(a.active_diagram, "second");
    ASSERT_NE(a.diagram(), nullptr);
    EXPECT_EQ(a.diagram(), &a.diagrams[1].diagram);
    // And written again, the same bytes.
    EXPECT_EQ(project_to_json_text(*back, path), text);
}

TEST(AuditSpec, FindGroupsIsWrittenOnlyWhenAskedSoOlderProjectsKeepTheirBytes) {
    Project p;
    p.question.outcome = "y";
    p.question.exposure = "g";
    const std::string text = project_to_json_text(p, "x.foldline");
    EXPECT_EQ(text.find("find_groups"), std::string::npos);
    p.scan.find_groups = true;
    EXPECT_NE(project_to_json_text(p, "x.foldline").find("\"find_groups\": true"), std::string::npos);
    EXPECT_EQ(required_version(p), 2);
}

TEST(AuditSpec, ActiveDiagramFallsBackToTheFirst) {
    AuditSpec s;
    EXPECT_EQ(s.diagram(), nullptr);
    s.diagrams = {{"a", {}}, {"b", {}}};
    EXPECT_EQ(s.diagram(), &s.diagrams[0].diagram);
    s.active_diagram = "b";
    EXPECT_EQ(s.diagram(), &s.diagrams[1].diagram);
    s.active_diagram = "gone";
    EXPECT_EQ(s.diagram(), &s.diagrams[0].diagram);
}
