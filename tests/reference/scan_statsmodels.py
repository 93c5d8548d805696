#!/usr/bin/python3
"""End-to-end check of `foldline scan` against pandas + statsmodels.

Writes a seeded random CSV (an invented clinic network: treated/untreated patients, recovery,
site, age band, shift; a few empty cells and sparse levels) and the same data pre-counted,
runs `foldline scan --json -` on both, and recomputes every finding with
statsmodels.stats.contingency_tables.StratifiedTable (statsmodels 0.13, Debian's
python3-statsmodels) and pandas:
  crude rates; MH OR and its 95% CI (Robins-Breslow-Greenland); CMH statistic and p without
  correction; Breslow-Day with Tarone's correction (test_equal_odds(adjust=True)) over the
  strata with both groups and both outcomes (the ones that inform it).
Also checks that the pre-counted file gives the same findings as the rows it came from.
Usage: scan_statsmodels.py --foldline PATH/TO/foldline
Prints "N passed, M failed"; exit 1 on any failure.
"""
import argparse
import itertools
import json
import math
import os
import subprocess
import sys
import tempfile
import warnings

import numpy as np
import pandas as pd
from statsmodels.stats.contingency_tables import StratifiedTable


def make_data(path, counts_path, seed=7, n=4000):
    rng = np.random.default_rng(seed)
    treated = rng.random(n) < 0.45
    site = np.where(treated, rng.choice(["north", "south", "east", "west"], n, p=[0.5, 0.2, 0.2, 0.1]),
                    rng.choice(["north", "south", "east", "west"], n, p=[0.1, 0.3, 0.3, 0.3]))
    age = rng.choice(["18-34", "35-54", "55+"], n, p=[0.3, 0.4, 0.3])
    shift = rng.choice(["day", "night", "weekend", "holiday"], n, p=[0.5, 0.3, 0.19, 0.01])
    base = {"north": 0.8, "south": 0.6, "east": 0.5, "west": 0.3}
    p = np.array([base[s] for s in site]) + np.where(treated, 0.05, 0.0) - (age == "55+") * 0.1
    recovered = (rng.random(n) < p).astype(int)
    df = pd.DataFrame({"arm": np.where(treated, "treated", "usual"), "recovered": recovered,
                       "site": site, "age_band": age, "shift": shift})
    df.loc[rng.random(n) < 0.01, "shift"] = np.nan
    df.to_csv(path, index=False)
    counts = df.fillna({"shift": ""}).groupby(list(df.columns), dropna=False).size().reset_index(name="n")
    counts.to_csv(counts_path, index=False)
    return df


def run(foldline, path, extra=()):
    out = subprocess.run([foldline, "scan", path, "--outcome", "recovered=1", "--exposure", "arm=treated,usual",
                          "--bootstrap", "0", "--json", "-", *extra], capture_output=True, text=True)
    if out.returncode != 0:
        raise SystemExit(f"foldline failed ({out.returncode}): {out.stderr}")
    return json.loads(out.stdout)


def reference(df, strata):
    d = df.dropna(subset=strata)
    g = d.groupby(strata + ["arm", "recovered"]).size().unstack(["arm", "recovered"], fill_value=0)
    g = g.reindex(columns=pd.MultiIndex.from_tuples(
        [("treated", 1), ("treated", 0), ("usual", 1), ("usual", 0)]), fill_value=0)
    c = g.to_numpy(dtype=float)
    a, b, cc, dd = c[:, 0], c[:, 1], c[:, 2], c[:, 3]
    inf = (a + b > 0) & (cc + dd > 0) & (a + cc > 0) & (b + dd > 0)
    t = np.stack([np.stack([a[inf], b[inf]]), np.stack([cc[inf], dd[inf]])])
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        st = StratifiedTable(t)
        lo, hi = st.oddsratio_pooled_confint(alpha=0.05)
        cmh = st.test_null_odds(correction=False)
        bd = st.test_equal_odds(adjust=True)
    return {"rate_focal": a.sum() / (a.sum() + b.sum()), "rate_reference": cc.sum() / (cc.sum() + dd.sum()),
            "mh_or": st.oddsratio_pooled, "mh_or_lo": lo, "mh_or_hi": hi,
            "cmh": cmh.statistic, "cmh_p": cmh.pvalue, "bd": bd.statistic, "bd_p": bd.pvalue}


