// Tests of core/report/causal_json.h: field names and values of the verdict and adjustment
// JSON on a confounder diagram (answers as in Hernán & Robins, What If, ch. 7 [from memory]).
#include "core/report/causal_json.h"

#include <gtest/gtest.h>

using namespace foldline;
using namespace foldline::causal;

namespace {

CausalGraph confounded() {
    Diagram d;
    d.nodes = {{"Z", true, {}, {}}, {"X", true, {}, {}}, {"Y", true, {}, {}}, {"U", false, {}, {}}};
    d.edges = {{"Z", "X"}, {"Z", "Y"}, {"X", "Y"}, {"U", "Z"}};
    return std::move(*CausalGraph::build(d));
}

}  // namespace

TEST(CausalJson, VerdictFields) {
    auto v = decide(confounded(), "X", "Y", {"Z"});
    ASSERT_TRUE(v.ok());
    auto j = report::to_json(*v);
    EXPECT_EQ(j["answer"], "stratified");
    EXPECT_EQ(j["stratifier"], nlohmann::json::array({"Z"}));
    EXPECT_EQ(j["stratifier_roles"][0]["role"], "confounder");
    EXPECT_EQ(j["standardise_over"], nlohmann::json::array({"Z"}));
    EXPECT_EQ(j["valid_sets"], nlohmann::json::parse(R"([["Z"]])"));
    EXPECT_EQ(j["empty_set_valid"], false);
    EXPECT_EQ(j["direct_effect"]["applies"], false);
    EXPECT_TRUE(j["reason"].is_string());
    EXPECT_EQ(j["roles"].size(), 2u);
    EXPECT_EQ(j["roles"][1]["name"], "U");
    EXPECT_EQ(j["roles"][1]["observed"], false);
    EXPECT_EQ(j["roles"][1]["role"], "confounder");
}

TEST(CausalJson, AdjustmentFieldsAndNullWhenNotIdentifiable) {
    auto r = analyse_adjustment(confounded(), "X", "Y");
    ASSERT_TRUE(r.ok());
    auto j = report::to_json(*r);
    EXPECT_EQ(j["smallest"], nlohmann::json::array({"Z"}));
    EXPECT_EQ(j["identifiable"], true);
    Diagram d;
    d.nodes = {{"X", true, {}, {}}, {"Y", true, {}, {}}, {"U", false, {}, {}}};
    d.edges = {{"U", "X"}, {"U", "Y"}, {"X", "Y"}};
    auto cg = CausalGraph::build(d);
    auto none = analyse_adjustment(*cg, "X", "Y");
    ASSERT_TRUE(none.ok());
    auto jn = report::to_json(*none);
    EXPECT_TRUE(jn["smallest"].is_null());
    EXPECT_EQ(jn["unobserved_needed"], nlohmann::json::array({"U"}));
    EXPECT_EQ(jn["minimal_sets"], nlohmann::json::array());
    auto v = decide(*cg, "X", "Y", {});
    EXPECT_TRUE(report::to_json(*v)["standardise_over"].is_null());
    EXPECT_EQ(report::to_json(*v)["answer"], "not_identifiable");
}
