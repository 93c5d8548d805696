#!/usr/bin/python3
"""Writes pay_by_grade.csv: an invented pay review at a fictional employer, Tallowmere Freight.

Invented data, no real organisation or person. 320 employees in six grades (G1..G6) and two
groups (A, B). Planted pattern (a mean-gap reversal): within every grade that holds both
groups, group B's base pay is about 1,200 above group A's, yet B is concentrated in the lower
grades, so B's pooled mean is below A's. Grade G6 holds group A only (an uninformative
stratum). Spread grows with the grade (unequal variances, for Welch and HC1). Salaries are
whole numbers.

  make_pay_by_grade.py          write pay_by_grade.csv beside this script
Seeded (numpy default_rng(20261111)): the output is the committed file byte for byte.
"""
import os

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))

# grade: (base pay, spread, employees in A, employees in B)
GRADES = {
    "G1": (31000, 1500, 8, 70),
    "G2": (38000, 1800, 14, 52),
    "G3": (47000, 2400, 30, 26),
    "G4": (58000, 3000, 44, 12),
    "G5": (71000, 3800, 40, 6),
    "G6": (90000, 5000, 18, 0),
}
WITHIN_GAP = 1200.0  # B above A within a grade


def rows():
    rng = np.random.default_rng(20261111)
    out = []
    for grade, (base, spread, n_a, n_b) in GRADES.items():
        for group, n in (("A", n_a), ("B", n_b)):
            shift = WITHIN_GAP if group == "B" else 0.0
            for _ in range(n):
                out.append((grade, group, int(round(base + shift + rng.normal(0, spread)))))
    order = rng.permutation(len(out))
    return [out[i] for i in order]


def main():
    path = os.path.join(HERE, "pay_by_grade.csv")
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write("employee,grade,group,salary\n")
        for i, (grade, group, salary) in enumerate(rows(), start=1):
            f.write(f"E{i:04d},{grade},{group},{salary}\n")


if __name__ == "__main__":
    main()
