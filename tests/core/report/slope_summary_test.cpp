// Tests of core/report/slope_summary.h on the committed retail sample, whose generator
// (sample_data/generate_retail.py) plants a reversal of weekly_sales on promo_spend by
// store_format; and of the whole-scan JSON (slope_scan_to_json) against the key list of the
// README's "Slope findings" section.
#include "core/report/slope_summary.h"

#include "core/io/csv_reader.h"
#include "core/report/slope_json.h"

#include <gtest/gtest.h>

using namespace foldline;

namespace {

SlopeScanResult retail_scan(bool groups) {
    auto t = read_csv(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/retail_weeks.csv", CsvOptions{}, nullptr);
    EXPECT_TRUE(t.ok());
    static Table table;  // candidates point into the table
    table = std::move(t.value());
    SlopeQuestion q;
    q.x = "promo_spend";
    q.y = "weekly_sales";
    auto r = run_slope_scan(table, q, CandidateOptions{}, true, groups);
    EXPECT_TRUE(r.ok()) << (r.ok() ? "" : r.error().to_string());
    return r.ok() ? std::move(r.value()) : SlopeScanResult{};
}

}  // namespace

TEST(SlopeSummary, RetailReversalLeadsTheSummary) {
    const SlopeScanResult r = retail_scan(false);
    ASSERT_EQ(r.candidates.size(), 4u);  // store_format, region, quarter, footfall (binned)
    const std::string text = slope_summary_text(r);
    EXPECT_EQ(text.rfind("Slope of weekly_sales on promo_spend\n", 0), 0u);
    EXPECT_NE(text.find("pooled slope 21.57"), std::string::npos) << text;
    const auto first = text.find("  reversal  by store_format");
    EXPECT_NE(first, std::string::npos) << text;
    EXPECT_NE(text.find("not a legal or clinical determination"), std::string::npos);

    SlopeScanResult empty;
    EXPECT_NE(slope_summary_text(empty).find("no checks"), std::string::npos);
}

TEST(SlopeSummary, WholeScanJsonHasTheDocumentedLayout) {
    const SlopeScanResult r = retail_scan(true);
    const auto j = slope_scan_to_json(r, DataInfo{"retail_weeks.csv", "abc", 5000});
    for (const char* k : {"version", "data", "question", "settings", "candidates", "excluded", "summary", "findings"})
        EXPECT_TRUE(j.contains(k)) << k;
    EXPECT_EQ(j["question"]["kind"], "slope");
    EXPECT_EQ(j["question"]["exposure"], "promo_spend");
    EXPECT_EQ(j["summary"]["checks"], 10);
    EXPECT_EQ(j["findings"].size(), 11u);  // 4 singles + 6 pairs + the latent finding
    EXPECT_EQ(j["findings"].back()["kind"], "latent");
    EXPECT_EQ(j["findings"][0]["kind"], "slope");
    EXPECT_EQ(j["findings"][0]["class"], "reversal");
    EXPECT_GE(j["summary"]["classes"]["reversal"].get<int>(), 4);
}
