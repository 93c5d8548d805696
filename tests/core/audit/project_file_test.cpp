// Tests of core/audit/project_file.h: the NAME.foldline schema, its round trips, atomic saves and
// the data-change check. The JSON it writes is also read back by Python's json module in
// tests/reference/memo_reference.py (an outside parser).
#include "core/audit/project_file.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/common/atomic_file.h"
#include "core/common/sha256.h"
#include "core/io/csv_reader.h"

namespace fs = std::filesystem;
using namespace foldline;
using namespace foldline::project;

namespace {

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::stringstream s;
    s << in.rdbuf();
    return s.str();
}

void spit(const fs::path& p, const std::string& text) {
    std::ofstream out(p, std::ios::binary);
    out << text;
}

struct TempDir {
    fs::path path;
    explicit TempDir(const std::string& tag)
        : path(fs::temp_directory_path() / ("foldline-project-" + tag + "-" + std::to_string(::getpid()))) {
        fs::remove_all(path);
        fs::create_directories(path);
    }
    ~TempDir() {
        std::error_code ec;
        fs::permissions(path, fs::perms::owner_all, ec);
        fs::remove_all(path, ec);
    }
};

std::size_t entries(const fs::path& dir) {
    return static_cast<std::size_t>(std::distance(fs::directory_iterator(dir), fs::directory_iterator()));
}

const char* kCsv = "group,approved,product\nA,1,car\nB,0,home\nA,0,home\n";

// A project that touches every field, with awkward text in names and notes.
Project full_project(const fs::path& data) {
    Project p;
    p.data.path = data.string();
    p.data.count_column = "";
    p.data.delimiter = ';';
    p.data.missing_markers = {"", "NA", "-"};
    p.data.type_overrides = {{"branch", ColumnType::Categorical}, {"score", ColumnType::Numeric}};
    p.question.outcome = "approved";
    p.question.positive = "1";
    p.question.exposure = "group";
    p.question.focal = {"B"};
    p.question.reference = "A";
    p.scan.strata = {"product", "<b>x</b>"};
    p.scan.pairs = false;
    p.scan.bins = 5;
    p.scan.alpha = 0.01;
    p.scan.bootstrap = 250;
    p.scan.seed = 18446744073709551615ull;  // the largest seed must survive
    causal::Diagram d;
    d.nodes = {{"group", true, 10.5, 20.25}, {"product", true, std::nullopt, std::nullopt},
               {"approved", true, 300, 40}, {"hidden", false, 1e-3, -7}};
    d.edges = {{"group", "product"}, {"product", "approved"}, {"hidden", "approved"}};
    d.exposure = "group";
    d.outcome = "approved";
    p.diagrams.push_back({"as drawn", d});
    p.diagrams.push_back({"alternative", causal::Diagram{}});
    p.active_diagram = "as drawn";
    auto& r1 = p.review_for({"rate", {"product"}, "B vs A"});
    r1.saved_class = FindingClass::Reversal;
    r1.decision = Decision::Upheld;
    r1.note = "Checked with the branch managers. <script>alert(1)</script> \"quoted\" \u05e9\u05dc\u05d5\u05dd\nline 2";
    r1.in_memo = true;
    auto& r0 = p.review_for({"rate", {"branch", "product"}, "B vs A"});
    r0.saved_class = FindingClass::Stable;
    r0.decision = Decision::SetAside;
    r0.in_memo = false;
    p.memo.title = "Q3 approvals";
    p.memo.analyst = "R. Okafor";
    p.memo.page_size = PageSize::Letter;
    p.memo.findings = "chosen";
    return p;
}

}  // namespace

