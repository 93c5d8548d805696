#include "core/audit/diagram_checks.h"

#include <cmath>
#include <cstdio>
#include <limits>

#include "core/stats/fdr.h"

namespace foldline::causal {

const char* to_string(CheckMethod m) {
    switch (m) {
        case CheckMethod::None: return "none";
        case CheckMethod::GSquared: return "g-squared";
        case CheckMethod::PartialCorrelation: return "partial-correlation";
    }
    return "none";
}

}  // namespace foldline::causal

namespace foldline::audit {

using causal::CheckMethod;
using causal::ClaimForm;
using causal::DiagramCheck;
using causal::DiagramChecks;

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// A G² table larger than this (strata × levels of X × levels of Y) is not counted: it would
// need more memory than a desktop check should take, and would be almost all empty cells.
constexpr double kMaxCells = 2e7;

void not_assessable(DiagramCheck& c, std::string why) {
    c.test = {};
    c.test.p = c.test.statistic = c.test.partial_r = kNaN;
    c.note = std::move(why);
}

bool continuous(const Column& c) { return c.is_numeric() && !c.is_binary(); }

void g_squared(DiagramCheck& c, ClaimStrata& strata) {
    const Table& table = strata.table();
    auto x = strata.categorical(c.a);
    if (!x) return not_assessable(c, x.error().message);
    auto y = strata.categorical(c.b);
    if (!y) return not_assessable(c, y.error().message);
    auto z = strata.joint(c.given);
    if (!z) return not_assessable(c, z.error().message);
    const Column& xc = **x;
    const Column& yc = **y;
    const JointStrata& zs = **z;
    stats::StratifiedCounts counts;
    counts.strata = zs.levels;
    counts.rows = xc.levels.size();
    counts.cols = yc.levels.size();
    const double cells = static_cast<double>(counts.strata) * static_cast<double>(counts.rows) *
                         static_cast<double>(counts.cols);
    if (cells > kMaxCells) {
        char buf[160];
        std::snprintf(buf, sizeof buf, "too many cells to count (%.0f strata × %zu × %zu levels)",
                      static_cast<double>(counts.strata), counts.rows, counts.cols);
        return not_assessable(c, buf);
    }
    counts.cells.assign(static_cast<std::size_t>(cells), 0.0);
    // Cell index per row, column by column (no per-row dispatch on the code width).
    constexpr std::uint64_t kSkip = UINT64_MAX;
    std::vector<std::uint64_t> cell(table.rows);
    const auto zm = zs.missing_code();
    for (std::size_t i = 0; i < table.rows; ++i) {
        const auto zi = zs.code(i);
        cell[i] = zi == zm ? kSkip : zi;
    }
    for (const Column* col : {&xc, &yc}) {
        const std::uint64_t radix = col->levels.size();
        const auto miss = col->missing_code();
        visit_codes(*col, [&](const auto& codes) {
            for (std::size_t i = 0; i < cell.size(); ++i) {
                const std::uint32_t v = codes[i];
                cell[i] = cell[i] == kSkip || v == miss ? kSkip : cell[i] * radix + v;
            }
        });
    }
    for (std::size_t i = 0; i < table.rows; ++i)
        if (cell[i] != kSkip) counts.cells[static_cast<std::size_t>(cell[i])] += table.weight(i);
    c.method = CheckMethod::GSquared;
    c.test = stats::g_squared_test(counts);
    if (std::isnan(c.test.p)) c.note = "no stratum holds two values of both columns";
}

void partial_correlation(DiagramCheck& c, ClaimStrata& strata) {
    const Table& table = strata.table();
    std::vector<std::string> cats;
    std::vector<const double*> vars;  // numeric members of the set, then X, then Y
    for (const auto& g : c.given) {
        const Column* col = table.column(g);
        if (continuous(*col)) vars.push_back(col->values.data());
        else cats.push_back(g);
    }
    vars.push_back(table.column(c.a)->values.data());
    vars.push_back(table.column(c.b)->values.data());
    auto zr = strata.joint(cats);
    if (!zr) return not_assessable(c, zr.error().message);
    const JointStrata* z = zr->get();
    const std::size_t p = vars.size(), levels = z->levels;
    const auto zm = z->missing_code();
    // Two passes: stratum means, then sums of squares and cross-products about them (centring
    // first keeps the precision that raw sums lose at a million rows).
    std::vector<double> w(levels, 0.0), mean(levels * p, 0.0);
    auto complete = [&](std::size_t i) {
        if (z->code(i) == zm) return false;
        for (const double* v : vars)
            if (std::isnan(v[i])) return false;
        return true;
    };
    for (std::size_t i = 0; i < table.rows; ++i) {
        if (!complete(i)) continue;
        const auto k = z->code(i);
        const double wi = table.weight(i);
        w[k] += wi;
        for (std::size_t j = 0; j < p; ++j) mean[k * p + j] += wi * vars[j][i];
    }
    stats::WithinMoments m;
    m.strata = 0;
    for (std::size_t k = 0; k < levels; ++k) {
        if (w[k] <= 0) continue;
        ++m.strata;
        m.n += w[k];
        for (std::size_t j = 0; j < p; ++j) mean[k * p + j] /= w[k];
    }
    m.sscp = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(p), static_cast<Eigen::Index>(p));
    std::vector<double> d(p);
    for (std::size_t i = 0; i < table.rows; ++i) {
        if (!complete(i)) continue;
        const auto k = z->code(i);
        const double wi = table.weight(i);
        for (std::size_t j = 0; j < p; ++j) d[j] = vars[j][i] - mean[k * p + j];
        for (std::size_t r = 0; r < p; ++r)
            for (std::size_t q = r; q < p; ++q) m.sscp(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(q)) += wi * d[r] * d[q];
    }
    m.sscp = m.sscp.selfadjointView<Eigen::Upper>();
    c.method = CheckMethod::PartialCorrelation;
    c.test = stats::partial_correlation_test(m);
    if (std::isnan(c.test.p)) c.note = "too few rows, or a column constant once the set is accounted for";
}

