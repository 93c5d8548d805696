#!/usr/bin/env python3
"""Per-stratum Fisher exact p-values of the exact-test golden file against scipy.stats.fisher_exact.

tests/core/stats/data/exact_stratified_golden.txt holds R's fisher.test p-value of every stratum
whose focal events can vary (written by tests/reference/exact_stratified_golden.R); the GoogleTest
tests/core/stats/exact_stratified_test.cpp checks Foldline's fisher_exact against those values.
This script checks the same values against a second reference library (scipy, Debian's
python3-scipy), so Foldline's per-stratum Fisher p equals both R's and scipy's.
Usage: exact_fisher_scipy.py GOLDEN_FILE
"""
import sys

from scipy.stats import fisher_exact


def main(path):
    strata, checked, bad = {}, 0, 0
    for line in open(path):
        f = line.split()
        if not f:
            continue
        if f[0] == "case":
            name, k = f[1], int(f[2])
            cells = [float(x) for x in f[3:3 + 4 * k]]
            strata = [cells[4 * i:4 * i + 4] for i in range(k)]
        elif f[0] == "fisher":
            a, b, c, d = strata[int(f[1])]
            _, p = fisher_exact([[a, b], [c, d]])
            r = float(f[2])
            checked += 1
            if abs(p - r) > 1e-9 * max(r, 1e-12):
                bad += 1
                print(f"{name} stratum {f[1]}: scipy {p!r}, R {r!r}")
    print(f"{checked} strata checked, {bad} differ")
    return 1 if bad or checked < 100 else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1]))