TEST(ProjectFile, SaveLoadSaveIsByteIdentical) {
    TempDir t("roundtrip");
    spit(t.path / "data.csv", kCsv);
    const auto file = (t.path / "audit.foldline").string();
    Project p = full_project(t.path / "data.csv");
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string first = slurp(file);
    auto loaded = load_project(file);
    ASSERT_TRUE(loaded.ok()) << loaded.error().to_string();
    ASSERT_TRUE(save_project(*loaded, file).ok());
    EXPECT_EQ(slurp(file), first);

    // Every field came back.
    const Project& q = *loaded;
    EXPECT_EQ(fs::path(q.data.path), (t.path / "data.csv").lexically_normal());
    EXPECT_EQ(q.data.delimiter, ';');
    EXPECT_EQ(q.data.missing_markers, (std::vector<std::string>{"", "NA", "-"}));
    EXPECT_EQ(q.data.type_overrides.at("score"), ColumnType::Numeric);
    EXPECT_EQ(q.question.positive.value(), "1");
    EXPECT_EQ(q.question.reference.value(), "A");
    EXPECT_EQ(q.scan.strata, (std::vector<std::string>{"product", "<b>x</b>"}));
    EXPECT_FALSE(q.scan.pairs);
    EXPECT_EQ(q.scan.bins, 5);
    EXPECT_DOUBLE_EQ(q.scan.alpha, 0.01);
    EXPECT_EQ(q.scan.bootstrap, 250);
    EXPECT_EQ(q.scan.seed, 18446744073709551615ull);
    ASSERT_EQ(q.diagrams.size(), 2u);
    ASSERT_NE(q.diagram(), nullptr);
    EXPECT_EQ(q.diagram()->nodes.size(), 4u);
    EXPECT_FALSE(q.diagram()->nodes[3].observed);
    EXPECT_DOUBLE_EQ(*q.diagram()->nodes[0].y, 20.25);
    EXPECT_FALSE(q.diagram()->nodes[1].x.has_value());
    const auto* r = q.review({"rate", {"product"}, "B vs A"});
    ASSERT_NE(r, nullptr);
    EXPECT_EQ(r->decision, Decision::Upheld);
    EXPECT_EQ(r->saved_class, FindingClass::Reversal);
    EXPECT_NE(r->note.find("<script>alert(1)</script>"), std::string::npos);
    EXPECT_NE(r->note.find("\u05e9\u05dc\u05d5\u05dd\nline 2"), std::string::npos);
    EXPECT_EQ(q.memo.page_size, PageSize::Letter);
    EXPECT_EQ(q.memo.findings, "chosen");
    // Reviews are written sorted by key, whatever order they were made in.
    EXPECT_EQ(q.reviews.front().key.strata.front(), "branch");
    // No data row is stored: the cell values of the file appear nowhere.
    EXPECT_EQ(first.find("car"), std::string::npos);
}

TEST(ProjectFile, DefaultProjectRoundTrips) {
    TempDir t("default");
    const auto file = (t.path / "empty.foldline").string();
    Project p;
    p.question.outcome = "y";
    p.question.exposure = "x";
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string first = slurp(file);
    auto loaded = load_project(file);
    ASSERT_TRUE(loaded.ok()) << loaded.error().to_string();
    EXPECT_TRUE(loaded->scan.strata.empty());  // "auto"
    EXPECT_EQ(loaded->scan.seed, 20240601u);
    EXPECT_EQ(loaded->diagram(), nullptr);
    ASSERT_TRUE(save_project(*loaded, file).ok());
    EXPECT_EQ(slurp(file), first);
}

TEST(ProjectFile, DataPathIsStoredRelativeAndSurvivesAMove) {
    TempDir t("move");
    fs::create_directories(t.path / "before" / "extracts");
    spit(t.path / "before" / "extracts" / "data.csv", kCsv);
    Project p = full_project(t.path / "before" / "extracts" / "data.csv");
    ASSERT_TRUE(save_project(p, (t.path / "before" / "audit.foldline").string()).ok());
    EXPECT_NE(slurp(t.path / "before" / "audit.foldline").find("\"path\": \"extracts/data.csv\""), std::string::npos);

    fs::rename(t.path / "before", t.path / "after");
    auto loaded = load_project((t.path / "after" / "audit.foldline").string());
    ASSERT_TRUE(loaded.ok()) << loaded.error().to_string();
    EXPECT_TRUE(fs::exists(loaded->data.path)) << loaded->data.path;
    EXPECT_EQ(fs::path(loaded->data.path), (t.path / "after" / "extracts" / "data.csv").lexically_normal());
    EXPECT_EQ(slurp(loaded->data.path), kCsv);
}

TEST(ProjectFile, RelativeProjectPathResolvesDataFromItsFolder) {
    TempDir t("relative");
    spit(t.path / "data.csv", kCsv);
    Project p = full_project(t.path / "data.csv");
    ASSERT_TRUE(save_project(p, (t.path / "a.foldline").string()).ok());
    const auto old = fs::current_path();
    fs::current_path(t.path.parent_path());
    auto loaded = load_project((t.path.filename() / "a.foldline").string());
    fs::current_path(old);
    ASSERT_TRUE(loaded.ok());
    EXPECT_EQ(loaded->data.path, (t.path.filename() / "data.csv").string());
}

