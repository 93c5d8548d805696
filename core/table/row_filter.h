#pragma once
// Rows to include: a small filter language of Foldline's own (docs/filter.md), read once, then
// applied to a Table in memory or written as an SQL condition for a database scan, with the same
// meaning on both paths.
//
//   filter     := or
//   or         := and { "or" and }
//   and        := unary { "and" unary }
//   unary      := "not" unary | "(" filter ")" | test
//   test       := column ( op literal
//                        | ["not"] "in" "(" literal { "," literal } ")"
//                        | "is" ["not"] "missing" )
//   op         := "=" | "<>" | "<" | "<=" | ">" | ">="
//   column     := a bare name (letters, digits, "_", ".", starting with a letter or "_")
//               | a name in double quotes ("" stands for one quote)
//   literal    := 'text in single quotes' ('' stands for one quote) | a number
//
// Keywords are case-insensitive. A missing cell makes a comparison unknown, as in SQL: `not`
// of unknown is unknown, `and`/`or` follow three-valued logic, and a row is kept only when the
// filter is true. So `region <> 'north'` drops rows with no region, and `is missing` is the one
// way to ask for them. Text compares with = and <> (and `in`) only, numbers with every operator;
// a number against a text column, or text against a numeric column, is a usage error (the same
// comparison would fail in a database), as is an ordering of text (database collations differ).
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline::filter {

enum class Op { Eq, Ne, Lt, Le, Gt, Ge };

struct Literal {
    bool text = false;
    std::string value;  ///< text, or the number as written (checked to parse)
    double number = 0;  ///< the number (text == false)
};

struct Node {
    enum class Kind { Compare, In, Missing, Not, And, Or };
    Kind kind = Kind::Compare;
    Op op = Op::Eq;                 ///< Compare
    bool negated = false;           ///< In: "not in"; Missing: "is not missing"
    std::string column;             ///< Compare, In, Missing
    std::vector<Literal> literals;  ///< Compare: one; In: one or more
    int left = -1, right = -1;      ///< Not: left; And / Or: left and right (indices into nodes)
    std::size_t at = 0;             ///< 1-based character of the test's column, for messages
};

/// A parsed filter: nodes[root] is the whole expression. An empty filter (root < 0) keeps
/// every row.
struct RowFilter {
    std::vector<Node> nodes;
    int root = -1;
    bool empty() const { return root < 0; }
};

/// Parses `text` (blank text gives the empty filter). Usage error "rows filter, character N:
/// expected ..., found ..." pointing at the first character that does not fit.
Result<RowFilter> parse(std::string_view text);

/// The filter written back in one normal form (single spaces, keywords in lower case, names
/// quoted only when they need it, numbers as written): what reports and the project file show.
std::string canonical_text(const RowFilter& f);

/// The columns the filter reads, each once, in order of first use.
std::vector<std::string> columns(const RowFilter& f);

/// Whether the filter fits the table without evaluating it: every column exists and every
/// comparison fits its column's type. Usage error as for keep_mask.
Status check(const RowFilter& f, const Table& table);

/// One byte per row: 1 where the filter is true. Usage error for a column that is not in the
/// table or a comparison that does not fit the column's type (the message names the column and
/// the character where the test starts).
Result<std::vector<std::uint8_t>> keep_mask(const RowFilter& f, const Table& table);

/// The rows of `table` where the filter is true, as a new table: categorical levels renumbered
/// in order of first appearance among the kept rows (levels no kept row uses are dropped), so
/// the result equals reading a file that held only those rows. Weights follow their rows, and
/// Table::filter records the filter's canonical text.
Result<Table> apply(const RowFilter& f, const Table& table);

/// The filter as an SQL condition: identifiers in double quotes and text in single quotes with
/// quotes doubled, numbers re-written from their parsed value, `is missing` as IS NULL. Empty
/// for the empty filter.
std::string to_sql(const RowFilter& f);

}  // namespace foldline::filter
