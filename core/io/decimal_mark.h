#pragma once
// Numbers as many European locales write them: a decimal comma, with '.' (or a space) grouping
// thousands ("1.234,50"), and the reverse grouping with a decimal point ("1,234.50").
//
// The CSV reader reads numbers with a decimal point only; a column of decimal-comma numbers
// therefore arrives as categorical text. decide_decimal_marks looks at each categorical
// column's levels and, depending on the mark asked for, turns it into a numeric column:
//  - Auto: a column whose every level is a number with a decimal comma and at least one level
//    proves it (a comma followed by other than three digits, or both marks as "1.234,5") is
//    read with a decimal comma; a column whose every level is a number with comma thousands
//    and at least one level proves it ("1,234.5", "1,234,567") is read with a decimal point
//    and comma thousands; a column whose levels read both ways ("1,234" alone: 1.234 or 1234?)
//    stays categorical and is reported as ambiguous, never guessed. Numeric columns stay
//    numeric; when some column was read with a decimal comma, a numeric column whose values
//    all have at most three decimals ("1.234") is reported as kept with a decimal point, since
//    the same text could group thousands.
//  - Comma: every column whose levels all read with a decimal comma becomes numeric (the
//    caller has read the file with every column categorical, so "1.234" means 1234 here); a
//    column whose levels are all numbers that do not read so ("1.5") stays text and is
//    reported as not read.
//  - Point: nothing changes; a text column whose levels are all numbers written with a comma
//    ("1.234,50", "1,250") is reported as not read.
// Each decision is returned, so front ends can say which columns were read how.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/table/table.h"

namespace foldline {

enum class DecimalMark { Auto, Point, Comma };

/// "auto", "." or ",".
std::string_view to_string(DecimalMark m);
/// Reads "auto", "." / "point", "," / "comma"; nullopt otherwise.
std::optional<DecimalMark> parse_decimal_mark(std::string_view text);

/// How one column's numbers were read.
struct NumberReading {
    std::string column;
    enum Kind { DecimalComma, ThousandsComma, Ambiguous, PointKept, NotRead } kind = DecimalComma;
    std::string example;  ///< a level that shows it ("1.234,50")
    /// "read with a decimal comma (e.g. '1.234,50')", "… ambiguous …".
    std::string describe() const;
};

/// Parses `text` with `decimal` as the decimal mark and the other of '.' / ',' (or a space)
/// as an optional thousands separator in groups of three; surrounding spaces, a sign and an
/// exponent are allowed. False when the text is not such a number.
bool parse_grouped_number(std::string_view text, char decimal, double& out);

/// Applies `mark` to the categorical columns of `table` (skipping those named in
/// `keep_categorical`) and returns what it decided, in column order.
std::vector<NumberReading> decide_decimal_marks(Table& table, DecimalMark mark,
                                                const std::vector<std::string>& keep_categorical);

}  // namespace foldline