TEST(ProjectFile, FailureBeforeRenameLeavesPreviousFileIntact) {
    TempDir t("atomic");
    const auto file = (t.path / "audit.foldline").string();
    Project p = full_project(t.path / "data.csv");
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string before = slurp(file);
    p.memo.title = "a different title";
    set_atomic_write_fault_for_testing(true);
    auto st = save_project(p, file);
    set_atomic_write_fault_for_testing(false);
    ASSERT_FALSE(st.ok());
    EXPECT_NE(st.error().message.find("unchanged"), std::string::npos) << st.error().message;
    EXPECT_EQ(slurp(file), before);
    EXPECT_EQ(entries(t.path), 1u);  // no temporary file left
}

TEST(ProjectFile, MissingFolderGivesClearMessage) {
    TempDir t("missing");
    const auto file = (t.path / "no-such-folder" / "audit.foldline").string();
    auto st = save_project(Project{}, file);
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().file, file);
    EXPECT_NE(st.error().message.find("does not exist"), std::string::npos) << st.error().message;
    EXPECT_FALSE(fs::exists(t.path / "no-such-folder"));
}

TEST(ProjectFile, ReadOnlyFolderGivesClearMessage) {
    TempDir t("readonly");
    std::string file;
    if (::geteuid() == 0) {
        // Root ignores permission bits; /proc refuses new files to everyone.
        file = "/proc/foldline-readonly-test.foldline";
    } else {
        file = (t.path / "audit.foldline").string();
        fs::permissions(t.path, fs::perms::owner_read | fs::perms::owner_exec);
    }
    auto st = save_project(Project{}, file);
    ASSERT_FALSE(st.ok());
    EXPECT_EQ(st.error().file, file);
    EXPECT_NE(st.error().message.find("cannot save the project"), std::string::npos) << st.error().message;
    EXPECT_NE(st.error().message.find("temporary file"), std::string::npos) << st.error().message;
}

TEST(ProjectFile, NewerVersionIsRefusedAndFileUntouched) {
    TempDir t("newer");
    const auto file = (t.path / "audit.foldline").string();
    ASSERT_TRUE(save_project(full_project(t.path / "d.csv"), file).ok());
    std::string text = slurp(file);
    const auto pos = text.rfind("\"version\": 1");  // the top-level key sorts last
    ASSERT_NE(pos, std::string::npos);
    text.replace(pos, 12, "\"version\": 7");
    spit(file, text);
    auto loaded = load_project(file);
    ASSERT_FALSE(loaded.ok());
    EXPECT_NE(loaded.error().message.find("newer Foldline (project version 7"), std::string::npos)
        << loaded.error().message;
    EXPECT_EQ(loaded.error().file, file);
    EXPECT_EQ(slurp(file), text);
}

TEST(ProjectFile, NumberBeyondDoubleRangeIsAnErrorNotACrash) {
    // Regression found by fuzz_project_file (tests/fuzz/corpus/project_file/regression_number_overflow).
    auto p = parse_project("{\n  \"format\": 2e410\n}", "big.foldline");
    ASSERT_FALSE(p.ok());
    EXPECT_EQ(p.error().file, "big.foldline");
    EXPECT_EQ(p.error().line, 2u);
    EXPECT_EQ(p.error().column, 13u);
    EXPECT_NE(p.error().message.find("not a readable project (damaged or not JSON): number overflow"),
              std::string::npos)
        << p.error().message;
}

