#pragma once
// The question a rate scan answers: a binary outcome (one positive level against the rest) and
// an exposure whose focal level(s) are each compared with one reference level.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline {

/// What the user asked, before it is checked against the data.
struct QuestionSpec {
    std::string outcome;
    std::optional<std::string> positive;   ///< outcome level counted as positive
    std::string exposure;
    std::vector<std::string> focal;        ///< empty = every level except the reference
    std::optional<std::string> reference;  ///< empty = the most frequent level
};

/// A checked question. Exposure levels are addressed by "slot": slot 0 is the reference, slot
/// i >= 1 is focal[i - 1]; comparison i - 1 is slot i against slot 0.
struct Question {
    std::string outcome;
    std::string positive;                 ///< label of the positive level
    std::string exposure;
    std::string reference;
    std::vector<std::string> focal;
    std::size_t outcome_column = 0;       ///< index in Table::columns
    std::size_t exposure_column = 0;
    /// For each exposure code (categorical, or integer level of a numeric exposure): its slot, or
    /// -1 when the level takes part in no comparison. Missing code maps to -1.
    std::vector<int> slot_of_exposure_code;
    /// For each outcome code (categorical) whether it is the positive level. Unused when the
    /// outcome is numeric (then positive_value is compared).
    std::vector<char> outcome_code_positive;
    double positive_value = 0;            ///< for a numeric outcome
    std::size_t slots() const { return focal.size() + 1; }
    std::size_t comparisons() const { return focal.size(); }
};

/// Checks the spec against the table. Defaults: positive level "1", "yes", "true" or "Y" (any
/// case) when exactly one is present, or the only level if the other is "0"/"no"/"false"/"N";
/// reference = the most frequent exposure level (a tie is an error); focal = every other level.
/// Errors name the column and say what to pass (unknown column, outcome not binary without a
/// positive level, positive level absent, exposure with one level, focal == reference, ...).
Result<Question> resolve_question(const Table& table, const QuestionSpec& spec);

/// The groups alone (reference, focal, slot of each exposure code) by the rules of
/// resolve_question, for questions whose outcome is not a yes/no column (a mean gap): outcome
/// fields are copied from the spec (outcome_column set when the column exists) and not checked.
/// Errors as resolve_question's for the exposure.
Result<Question> resolve_groups(const Table& table, const QuestionSpec& spec);

/// Parses "C" or "C=LEVEL" (outcome) into spec.outcome / spec.positive; "" leaves an empty
/// outcome (resolve_question then reports it).
void parse_outcome_arg(const std::string& arg, QuestionSpec& spec);
/// Parses "C", "C=FOCAL" or "C=FOCAL,REF" (exposure) into spec.exposure / focal / reference;
/// "C=,REF" names only the reference.
void parse_exposure_arg(const std::string& arg, QuestionSpec& spec);

/// Per-row encoding of the question: cell = slot * 2 + (positive ? 1 : 0), or 2 * slots when the
/// row is in no comparison (missing outcome or exposure, or an exposure level not compared).
struct RowCells {
    std::vector<std::uint8_t> cell;
    std::size_t slots = 0;
    std::uint8_t unused() const { return static_cast<std::uint8_t>(2 * slots); }
};

/// Encodes every row of the table. Empty vector for an empty table.
RowCells encode_rows(const Table& table, const Question& q);

}  // namespace foldline