std::string join_names(const std::vector<std::string>& names) {
    std::string out;
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (i) out += i + 1 == names.size() ? " and " : ", ";
        out += names[i];
    }
    return out;
}

std::string claim_words(const DiagramCheck& c) {
    std::string s = "the diagram says " + c.a + " and " + c.b + " are independent";
    if (!c.given.empty()) s += " given " + join_names(c.given);
    return s;
}

std::string q_words(double q) {
    if (q < 0.001) return "q < 0.001";
    char buf[32];
    std::snprintf(buf, sizeof buf, "q = %.3g", q);
    return buf;
}

}  // namespace

std::vector<DiagramCheck> list_claims(const causal::CausalGraph& graph) {
    std::vector<DiagramCheck> out;
    for (const auto& imp : causal::implied_independences(graph)) {
        DiagramCheck c;
        c.a = graph.name(imp.a);
        c.b = graph.name(imp.b);
        c.given = graph.names_of(imp.given);
        c.form = imp.form;
        for (int v : imp.given)
            if (!graph.observed(v)) c.unobserved.push_back(graph.name(v));
        c.test.p = c.test.statistic = c.test.partial_r = c.q = kNaN;
        out.push_back(std::move(c));
    }
    return out;
}

std::string claim_key(const DiagramCheck& c) {
    std::string key = c.a + '\x1f' + c.b + '\x1e';
    for (const auto& g : c.given) key += g + '\x1f';
    return key;
}

void test_claim(DiagramCheck& c, const Table& table, const EstimateSettings& settings) {
    ClaimStrata strata(table, settings.bins, settings.max_levels);
    test_claim(c, strata);
}

void test_claim(DiagramCheck& c, ClaimStrata& strata) {
    if (c.form == ClaimForm::Untestable) return;
    const Table& table = strata.table();
    c.note.clear();
    c.method = CheckMethod::None;
    std::vector<std::string> all = c.given;
    all.push_back(c.a);
    all.push_back(c.b);
    for (const auto& n : all)
        if (!table.column(n)) return not_assessable(c, "column '" + n + "' is not in the data");
    if (continuous(*table.column(c.a)) && continuous(*table.column(c.b))) partial_correlation(c, strata);
    else g_squared(c, strata);
}

void finish_checks(DiagramChecks& checks, double alpha) {
    checks.alpha = alpha;
    std::vector<double> p;
    for (const auto& c : checks.checks) p.push_back(c.form == ClaimForm::Untestable ? kNaN : c.test.p);
    const auto q = stats::benjamini_hochberg(p);
    checks.tested = checks.contradicted = 0;
    for (std::size_t i = 0; i < checks.checks.size(); ++i) {
        auto& c = checks.checks[i];
        c.q = q[i];
        c.contradicted = !std::isnan(c.q) && c.q < alpha;
        std::string s = claim_words(c);
        if (c.form == ClaimForm::Untestable) {
            s += "; it rests on " + join_names(c.unobserved) + ", which the data do not hold, so it cannot be checked";
        } else if (std::isnan(c.q)) {
            s += "; not assessable: " + (c.note.empty() ? std::string("not tested") : c.note);
        } else {
            ++checks.tested;
            if (c.contradicted) {
                ++checks.contradicted;
                s += "; the data disagree, " + q_words(c.q) + ": an arrow or a common cause may be missing";
            } else {
                s += "; the data do not contradict it (" + q_words(c.q) + ")";
            }
        }
        s[0] = 'T';
        c.sentence = s + ".";
    }
}

Result<DiagramChecks> check_diagram(const causal::Diagram& diagram, const Table& table,
                                    const EstimateSettings& settings, const Work& work) {
    auto graph = causal::CausalGraph::build(diagram);
    if (!graph) return graph.error();
    std::vector<std::string> columns;
    for (const auto& c : table.columns) columns.push_back(c.name);
    if (auto st = causal::check_columns(*graph, columns); !st) return st.error();
    DiagramChecks out;
    out.checks = list_claims(*graph);
    ClaimStrata strata(table, settings.bins, settings.max_levels);
    for (std::size_t i = 0; i < out.checks.size(); ++i) {
        if (work.cancelled()) {
            for (std::size_t j = i; j < out.checks.size(); ++j)
                if (out.checks[j].form != ClaimForm::Untestable) out.checks[j].note = "stopped before this claim";
            break;
        }
        work.report(static_cast<double>(i), static_cast<double>(out.checks.size()), "testing the diagram's claims");
        test_claim(out.checks[i], strata);
    }
    finish_checks(out, settings.alpha);
    return out;
}

}  // namespace foldline::audit