TEST(ProjectFile, CorruptFilesGiveClearErrors) {
    TempDir t("corrupt");
    const auto file = (t.path / "audit.foldline").string();
    ASSERT_TRUE(save_project(full_project(t.path / "d.csv"), file).ok());
    const std::string good = slurp(file);

    // Truncated in the middle (a crash of some other writer): a syntax error with its place.
    const std::string cut = good.substr(0, good.size() / 2);
    spit(file, cut);
    auto a = load_project(file);
    ASSERT_FALSE(a.ok());
    EXPECT_NE(a.error().message.find("not a readable project"), std::string::npos) << a.error().message;
    EXPECT_GT(a.error().line, 1u);
    EXPECT_EQ(slurp(file), cut);

    struct Case {
        std::string text, expect;
    };
    const std::vector<Case> cases = {
        {"", "empty file"},
        {"[1, 2]", "expected a JSON object"},
        {R"({"format": "foldline-diagram", "version": 1})", "not a Foldline project"},
        {R"({"format": "foldline-project", "version": "1"})", "version"},
        {R"({"format": "foldline-project", "version": 1})", "data: missing"},
        {R"({"format": "foldline-project", "version": 1, "data": {"path": 3}, "question": {}})",
         "data.path: expected a string"},
        {R"({"format": "foldline-project", "version": 1, "data": {"path": "d.csv"},
             "question": {"outcome": "y", "exposure": "x"}, "scan": {"alpha": 2}})",
         "scan.alpha: number out of range"},
        {R"({"format": "foldline-project", "version": 1, "data": {"path": "d.csv"},
             "question": {"outcome": "y", "exposure": "x"}, "findings": [{"decision": "maybe"}]})",
         "findings[0].decision"},
        {R"({"format": "foldline-project", "version": 1, "data": {"path": "d.csv"},
             "question": {"outcome": "y", "exposure": "x"}, "diagrams": [{"name": "a", "diagram": {"edges": []}}]})",
         "diagrams[0].diagram"},
        {R"({"format": "foldline-project", "version": 1, "data": {"path": "d.csv"},
             "question": {"outcome": "y", "exposure": "x"}, "memo": {"page_size": "A5"}})",
         "memo.page_size"},
    };
    for (const auto& c : cases) {
        auto r = parse_project(c.text, "x.foldline");
        ASSERT_FALSE(r.ok()) << c.text;
        EXPECT_NE(r.error().message.find(c.expect), std::string::npos) << r.error().message;
        EXPECT_EQ(r.error().file, "x.foldline");
    }
}

TEST(ProjectFile, DataCheckReportsWhatChanged) {
    TempDir t("hash");
    const auto csv = t.path / "data.csv";
    spit(csv, kCsv);
    Project p;
    p.data.path = csv.string();
    auto table = read_csv(csv.string(), reading_options(p.data));
    ASSERT_TRUE(table.ok());
    ASSERT_TRUE(record_data(p.data, *table).ok());
    EXPECT_EQ(p.data.rows, 3u);
    EXPECT_EQ(p.data.size, std::string(kCsv).size());
    // FIPS 180-4 digest computed independently of the project code.
    EXPECT_EQ(p.data.sha256, sha256_hex(kCsv));

    auto same = check_data_file(p.data);
    EXPECT_FALSE(same.changed);
    EXPECT_EQ(same.message, "unchanged");

    spit(csv, "group,approved,channel\nA,1,web\nB,0,web\nA,0,app\nB,1,app\nB,1,web\n");
    auto c = check_data_file(p.data);
    EXPECT_TRUE(c.changed);
    EXPECT_TRUE(c.rows_known);
    EXPECT_EQ(c.rows_before, 3u);
    EXPECT_EQ(c.rows_now, 5u);
    EXPECT_EQ(c.columns_added, std::vector<std::string>{"channel"});
    EXPECT_EQ(c.columns_removed, std::vector<std::string>{"product"});
    EXPECT_NE(c.message.find("rows: 3 → 5"), std::string::npos) << c.message;
    EXPECT_NE(c.message.find("new columns: \"channel\""), std::string::npos) << c.message;
    EXPECT_NE(c.message.find("missing columns: \"product\""), std::string::npos) << c.message;

    // Same size, one byte different: still a change (the digest, not the size, decides).
    spit(csv, std::string(kCsv).replace(std::string(kCsv).find("car"), 3, "van"));
    auto d = check_data_file(p.data);
    EXPECT_TRUE(d.changed);
    EXPECT_NE(d.message.find("same number of rows (3)"), std::string::npos) << d.message;

    fs::remove(csv);
    auto gone = check_data_file(p.data);
    EXPECT_TRUE(gone.missing);
    EXPECT_NE(gone.message.find("cannot be read"), std::string::npos);
}

