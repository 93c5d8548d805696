#include "core/report/scan_json.h"

#include <gtest/gtest.h>

#include <random>

#include "core/scan/rate_scan.h"
#include "tests/core/scan/synthetic_table.h"

using namespace foldline;

// The published interface: every key the README documents is present with the right type.
TEST(ScanJson, DocumentedKeysAndNulls) {
    std::mt19937_64 rng(4);
    Table t = foldline::testing::planted_reversal(rng, 3000, 0.05, 1);
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg("group=B,A", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok());
    auto c = select_candidates(t, {"approved", "group"}, CandidateOptions{}, t.column("group"));
    ASSERT_TRUE(c.ok());
    RateScanOptions o;
    o.bootstrap = 50;
    auto r = rate_scan(t, *q, *c, o);
    ASSERT_TRUE(r.ok());
    const auto j = scan_to_json(*r, DataInfo{"x.csv", "abc", 3000});
    EXPECT_EQ(j["version"], 1);
    EXPECT_EQ(j["data"]["path"], "x.csv");
    EXPECT_EQ(j["data"]["sha256"], "abc");
    EXPECT_EQ(j["data"]["rows"], 3000);
    for (const char* k : {"outcome", "positive", "exposure", "focal", "reference"})
        EXPECT_TRUE(j["question"].contains(k)) << k;
    EXPECT_EQ(j["question"]["focal"], "B");
    EXPECT_TRUE(j["excluded"].is_array());
    ASSERT_EQ(j["findings"].size(), 3u);
    const auto& f = j["findings"][0];
    EXPECT_EQ(f["kind"], "rate");
    EXPECT_EQ(f["strata"][0], "product");
    EXPECT_EQ(f["class"], "reversal");
    EXPECT_EQ(f["reversal"], true);
    for (const char* k : {"p_reversal", "q_value", "stability"}) EXPECT_TRUE(f[k].is_number()) << k;
    for (const char* k : {"rate_focal", "rate_reference", "rd", "rr", "or", "selection_ratio"})
        EXPECT_TRUE(f["crude"][k].is_number()) << k;
    EXPECT_EQ(f["crude"]["rd_ci"].size(), 2u);
    for (const char* k : {"mh_or", "mh_or_ci", "mh_rr", "mh_rr_ci", "mh_rd", "mh_rd_ci", "std_rd", "std_rd_ci"})
        EXPECT_TRUE(f["adjusted"].contains(k)) << k;
    for (const char* k : {"statistic", "p"}) {
        EXPECT_TRUE(f["cmh"][k].is_number());
        EXPECT_TRUE(f["breslow_day"][k].is_number());
    }
    EXPECT_TRUE(f["decomposition"]["within"].is_number());
    EXPECT_TRUE(f["decomposition"]["composition"].is_number());
    EXPECT_TRUE(f["e_value"]["estimate"].is_number());
    ASSERT_EQ(f["strata_table"].size(), 3u);
    for (const char* k : {"level", "n_focal", "pos_focal", "n_reference", "pos_reference", "rd", "rd_ci",
                          "selection_ratio"})
        EXPECT_TRUE(f["strata_table"][0].contains(k)) << k;
    EXPECT_TRUE(f["strata_table"][0]["n_focal"].is_number_integer());
    EXPECT_TRUE(f["uninformative"].is_array());
    EXPECT_TRUE(f["verdict"].is_null());
    // A stable finding carries no stability (null, not NaN) and the text parses back.
    const auto& last = j["findings"].back();
    if (last["class"] == "stable") {
        EXPECT_TRUE(last["stability"].is_null());
    }
    const auto parsed = nlohmann::json::parse(scan_json_text(*r, DataInfo{}));
    EXPECT_EQ(parsed["findings"].size(), 3u);
}

// The streamed text is the same document as the tree (every key and value), including labels
// that need escaping and undefined numbers.
TEST(ScanJson, StreamedTextEqualsTree) {
    foldline::testing::TableBuilder b({"group", "approved", "site \"north\""});
    for (int i = 0; i < 400; ++i)
        b.add_row({i % 2 ? "B" : "A", (i * 7) % 5 < 2 ? "1" : "0", i % 3 == 0 ? "back\\slash" : "tab\there"});
    for (int i = 0; i < 5; ++i) b.add_row({"B", "1", "only \"B\"\n"});
    Table t = b.build();
    QuestionSpec s;
    parse_outcome_arg("approved=1", s);
    parse_exposure_arg("group=B,A", s);
    auto q = resolve_question(t, s);
    ASSERT_TRUE(q.ok());
    auto c = select_candidates(t, {"approved", "group"}, CandidateOptions{}, t.column("group"));
    ASSERT_TRUE(c.ok());
    auto r = rate_scan(t, *q, *c, RateScanOptions{});
    ASSERT_TRUE(r.ok());
    const DataInfo info{"d.csv", "00ff", 405};
    const auto tree = scan_to_json(*r, info);
    const auto text = nlohmann::json::parse(scan_json_text(*r, info));
    EXPECT_EQ(text, tree) << nlohmann::json::diff(tree, text).dump();
    EXPECT_EQ(text["findings"][0]["strata"][0], "site \"north\"");
}