def close(x, y, rel=1e-9):
    if x is None or y is None or (isinstance(y, float) and math.isnan(y)):
        return x is None and (y is None or math.isnan(y))
    return abs(x - y) <= rel * max(1.0, abs(y))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--foldline", required=True)
    a = ap.parse_args()
    passed = failed = 0

    def check(ok, what):
        nonlocal passed, failed
        if ok:
            passed += 1
        else:
            failed += 1
            print("FAIL", what)

    with tempfile.TemporaryDirectory() as tmp:
        rows_csv, counts_csv = os.path.join(tmp, "clinic.csv"), os.path.join(tmp, "clinic_counts.csv")
        df = make_data(rows_csv, counts_csv)
        doc = run(a.foldline, rows_csv)
        doc_counts = run(a.foldline, counts_csv, ["--count-column", "n"])
        names = ["site", "age_band", "shift"]
        wanted = [[s] for s in names] + [list(p) for p in itertools.combinations(names, 2)]
        got = {tuple(f["strata"]): f for f in doc["findings"] if f["kind"] == "rate"}
        check(len(got) == len(wanted), f"{len(got)} findings, expected {len(wanted)}")
        for strata in wanted:
            f = got.get(tuple(strata))
            if f is None:
                check(False, f"no finding for {strata}")
                continue
            r = reference(df, strata)
            pairs = [("crude.rate_focal", f["crude"]["rate_focal"], r["rate_focal"]),
                     ("crude.rate_reference", f["crude"]["rate_reference"], r["rate_reference"]),
                     ("mh_or", f["adjusted"]["mh_or"], r["mh_or"]),
                     ("mh_or_ci.lo", f["adjusted"]["mh_or_ci"][0], r["mh_or_lo"]),
                     ("mh_or_ci.hi", f["adjusted"]["mh_or_ci"][1], r["mh_or_hi"]),
                     ("cmh.statistic", f["cmh"]["statistic"], r["cmh"]),
                     ("cmh.p", f["cmh"]["p"], r["cmh_p"]),
                     ("breslow_day.statistic (Tarone)", f["breslow_day"]["statistic"], r["bd"]),
                     ("breslow_day.p (Tarone)", f["breslow_day"]["p"], r["bd_p"])]
            for what, x, y in pairs:
                check(close(x, float(y)), f"{strata} {what}: foldline {x} vs statsmodels {y}")
            dec = f["decomposition"]
            check(close(dec["within"] + dec["composition"], f["crude"]["rd"], 1e-12), f"{strata} decomposition sum")
        # Pre-counted file = the rows it was counted from.
        got_c = {tuple(f["strata"]): f for f in doc_counts["findings"] if f["kind"] == "rate"}
        for key, f in got.items():
            g = got_c.get(key)
            if g is None:
                check(False, f"pre-counted: no finding for {key}")
                continue
            same = (f["class"] == g["class"] and close(g["crude"]["rd"], f["crude"]["rd"], 1e-12)
                    and close(g["adjusted"]["mh_or"], f["adjusted"]["mh_or"], 1e-12)
                    and close(g["cmh"]["statistic"], f["cmh"]["statistic"], 1e-9)
                    and close(g["q_value"], f["q_value"], 1e-9)
                    and len(g["strata_table"]) == len(f["strata_table"]))
            check(same, f"pre-counted differs for {key}")
    print(f"{passed} passed, {failed} failed")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