// Trend audits (version 2): a slope question with covariates, trend checks beside a rate
// question, and slope decisions keyed by project::slope_key.
TEST(ProjectFile, TrendProjectSaveLoadSaveIsByteIdentical) {
    TempDir t("trend");
    spit(t.path / "weeks.csv", "store,promo,sales,footfall\nkiosk,1.5,20,3\nmall,2.5,40,5\n");
    const auto file = (t.path / "trend.foldline").string();
    Project p;
    p.data.path = (t.path / "weeks.csv").string();
    p.question.kind = QuestionKind::Slope;
    p.question.outcome = "sales";
    p.question.exposure = "promo";
    p.question.covariates = {"footfall", "<b>x</b>"};
    p.scan.slope_bootstrap = 150;
    p.scan.pairs = false;
    auto& r = p.review_for(slope_key({"store"}, "promo", "sales"));
    r.saved_class = FindingClass::Reversal;
    r.decision = Decision::FollowUp;
    r.note = "Spend is pushed in weak weeks; ask the trading desk.\n\u05e9\u05dc\u05d5\u05dd";
    ASSERT_EQ(required_version(p), 2);
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string first = slurp(file);
    EXPECT_NE(first.find("\"version\": 2"), std::string::npos);
    EXPECT_NE(first.find("\"kind\": \"slope\""), std::string::npos);
    auto loaded = load_project(file);
    ASSERT_TRUE(loaded.ok()) << loaded.error().to_string();
    ASSERT_TRUE(save_project(*loaded, file).ok());
    EXPECT_EQ(slurp(file), first);
    EXPECT_EQ(loaded->question.kind, QuestionKind::Slope);
    EXPECT_EQ(loaded->question.covariates, (std::vector<std::string>{"footfall", "<b>x</b>"}));
    EXPECT_EQ(loaded->scan.slope_bootstrap, 150);
    EXPECT_FALSE(loaded->trend.has_value());
    const auto* rv = loaded->review(slope_key({"store"}, "promo", "sales"));
    ASSERT_NE(rv, nullptr);
    EXPECT_EQ(rv->key.comparison, "sales on promo");
    EXPECT_EQ(rv->decision, Decision::FollowUp);
    EXPECT_EQ(rv->saved_class, FindingClass::Reversal);
    EXPECT_EQ(rv->note, r.note);

    // Trend checks beside a rate question.
    Project q = full_project(t.path / "weeks.csv");
    q.trend = TrendSettings{"promo", "sales", {}};
    ASSERT_TRUE(save_project(q, file).ok());
    const std::string second = slurp(file);
    auto again = load_project(file);
    ASSERT_TRUE(again.ok()) << again.error().to_string();
    ASSERT_TRUE(again->trend.has_value());
    EXPECT_EQ(*again->trend, *q.trend);
    EXPECT_EQ(again->question.kind, QuestionKind::Rate);
    ASSERT_TRUE(save_project(*again, file).ok());
    EXPECT_EQ(slurp(file), second);
}

TEST(ProjectFile, RateProjectsStayVersionOneAndOldFilesLoad) {
    // A rate audit is written as version 1 with no version 2 key, so its bytes do not change and
    // a build that reads only version 1 still opens it.
    TempDir t("v1");
    const auto file = (t.path / "rate.foldline").string();
    const Project p = full_project(t.path / "d.csv");
    EXPECT_EQ(required_version(p), 1);
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string text = slurp(file);
    EXPECT_NE(text.find("\"version\": 1"), std::string::npos);
    for (const char* key : {"\"trend\"", "\"slope_bootstrap\"", "\"covariates\""})
        EXPECT_EQ(text.find(key), std::string::npos) << key;
    const auto question = text.find("\"question\": {");
    ASSERT_NE(question, std::string::npos);
    EXPECT_EQ(text.substr(question, text.find('}', question) - question).find("\"kind\""), std::string::npos);
    // A hand-written version 1 file without the version 2 keys reads as a rate question.
    auto old = parse_project(R"({"format": "foldline-project", "version": 1, "data": {"path": "d.csv"},
                                 "question": {"outcome": "ok", "exposure": "group"}})",
                             (t.path / "old.foldline").string());
    ASSERT_TRUE(old.ok()) << old.error().to_string();
    EXPECT_EQ(old->question.kind, QuestionKind::Rate);
    EXPECT_FALSE(old->trend.has_value());
    EXPECT_EQ(old->scan.slope_bootstrap, 0);
    // The committed sample projects (written before trend audits) still load.
    for (const char* sample : {"lender_audit.foldline", "clinic_audit.foldline"}) {
        auto s = load_project(std::string(FOLDLINE_SOURCE_DIR) + "/sample_data/" + sample);
        EXPECT_TRUE(s.ok()) << sample << ": " << (s.ok() ? "" : s.error().to_string());
    }
}

