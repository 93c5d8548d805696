// Tests of core/causal/diagram_file.h: JSON round trip, error positions, atomic save and the
// DOT export's quoting (DOT quoted-string rules: Graphviz "The DOT Language" reference,
// section on IDs — only \" is an escape in IDs; \\ and \n are read by label escStrings).
#include "core/causal/diagram_file.h"

#include <filesystem>
#include <fstream>
#include <random>

#include <gtest/gtest.h>

using namespace foldline::causal;

namespace {

Diagram sample() {
    Diagram d;
    d.nodes = {{"income band", true, 10.5, -3.0}, {"say \"hi\"\\", true, {}, {}}, {"héllo", false, 1.0, 2.0}};
    d.edges = {{"income band", "say \"hi\"\\"}, {"héllo", "income band"}};
    d.exposure = "income band";
    d.outcome = "say \"hi\"\\";
    return d;
}

void expect_same(const Diagram& a, const Diagram& b) {
    ASSERT_EQ(a.nodes.size(), b.nodes.size());
    for (std::size_t i = 0; i < a.nodes.size(); ++i) {
        EXPECT_EQ(a.nodes[i].name, b.nodes[i].name);
        EXPECT_EQ(a.nodes[i].observed, b.nodes[i].observed);
        EXPECT_EQ(a.nodes[i].x, b.nodes[i].x);
        EXPECT_EQ(a.nodes[i].y, b.nodes[i].y);
    }
    ASSERT_EQ(a.edges.size(), b.edges.size());
    for (std::size_t i = 0; i < a.edges.size(); ++i) {
        EXPECT_EQ(a.edges[i].from, b.edges[i].from);
        EXPECT_EQ(a.edges[i].to, b.edges[i].to);
    }
    EXPECT_EQ(a.exposure, b.exposure);
    EXPECT_EQ(a.outcome, b.outcome);
}

}  // namespace

TEST(DiagramFile, RoundTripsThroughTextAndFile) {
    Diagram d = sample();
    auto back = parse_diagram(diagram_to_json_text(d));
    ASSERT_TRUE(back.ok()) << back.error().to_string();
    expect_same(d, *back);

    auto dir = std::filesystem::temp_directory_path() / "foldline_diagram_file_test";
    std::filesystem::create_directories(dir);
    const std::string path = (dir / "round.diagram.json").string();
    ASSERT_TRUE(write_diagram(d, path).ok());
    d.nodes[0].x = 99.0;  // overwrite an existing file
    ASSERT_TRUE(write_diagram(d, path).ok());
    auto read = read_diagram(path);
    ASSERT_TRUE(read.ok()) << read.error().to_string();
    expect_same(d, *read);
    std::size_t files = 0;
    for (auto& e : std::filesystem::directory_iterator(dir)) files += e.is_regular_file() ? 1 : 0;
    EXPECT_EQ(files, 1u) << "no temporary file may be left behind";
    std::filesystem::remove_all(dir);
}

TEST(DiagramFile, ObservedDefaultsToTrueAndEdgesMayBeAbsent) {
    auto d = parse_diagram(R"({"nodes":[{"name":"a"}]})");
    ASSERT_TRUE(d.ok());
    EXPECT_TRUE(d->nodes[0].observed);
    EXPECT_FALSE(d->nodes[0].x.has_value());
    EXPECT_TRUE(d->edges.empty());
}

TEST(DiagramFile, ReportsSyntaxErrorsWithLineAndColumn) {
    auto d = parse_diagram("{\n  \"nodes\": [\n    {\"name\": \"a\",}\n  ]\n}", "bad.json");
    ASSERT_FALSE(d.ok());
    EXPECT_EQ(d.error().file, "bad.json");
    EXPECT_EQ(d.error().line, 3u);
    EXPECT_EQ(d.error().column, 18u);  // the '}' after the trailing comma
    EXPECT_NE(d.error().message.find("not valid JSON"), std::string::npos);
}

