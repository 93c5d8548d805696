#pragma once
// Recognising a pre-counted file read as if it were row-level: a column named like a count
// (n, count, freq, weight, patients, ...) that holds whole numbers of 0 or more, while every
// combination of the other columns occurs at most once, is most likely how many observations
// each row stands for. The guess is only proposed; the reviewer (or --count-column) decides.
#include <optional>
#include <string>

#include "core/table/table.h"

namespace foldline {

struct CountColumnGuess {
    std::string column;  ///< the column that looks like a count
    double total = 0;    ///< the observations the rows would stand for (sum of the column)
};

/// True when `name` reads like a count of observations: n, count(s), freq(uency), weight, wt,
/// number, num, total, tally, cases, patients, people, persons, subjects, records, customers,
/// applicants, employees, or such a word with a prefix or suffix joined by '_', '-', '.' or a
/// space ("n_patients", "patient count"). Case-insensitive.
bool looks_like_count_name(const std::string& name);

/// The count column `table` most likely has, or nullopt: none when the table is already
/// weighted, has fewer than two columns or two rows, or no column passes every test (count-like
/// name, numeric, no missing cell, every value a whole number >= 0, each other column with at
/// most half as many distinct values as there are rows (no identifier or measurement), and the
/// other columns together unique over the rows, a missing cell counting as a value of its own).
/// When several pass, the first in column order.
std::optional<CountColumnGuess> guess_count_column(const Table& table);

}  // namespace foldline