TEST(ProjectFile, TrendFieldsGiveClearErrors) {
    struct Case {
        std::string text, expect;
    };
    const std::string head = R"({"format": "foldline-project", "version": 2, "data": {"path": "d.csv"}, )";
    const std::vector<Case> cases = {
        {head + R"("question": {"kind": "ratio", "outcome": "y", "exposure": "x"}})", "question.kind"},
        {head + R"("question": {"kind": "slope", "outcome": "y", "exposure": "x", "positive": "1"}})",
         "a slope question has no positive"},
        {head + R"("question": {"kind": "slope", "outcome": "y", "exposure": "x", "covariates": "z"}})",
         "question.covariates: expected a list of strings"},
        {head + R"("question": {"outcome": "y", "exposure": "x"}, "trend": {"y": "s"}})", "trend.x: missing"},
        {head + R"("question": {"outcome": "y", "exposure": "x"}, "trend": {"x": "", "y": "s"}})",
         "trend: x and y must name"},
        {head + R"("question": {"outcome": "y", "exposure": "x"}, "trend": [1]})", "trend: expected an object"},
        {head + R"("question": {"outcome": "y", "exposure": "x"}, "scan": {"slope_bootstrap": -1}})",
         "scan.slope_bootstrap: number out of range"},
    };
    for (const auto& c : cases) {
        auto r = parse_project(c.text, "x.foldline");
        ASSERT_FALSE(r.ok()) << c.text;
        EXPECT_NE(r.error().message.find(c.expect), std::string::npos) << r.error().message;
    }
    // A version this build does not know is refused whatever it holds.
    auto newer = parse_project(R"({"format": "foldline-project", "version": 4})", "x.foldline");
    ASSERT_FALSE(newer.ok());
    EXPECT_NE(newer.error().message.find("reads up to version 3"), std::string::npos) << newer.error().message;
}

// A project over a database source keeps its record (masked connection, driver, database,
// table or query, rows, time of the query) through a save and a load, byte for byte.
TEST(ProjectFile, DatabaseSourceRoundTrips) {
    TempDir t("database");
    const auto file = (t.path / "warehouse.foldline").string();
    Project p;
    p.question.outcome = "approved";
    p.question.exposure = "group";
    DatabaseRecord db;
    db.connection = "Driver=PostgreSQL Unicode;Server=db.example;Uid=reader;PWD=***;";
    db.driver = "psqlodbcw.so 13.02.0000 (PostgreSQL)";
    db.database = "audit";
    db.query = "SELECT * FROM decisions WHERE year = 2025";
    db.rows = 1250000;
    db.queried_at = "2026-12-02T05:00:00Z";
    p.data.database = db;
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string first = slurp(file);
    auto loaded = load_project(file);
    ASSERT_TRUE(loaded.ok()) << loaded.error().to_string();
    ASSERT_TRUE(loaded->data.database.has_value());
    EXPECT_EQ(loaded->data.database->query, db.query);
    EXPECT_EQ(loaded->data.database->table, "");
    EXPECT_EQ(loaded->data.database->rows, 1250000);
    EXPECT_EQ(loaded->data.database->connection, db.connection);
    ASSERT_TRUE(save_project(*loaded, file).ok());
    EXPECT_EQ(slurp(file), first);
    // A file project has no database record.
    Project f;
    ASSERT_TRUE(save_project(f, file).ok());
    auto plain = load_project(file);
    ASSERT_TRUE(plain.ok());
    EXPECT_FALSE(plain->data.database.has_value());
    EXPECT_EQ(slurp(file).find("\"database\""), std::string::npos);
}

TEST(ProjectFile, SheetAndDecimalMarkAreVersionThreeAndRoundTrip) {
    // Another sheet or another decimal mark changes what is read, so both are version 3 keys.
    TempDir t("sheet");
    const auto file = (t.path / "sheet.foldline").string();
    Project p = full_project(t.path / "d.xlsx");
    EXPECT_LT(required_version(p), 3);
    p.data.sheet = "visits";
    p.data.decimal = DecimalMark::Comma;
    EXPECT_EQ(required_version(p), 3);
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string text = slurp(file);
    EXPECT_NE(text.find("\"sheet\": \"visits\""), std::string::npos);
    EXPECT_NE(text.find("\"decimal\": \",\""), std::string::npos);
    auto back = load_project(file);
    ASSERT_TRUE(back.ok()) << back.error().to_string();
    EXPECT_EQ(back->data.sheet, "visits");
    EXPECT_EQ(back->data.decimal, DecimalMark::Comma);
    EXPECT_EQ(reading_options(back->data).sheet, "visits");
    auto bad = parse_project(R"({"format": "foldline-project", "version": 3, "data": {"path": "d.csv", "decimal": ";"},
                                 "question": {"outcome": "ok", "exposure": "group"}})",
                             (t.path / "bad.foldline").string());
    ASSERT_FALSE(bad.ok());
    EXPECT_NE(bad.error().message.find("data.decimal"), std::string::npos) << bad.error().message;
}

