#pragma once
// The memo's content as plain data: every sentence, table and chart series of the PDF memo,
// decided here, independent of how it is drawn (ui/memo/memo_writer renders it with Qt).
// Texts are plain UTF-8 — never markup — so a renderer must draw them literally; names and
// levels that come from the data or the reviewer are kept as given.
#include <optional>
#include <string>
#include <vector>

#include "core/causal/verdict.h"
#include "core/audit/project_file.h"
#include "core/report/scan_json.h"
#include "core/scan/scan_result.h"
#include "core/table/table.h"

namespace foldline::report {

struct MemoTable {
    std::vector<std::string> header;
    std::vector<std::vector<std::string>> rows;  ///< each row has header.size() cells
    std::vector<double> widths;                  ///< relative column widths (header.size())
    std::vector<bool> numeric;                   ///< right-aligned columns (header.size())
};

/// One category of a rate chart: a stratum, or the pooled comparison first.
struct MemoChartPoint {
    std::string label;
    double focal = 0, focal_lo = 0, focal_hi = 0;            ///< rate and Wilson CI; NaN when no rows
    double reference = 0, reference_lo = 0, reference_hi = 0;
    double share_focal = 0, share_reference = 0;             ///< the stratum's share within each group
    bool pooled = false;
};

struct MemoChart {
    std::string title;       ///< "Rate of approved = 1 by product"
    std::string value_label; ///< "rate of approved = 1"
    std::string mix_title;   ///< "Share of each group in each stratum"
    std::string focal, reference;
    std::vector<MemoChartPoint> points;  ///< pooled first, then strata in table order
};

/// A trend chart: the rows as points coloured by stratum, each stratum's fitted line over its
/// own x range, and the pooled line across all of them.
struct MemoScatterLine {
    std::string label;          ///< the stratum's label, or "All (pooled)"
    double slope = 0, intercept = 0;
    double x_min = 0, x_max = 0;
};

struct MemoScatter {
    std::string title;                   ///< "weekly_sales on promo_spend by store_format"
    std::string x_label, y_label;
    std::vector<double> x, y;            ///< the points drawn (thinned evenly beyond a cap)
    std::vector<int> group;              ///< per point: index into `lines`, -1 outside every stratum
    std::vector<MemoScatterLine> lines;  ///< one per stratum with a defined slope, in table order
    std::optional<MemoScatterLine> pooled;
    std::string note;                    ///< "4,000 of 5,000 rows drawn; the lines use every row"
};

struct MemoDiagramNode {
    std::string name;
    double x = 0, y = 0;       ///< editor position (laid out on a circle when never placed)
    bool observed = true;
    causal::Role role = causal::Role::Unrelated;  ///< in text: causal::to_string (core/causal/roles.h)
    bool in_stratifier = false;
};

struct MemoDiagram {
    std::string name;                        ///< the diagram's label in the project
    std::vector<MemoDiagramNode> nodes;
    std::vector<std::pair<int, int>> edges;  ///< indices into nodes
};

struct MemoSection {
    std::string heading;       ///< "1. Reversal — product (B vs A)"
    std::string finding_class;
    std::string lead;          ///< the crude and adjusted comparison in one or two sentences
    MemoTable figures;         ///< measure / crude / adjusted
    MemoTable strata;          ///< the side-by-side table: pooled row, then each stratum
    MemoChart chart;
    std::optional<MemoScatter> scatter;  ///< trend sections, when the rows were given
    std::optional<MemoDiagram> diagram;
    std::string verdict;       ///< which view answers, and why; a plain note when no diagram
    std::string diagram_checks;  ///< the diagram's claims against the data (diagram_checks_paragraph); empty without
    std::string decomposition; ///< one sentence
    std::string e_value;       ///< one sentence
    std::string decision;      ///< "Reviewer's decision: upheld."
    std::string note;          ///< the reviewer's note as written; empty when none
    MemoTable related;         ///< family detail: the family's other findings (proxies, members); may be empty
    /// Figures and tables only, without the charts and the diagram (they draw the same numbers):
    /// a family lead that page 1's answer does not speak for, in the default ("families") memo.
    bool compact = false;
};

struct MemoContent {
    std::string title;
    std::string analyst;
    std::string date;
    project::PageSize page_size = project::PageSize::A4;
    std::vector<std::pair<std::string, std::string>> facts;  ///< label / value (source, rows, SHA-256, ...)
    std::string question;       ///< the question in words
    std::string data_warning;   ///< non-empty when the data changed since the project was saved
    std::vector<std::string> answer;  ///< page 1: two or three plain sentences per family lead answered
    std::string summary;        ///< one paragraph
    MemoTable findings;         ///< every finding that is not stable (or all, when none is flagged)
    std::string findings_note;  ///< how many are listed / how many have sections
    std::vector<MemoSection> sections;
    MemoTable appendix;         ///< every check of the scan with its class, q and family
    std::string appendix_note;
    std::vector<std::string> method_notes;
    std::string caution;
};

/// Everything the memo is built from. `scan` must be set; the rest may be empty.
struct MemoInput {
    const ScanResult* scan = nullptr;
    DataInfo data;                                    ///< path, SHA-256, rows read
    const project::Project* project = nullptr;        ///< title, analyst, reviews, diagram, page size
    std::string date;                                 ///< "2026-12-02"; the caller's clock, for reproducibility
    std::string data_change;                          ///< DataChange::message when changed, else empty
    std::size_t max_sections = 12;                    ///< flagged findings beyond this are listed only
    std::string detail;                               ///< "families" or "full"; empty: the project's
                                                      ///< memo.detail ("families" without a project)
    bool draft_diagram = false;                       ///< a diagram was drawn but never confirmed: it
                                                      ///< gives no verdict, and the memo says it exists
    const Table* table = nullptr;                     ///< the rows, for the trend charts; null → none
                                                      ///< (verdicts and their estimates come with the
                                                      ///< findings: core/audit/verdicts.h)
};

/// The caution every memo closes with.
inline constexpr const char* kMemoCaution =
    "This memo is a statistical screen, not a legal or clinical determination. Read it with local law, "
    "counsel and licensed practice.";

/// One paragraph beside each verdict: how many of the diagram's claims the data contradict, with
/// the sentences of up to three of them, and how many cannot be checked. No claims → empty.
std::string diagram_checks_paragraph(const causal::DiagramChecks& checks);

/// Builds the memo: rate findings first, then slope findings (ScanResult::slope_findings, a
/// trend of a numeric outcome on a numeric exposure; sections with a scatter chart when
/// input.table is set, never a decomposition or E-value, which are rate figures). A scan with no findings gives a memo with an empty table, no sections and a
/// summary saying nothing was flagged; input.scan == nullptr gives an empty MemoContent.
MemoContent build_memo(const MemoInput& input);

/// The same rule for a slope finding (keyed by project::slope_key).
bool included_in_memo(const SlopeFinding& f, const project::Project* project);

/// Whether a finding gets a section: memo setting "chosen" → the review's in_memo is true;
/// "flagged" (default, also without project) → class is not stable and in_memo is not false.
bool included_in_memo(const RateFinding& f, const project::Project* project);

/// A rate as "47.8%"; NaN → "n/a".
std::string percent(double x);
/// A difference of rates in percentage points, signed: "-19.9 pp"; NaN → "n/a".
std::string points(double x);
/// A number with `digits` decimals; NaN → "n/a".
std::string fixed(double x, int digits);
/// A p- or q-value: "< 0.0001", "0.032", "0.41"; NaN → "n/a".
std::string p_text(double p);

}  // namespace foldline::report
