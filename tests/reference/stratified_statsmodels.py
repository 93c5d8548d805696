#!/usr/bin/python3
"""Reference values for Foldline's stratified 2x2xK statistics from statsmodels.

Source: statsmodels.stats.contingency_tables.StratifiedTable (statsmodels 0.13, Debian's
python3-statsmodels): oddsratio_pooled, oddsratio_pooled_confint (Robins-Breslow-Greenland),
test_null_odds(correction=False / True), test_equal_odds(adjust=False / True), and
statsmodels.stats.proportion.proportion_confint(method="wilson").

Random K x 2 x 2 tables are drawn with a fixed seed. Modes:
  --write FILE   write the golden file the C++ test (tests/core/stats/stratified_test.cpp) reads
  --check FILE   recompute and compare with the committed golden file (what ctest runs)
Golden format, one table per line:
  K a1 b1 c1 d1 ... aK bK cK dK | mh_or lo hi cmh cmh_p cmh_cc cmh_cc_p bd bd_p tarone tarone_p
"""
import argparse
import sys
import warnings

import numpy as np
from statsmodels.stats.contingency_tables import StratifiedTable
from statsmodels.stats.proportion import proportion_confint

N_TABLES = 200


def tables(seed=20260101):
    rng = np.random.default_rng(seed)
    for _ in range(N_TABLES):
        k = int(rng.integers(2, 9))
        scale = float(rng.choice([8, 30, 200, 2000]))
        cells = []
        for _ in range(k):
            while True:
                n1, n0 = rng.integers(2, int(scale) + 3, size=2)
                p1, p0 = rng.uniform(0.05, 0.95, size=2)
                a = rng.binomial(n1, p1)
                c = rng.binomial(n0, p0)
                b, d = n1 - a, n0 - c
                if a + c > 0 and b + d > 0:   # margins positive: every stratum informative
                    break
            cells.append((int(a), int(b), int(c), int(d)))
        yield cells


def reference(cells):
    t = np.zeros((2, 2, len(cells)))
    for k, (a, b, c, d) in enumerate(cells):
        t[:, :, k] = [[a, b], [c, d]]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        st = StratifiedTable(t)
        lo, hi = st.oddsratio_pooled_confint(alpha=0.05)
        cmh = st.test_null_odds(correction=False)
        cmh_cc = st.test_null_odds(correction=True)
        bd = st.test_equal_odds(adjust=False)
        bdt = st.test_equal_odds(adjust=True)
    return [st.oddsratio_pooled, lo, hi, cmh.statistic, cmh.pvalue, cmh_cc.statistic,
            cmh_cc.pvalue, bd.statistic, bd.pvalue, bdt.statistic, bdt.pvalue]


def wilson_lines():
    rng = np.random.default_rng(7)
    out = []
    for _ in range(100):
        n = int(rng.integers(1, 500))
        x = int(rng.integers(0, n + 1))
        lo, hi = proportion_confint(x, n, alpha=0.05, method="wilson")
        out.append(f"W {x} {n} | {lo!r} {hi!r}")
    return out


def lines():
    out = []
    for cells in tables():
        flat = " ".join(str(v) for cell in cells for v in cell)
        ref = " ".join(repr(float(v)) for v in reference(cells))
        out.append(f"{len(cells)} {flat} | {ref}")
    return out + wilson_lines()


def main():
    p = argparse.ArgumentParser()
    g = p.add_mutually_exclusive_group(required=True)
    g.add_argument("--write")
    g.add_argument("--check")
    a = p.parse_args()
    new = lines()
    if a.write:
        with open(a.write, "w") as f:
            f.write("# statsmodels 0.13 StratifiedTable / proportion_confint reference values;"
                    " made by tests/reference/stratified_statsmodels.py\n")
            f.write("\n".join(new) + "\n")
        return 0
    old = [l for l in open(a.check).read().splitlines() if l and not l.startswith("#")]
    if len(old) != len(new):
        print(f"golden has {len(old)} lines, statsmodels gives {len(new)}")
        return 1
    bad = 0
    for i, (o, n) in enumerate(zip(old, new)):
        lo_, ro = o.split("|")
        ln, rn = n.split("|")
        if lo_.split() != ln.split():
            print(f"line {i}: inputs differ")
            bad += 1
            continue
        for vo, vn in zip(ro.split(), rn.split()):
            vo, vn = float(vo), float(vn)
            if not (np.isclose(vo, vn, rtol=1e-9, atol=1e-12) or (np.isnan(vo) and np.isnan(vn))):
                print(f"line {i}: golden {vo} vs statsmodels {vn}")
                bad += 1
    print(f"{len(new) - bad} passed, {bad} failed")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