TEST(ProjectFile, RowsFilterIsVersionThreeAndRoundTrips) {
    // A rows filter changes which rows are scanned, so it is a version 3 key: an older build
    // refuses the file instead of scanning every row.
    TempDir t("rows");
    const auto file = (t.path / "filtered.foldline").string();
    Project p = full_project(t.path / "d.csv");
    p.question.rows = "year >= 2024 and region in ('north', 'it''s')";
    EXPECT_EQ(required_version(p), 3);
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string text = slurp(file);
    EXPECT_NE(text.find("\"version\": 3"), std::string::npos);
    auto back = load_project(file);
    ASSERT_TRUE(back.ok()) << back.error().to_string();
    EXPECT_EQ(back->question.rows, p.question.rows);
    ASSERT_TRUE(save_project(*back, file).ok());
    EXPECT_EQ(slurp(file), text);
    // Read in its normal form; a malformed filter is refused naming the key and the character.
    auto loose = parse_project(R"({"format": "foldline-project", "version": 3, "data": {"path": "d.csv"},
                                   "question": {"outcome": "ok", "exposure": "group", "rows": "year>=2024  AND x is missing"}})",
                               (t.path / "loose.foldline").string());
    ASSERT_TRUE(loose.ok()) << loose.error().to_string();
    EXPECT_EQ(loose->question.rows, "year >= 2024 and x is missing");
    auto bad = parse_project(R"({"format": "foldline-project", "version": 3, "data": {"path": "d.csv"},
                                 "question": {"outcome": "ok", "exposure": "group", "rows": "year >= "}})",
                             (t.path / "bad.foldline").string());
    ASSERT_FALSE(bad.ok());
    EXPECT_NE(bad.error().message.find("question.rows: rows filter, character 9"), std::string::npos)
        << bad.error().message;
}

TEST(ProjectFile, DecisionAppliedFromAFamilyLeadIsVersionThreeAndRoundTrips) {
    // Where a member's decision came from is the reviewer's record: an older build, which would
    // drop it on its next save, refuses the file instead.
    TempDir t("applied");
    const auto file = (t.path / "applied.foldline").string();
    Project p = full_project(t.path / "d.csv");
    EXPECT_LT(required_version(p), 3);
    auto& member = p.review_for({"rate", {"product", "branch"}, "B vs A"});
    member.decision = Decision::Upheld;
    member.applied_from = "product";
    EXPECT_EQ(required_version(p), 3);
    ASSERT_TRUE(save_project(p, file).ok());
    const std::string text = slurp(file);
    EXPECT_NE(text.find("\"applied_from\": \"product\""), std::string::npos);
    // Written only where set: the lead's own review has no such key.
    EXPECT_EQ(text.find("\"applied_from\": \"\""), std::string::npos);
    auto back = load_project(file);
    ASSERT_TRUE(back.ok()) << back.error().to_string();
    const auto* r = back->review({"rate", {"product", "branch"}, "B vs A"});
    ASSERT_NE(r, nullptr);
    EXPECT_EQ(r->applied_from, "product");
    EXPECT_EQ(r->decision, Decision::Upheld);
    EXPECT_TRUE(back->review({"rate", {"product"}, "B vs A"})->applied_from.empty());
    ASSERT_TRUE(save_project(*back, file).ok());
    EXPECT_EQ(slurp(file), text);
    auto bad = parse_project(R"({"format": "foldline-project", "version": 3, "data": {"path": "d.csv"},
                                 "question": {"outcome": "ok", "exposure": "group"},
                                 "findings": [{"kind": "rate", "strata": ["a"], "comparison": "B vs A",
                                               "decision": "upheld", "note": "", "applied_from": 7}]})",
                             (t.path / "bad.foldline").string());
    ASSERT_FALSE(bad.ok());
    EXPECT_NE(bad.error().message.find("findings[0].applied_from: expected a string"), std::string::npos)
        << bad.error().message;
}