TEST(DiagramFile, NumberBeyondDoubleRangeIsAnErrorNotACrash) {
    // Regression found by fuzz_diagram_file (tests/fuzz/corpus/diagram_file/regression_number_overflow).
    auto d = parse_diagram("{\"nodes\": [{\"name\": \"a\", \"x\": 1e400}]}", "big.diagram.json");
    ASSERT_FALSE(d.ok());
    EXPECT_EQ(d.error().line, 1u);
    EXPECT_EQ(d.error().column, 31u);  // the '1' of 1e400
    EXPECT_NE(d.error().message.find("not valid JSON: number overflow"), std::string::npos) << d.error().message;
}

TEST(DiagramFile, ReportsStructuralErrorsByElement) {
    EXPECT_EQ(parse_diagram(R"({"nodes":[{"name":"a","observed":"yes"}]})").error().message,
              "nodes[0].observed: expected true or false");
    EXPECT_EQ(parse_diagram(R"({"nodes":[{"name":3}]})").error().message, "nodes[0].name: expected a string");
    EXPECT_EQ(parse_diagram(R"({"nodes":[],"edges":[{"from":"a"}]})").error().message,
              "edges[0]: missing \"to\" (expected a string)");
    EXPECT_EQ(parse_diagram(R"({"nodes":[{"name":"a","x":"left"}]})").error().message, "nodes[0].x: expected a number");
    EXPECT_EQ(parse_diagram("[]").error().message, "expected a JSON object with \"nodes\" and \"edges\"");
    EXPECT_FALSE(parse_diagram("").ok());
    EXPECT_EQ(read_diagram("/nonexistent/x.diagram.json").error().to_string(),
              "/nonexistent/x.diagram.json: cannot open the diagram file for reading");
}

TEST(DiagramFile, DotQuotesAndEscapesNames) {
    EXPECT_EQ(dot_quoted("plain"), "\"plain\"");
    EXPECT_EQ(dot_quoted("a \"b\""), "\"a \\\"b\\\"\"");
    EXPECT_EQ(dot_quoted("back\\slash"), "\"back\\\\slash\"");
    EXPECT_EQ(dot_quoted("two\nlines"), "\"two\\nlines\"");
    EXPECT_EQ(dot_quoted("ends with \\"), "\"ends with \\\\\"");  // must not escape the closing quote
    const std::string dot = diagram_to_dot(sample());
    EXPECT_EQ(dot,
              "digraph diagram {\n"
              "  \"income band\" [shape=box];\n"
              "  \"say \\\"hi\\\"\\\\\" [shape=box];\n"
              "  \"héllo\" [style=dashed];\n"
              "  \"income band\" -> \"say \\\"hi\\\"\\\\\";\n"
              "  \"héllo\" -> \"income band\";\n"
              "}\n");
    EXPECT_EQ(diagram_to_dot(Diagram{}), "digraph diagram {\n}\n");
}

TEST(DiagramFile, MutatedInputGivesAnErrorOrADiagramNeverACrash) {
    // Robustness: random byte edits of a valid file must come back as a value or an Error,
    // and whatever parses must build or be rejected with a message.
    const std::string base = diagram_to_json_text(sample());
    std::mt19937 rng(5);
    std::size_t parsed = 0, rejected = 0;
    for (int i = 0; i < 3000; ++i) {
        std::string text = base;
        const int edits = 1 + static_cast<int>(rng() % 4);
        for (int e = 0; e < edits; ++e) {
            std::size_t at = rng() % text.size();
            switch (rng() % 3) {
                case 0: text[at] = static_cast<char>(rng() % 256); break;
                case 1: text.erase(at, 1 + rng() % 8); break;
                default: text.insert(at, 1, "{}[],:\"\\0ab"[rng() % 11]);
            }
            if (text.empty()) text.assign(1, '{');
        }
        auto d = parse_diagram(text, "m.json");
        if (!d) {
            ++rejected;
            EXPECT_EQ(d.error().file, "m.json");
            EXPECT_FALSE(d.error().message.empty());
            continue;
        }
        ++parsed;
        auto cg = CausalGraph::build(*d, "m.json");
        if (!cg) {
            EXPECT_FALSE(cg.error().message.empty());
        }
    }
    EXPECT_GT(parsed, 100u);
    EXPECT_GT(rejected, 100u);
}
