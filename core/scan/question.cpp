#include "core/scan/question.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdlib>

#include "core/table/binning.h"

namespace foldline {

namespace {

std::string lower(std::string s) {
    for (auto& ch : s) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
    return s;
}

bool is_yes(const std::string& s) {
    const auto l = lower(s);
    return l == "1" || l == "yes" || l == "true" || l == "y";
}
bool is_no(const std::string& s) {
    const auto l = lower(s);
    return l == "0" || l == "no" || l == "false" || l == "n";
}

// Levels and per-level weighted counts of a categorical column (or the integer levels of a
// numeric one); nullopt when the numeric column has too many values to be levels.
struct Levels {
    std::vector<std::string> labels;
    std::vector<double> counts;
    std::optional<Column> converted;  // for numeric columns
};

std::optional<Levels> levels_of(const Table& t, const Column& c) {
    Levels out;
    const Column* cat = &c;
    if (c.is_numeric()) {
        out.converted = integer_levels(c, 255);
        if (!out.converted) return std::nullopt;
        cat = &*out.converted;
    }
    out.labels = cat->levels;
    out.counts.assign(cat->levels.size() + 1, 0.0);
    visit_codes(*cat, [&](const auto& v) {
        for (std::size_t i = 0; i < v.size(); ++i) out.counts[v[i]] += t.weight(i);
    });
    out.counts.pop_back();
    return out;
}

std::string join(const std::vector<std::string>& v) {
    std::string s;
    for (std::size_t i = 0; i < v.size() && i < 12; ++i) s += (i ? ", " : "") + v[i];
    if (v.size() > 12) s += ", ...";
    return s;
}

// The exposure's reference and focal groups and the slot of each exposure code (shared by the
// rate question and the mean-gap groups).
Status resolve_groups_into(const Table& t, const Column& ec, const QuestionSpec& spec, Question& q) {
    auto el = levels_of(t, ec);
    if (!el)
        return make_error("exposure '" + ec.name + "' is numeric with many values; a rate scan compares "
                          "groups: pass a categorical exposure");
    std::vector<std::size_t> present;
    for (std::size_t i = 0; i < el->labels.size(); ++i)
        if (el->counts[i] > 0) present.push_back(i);
    std::vector<std::string> present_labels;
    for (auto i : present) present_labels.push_back(el->labels[i]);
    if (present.size() < 2)
        return make_error("exposure '" + ec.name + "' has fewer than two groups among the rows");
    auto index_of = [&](const std::string& l) -> std::optional<std::size_t> {
        for (auto i : present)
            if (el->labels[i] == l) return i;
        return std::nullopt;
    };
    std::size_t ref;
    if (spec.reference) {
        auto r = index_of(*spec.reference);
        if (!r)
            return make_error("reference group '" + *spec.reference + "' not found in '" + ec.name +
                              "' (groups: " + join(present_labels) + ")");
        ref = *r;
    } else {
        // Most frequent level not named as focal; a tie is ambiguous.
        double best = -1;
        int ties = 0;
        ref = present[0];
        for (auto i : present) {
            if (std::find(spec.focal.begin(), spec.focal.end(), el->labels[i]) != spec.focal.end()) continue;
            if (el->counts[i] > best) {
                best = el->counts[i];
                ref = i;
                ties = 1;
            } else if (el->counts[i] == best) {
                ++ties;
            }
        }
        if (ties > 1)
            return make_error("exposure '" + ec.name + "': two groups are equally frequent, so the "
                              "reference is ambiguous: pass --exposure " + ec.name + "=FOCAL,REFERENCE");
    }
    q.reference = el->labels[ref];
    std::vector<std::size_t> focal_idx;
    if (!spec.focal.empty()) {
        for (const auto& f : spec.focal) {
            auto fi = index_of(f);
            if (!fi)
                return make_error("focal group '" + f + "' not found in '" + ec.name + "' (groups: " +
                                  join(present_labels) + ")");
            if (*fi == ref)
                return make_error("focal and reference group are both '" + f + "'");
            focal_idx.push_back(*fi);
        }
    } else {
        for (auto i : present)
            if (i != ref) focal_idx.push_back(i);
    }
    if (focal_idx.size() > 100)
        return make_error("exposure '" + ec.name + "' has " + std::to_string(focal_idx.size() + 1) +
                          " groups; name the focal group with --exposure " + ec.name + "=FOCAL");
    for (auto i : focal_idx) q.focal.push_back(el->labels[i]);
    q.slot_of_exposure_code.assign(el->labels.size() + 1, -1);
    q.slot_of_exposure_code[ref] = 0;
    for (std::size_t s = 0; s < focal_idx.size(); ++s)
        q.slot_of_exposure_code[focal_idx[s]] = static_cast<int>(s + 1);
    return Ok{};
}

}  // namespace

Result<Question> resolve_groups(const Table& t, const QuestionSpec& spec) {
    Question q;
    q.exposure = spec.exposure;
    if (spec.exposure.empty()) return make_error("no groups given: pass --exposure COLUMN[=FOCAL[,REFERENCE]]");
    const auto ei = t.find(spec.exposure);
    if (!ei) return make_error("exposure column '" + spec.exposure + "' not found", t.source);
    if (!spec.outcome.empty() && spec.outcome == spec.exposure)
        return make_error("outcome and exposure are the same column '" + spec.outcome + "'");
    q.exposure_column = *ei;
    q.outcome = spec.outcome;
    if (const auto oi = t.find(spec.outcome)) q.outcome_column = *oi;
    if (auto st = resolve_groups_into(t, t.columns[*ei], spec, q); !st) return st.error();
    return q;
}

void parse_outcome_arg(const std::string& arg, QuestionSpec& spec) {
    const auto eq = arg.find('=');
    spec.outcome = arg.substr(0, eq);
    if (eq != std::string::npos) spec.positive = arg.substr(eq + 1);
}

void parse_exposure_arg(const std::string& arg, QuestionSpec& spec) {
    const auto eq = arg.find('=');
    spec.exposure = arg.substr(0, eq);
    if (eq == std::string::npos) return;
    const std::string rest = arg.substr(eq + 1);
    const auto comma = rest.find(',');
    if (!rest.substr(0, comma).empty()) spec.focal = {rest.substr(0, comma)};
    if (comma != std::string::npos) spec.reference = rest.substr(comma + 1);
}

Result<Question> resolve_question(const Table& t, const QuestionSpec& spec) {
    Question q;
    q.outcome = spec.outcome;
    q.exposure = spec.exposure;
    const auto oi = t.find(spec.outcome), ei = t.find(spec.exposure);
    if (spec.outcome.empty()) return make_error("no outcome given: pass --outcome COLUMN[=POSITIVE]");
    if (spec.exposure.empty()) return make_error("no exposure given: pass --exposure COLUMN[=FOCAL[,REFERENCE]]");
    if (!oi) return make_error("outcome column '" + spec.outcome + "' not found", t.source);
    if (!ei) return make_error("exposure column '" + spec.exposure + "' not found", t.source);
    if (*oi == *ei) return make_error("outcome and exposure are the same column '" + spec.outcome + "'");
    q.outcome_column = *oi;
    q.exposure_column = *ei;
    const Column& oc = t.columns[*oi];
    const Column& ec = t.columns[*ei];

    // Outcome and its positive level.
    auto ol = levels_of(t, oc);
    if (!ol) {
        if (!spec.positive)
            return make_error("outcome '" + oc.name + "' is numeric with many values, not binary: pass "
                              "--outcome " + oc.name + "=VALUE to count one value as positive");
        char* end = nullptr;
        q.positive_value = std::strtod(spec.positive->c_str(), &end);
        if (end == spec.positive->c_str() || *end)
            return make_error("positive level '" + *spec.positive + "' of numeric outcome '" + oc.name +
                              "' is not a number");
        q.positive = *spec.positive;
    } else {
        std::vector<std::string> present;
        for (std::size_t i = 0; i < ol->labels.size(); ++i)
            if (ol->counts[i] > 0) present.push_back(ol->labels[i]);
        if (spec.positive) {
            if (std::find(ol->labels.begin(), ol->labels.end(), *spec.positive) == ol->labels.end()) {
                // "1" matches a numeric outcome's level "1" also when written "1.0".
                char* end = nullptr;
                const double want = std::strtod(spec.positive->c_str(), &end);
                bool found = false;
                if (oc.is_numeric() && end != spec.positive->c_str() && !*end)
                    for (const auto& l : ol->labels)
                        if (std::strtod(l.c_str(), nullptr) == want) {
                            q.positive = l;
                            found = true;
                        }
                if (!found)
                    return make_error("positive level '" + *spec.positive + "' not found in outcome '" +
                                      oc.name + "' (levels: " + join(present) + ")");
            } else {
                q.positive = *spec.positive;
            }
        } else {
            std::vector<std::string> yes;
            for (const auto& l : present)
                if (is_yes(l)) yes.push_back(l);
            if (yes.size() == 1 && present.size() == 2) {
                q.positive = yes[0];
            } else if (present.size() == 2 && yes.empty() && (is_no(present[0]) != is_no(present[1]))) {
                q.positive = is_no(present[0]) ? present[1] : present[0];
            } else {
                return make_error("outcome '" + oc.name + "' has levels " + join(present) +
                                  ": say which counts as positive with --outcome " + oc.name + "=LEVEL");
            }
        }
        if (present.size() < 2)
            return make_error("outcome '" + oc.name + "' has fewer than two values among the rows");
        const Column& cat = ol->converted ? *ol->converted : oc;
        q.outcome_code_positive.assign(cat.levels.size() + 1, 0);
        for (std::size_t i = 0; i < cat.levels.size(); ++i)
            q.outcome_code_positive[i] = cat.levels[i] == q.positive;
        if (oc.is_numeric()) q.positive_value = std::strtod(q.positive.c_str(), nullptr);
    }

    if (auto st = resolve_groups_into(t, ec, spec, q); !st) return st.error();
    return q;
}

RowCells encode_rows(const Table& t, const Question& q) {
    RowCells rc;
    rc.slots = q.slots();
    const auto unused = rc.unused();
    rc.cell.assign(t.rows, unused);
    const Column& oc = t.columns[q.outcome_column];
    const Column& ec = t.columns[q.exposure_column];
    std::optional<Column> conv;
    const Column* e = &ec;
    if (ec.is_numeric()) {
        conv = integer_levels(ec, 255);
        e = &*conv;
    }
    // Outcome bit per row, 2 = missing.
    std::vector<std::uint8_t> y(t.rows, 2);
    if (oc.is_numeric()) {
        for (std::size_t i = 0; i < t.rows; ++i)
            if (!std::isnan(oc.values[i])) y[i] = oc.values[i] == q.positive_value;
    } else {
        visit_codes(oc, [&](const auto& v) {
            const auto miss = oc.missing_code();
            for (std::size_t i = 0; i < v.size(); ++i)
                if (v[i] != miss) y[i] = static_cast<std::uint8_t>(q.outcome_code_positive[v[i]]);
        });
    }
    visit_codes(*e, [&](const auto& v) {
        for (std::size_t i = 0; i < v.size(); ++i) {
            const int s = q.slot_of_exposure_code[v[i]];
            if (s >= 0 && y[i] != 2) rc.cell[i] = static_cast<std::uint8_t>(2 * s + y[i]);
        }
    });
    return rc;
}

}  // namespace foldline
