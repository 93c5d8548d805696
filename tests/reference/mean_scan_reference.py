#!/usr/bin/python3
"""End-to-end checks of `foldline scan --mean` against general-purpose reference libraries.

  foldline scan DATA --mean Y --exposure G=FOCAL,REF --strata S --json -   is compared with:
  * statsmodels OLS  Y ~ g + C(S)  (informative strata only): the group coefficient, its
    classical SE and its HC1 SE (cov_type="HC1") -> "fixed_effects" estimate, se, se_hc1
  * scipy.stats.ttest_ind(equal_var=False): Welch's t and p of the pooled difference and of
    each stratum's difference -> "crude.difference" and "strata_table[].difference"
  * numpy/pandas medians per group (pay-gap convention, --pay-gap)

Data:
  * sample_data/pay_review.csv (invented employer; generate_pay.py): base_pay by gender,
    within grade; also checks that the planted reversal is found and G4 is flagged at 5%.
  * Palmer penguins as Debian's r-cran-palmerpenguins ships it
    (/usr/lib/R/site-library/palmerpenguins/extdata/penguins.csv, Gorman, Williams & Fraser
    2014): body_mass_g by sex (female vs male) within species; 333 rows with sex and mass.
  * Simulation (seeded): planted mean reversals are found; where a confounder explains the
    whole gap, the share of scans reporting a false reversal stays at or below the nominal
    false discovery rate (alpha = 0.05) — the test allows the binomial 99% upper margin.

Usage: mean_scan_reference.py FOLDLINE SOURCE_DIR      (exit 1 on any mismatch; 77 = skipped)
"""
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
import pandas as pd
import statsmodels.formula.api as smf
from scipy import stats

FOLDLINE, SRC = sys.argv[1], sys.argv[2]
PENGUINS = "/usr/lib/R/site-library/palmerpenguins/extdata/penguins.csv"
failures = []


def check(what, got, want, rel=1e-7):
    if got is None or not math.isclose(got, want, rel_tol=rel, abs_tol=1e-9 * max(1.0, abs(want))):
        failures.append(f"{what}: foldline {got}, reference {want}")


def scan(path, *args):
    out = subprocess.run([FOLDLINE, "scan", path, "--json", "-", "--threads", "1", *args],
                         capture_output=True, text=True)
    if out.returncode != 0:
        failures.append(f"scan {path} {args} failed ({out.returncode}): {out.stderr.strip()}")
        return None
    return json.loads(out.stdout)


def compare(name, df, y, g, focal, ref, s, doc):
    f = next(x for x in doc["findings"] if x["kind"] == "mean" and x["strata"] == [s])
    d = df[[y, g, s]].dropna()
    d = d[d[g].isin([focal, ref])]
    a, b = d[d[g] == focal][y], d[d[g] == ref][y]
    w = stats.ttest_ind(a, b, equal_var=False)
    check(f"{name} crude difference", f["crude"]["difference"]["estimate"], a.mean() - b.mean())
    check(f"{name} crude Welch t", f["crude"]["difference"]["stat"], w.statistic)
    check(f"{name} crude Welch p", f["crude"]["difference"]["p"], w.pvalue, 1e-6)
    informative = [k for k, part in d.groupby(s) if part[g].nunique() == 2]
    d = d[d[s].isin(informative)].copy()
    d["focal"] = (d[g] == focal).astype(float)
    d["stratum"] = d[s].astype(str)
    classical = smf.ols(f"{y} ~ focal + C(stratum)", d).fit()
    hc1 = smf.ols(f"{y} ~ focal + C(stratum)", d).fit(cov_type="HC1")
    fe = f["fixed_effects"]
    check(f"{name} fixed-effects coefficient", fe["estimate"], classical.params["focal"])
    check(f"{name} classical SE", fe["se"], classical.bse["focal"])
    check(f"{name} HC1 SE", fe["se_hc1"], hc1.bse["focal"])
    for row in f["strata_table"]:
        part = d[d["stratum"] == row["level"]]
        if not row["informative"] or len(part) == 0:
            continue
        pa, pb = part[part[g] == focal][y], part[part[g] == ref][y]
        if len(pa) < 2 or len(pb) < 2:
            continue
        t = stats.ttest_ind(pa, pb, equal_var=False)
        check(f"{name} {row['level']} Welch t", row["difference"]["stat"], t.statistic)
    return f


# 1. The invented pay review.
pay_path = os.path.join(SRC, "sample_data", "pay_review.csv")
pay = pd.read_csv(pay_path)
doc = scan(pay_path, "--mean", "base_pay", "--exposure", "gender=woman,man", "--strata", "grade", "--no-pairs",
           "--pay-gap")
if doc:
    f = compare("pay review", pay, "base_pay", "gender", "woman", "man", "grade", doc)
    if f["class"] != "reversal":
        failures.append(f"pay review: planted reversal by grade not found (class {f['class']})")
    med = pay.groupby("gender")["base_pay"].median()
    check("pay review median woman", f["pay_gap"]["median_focal"], med["woman"])
    check("pay review median man", f["pay_gap"]["median_reference"], med["man"])
    if f["pay_gap"]["flagged"] != ["G4"]:
        failures.append(f"pay review: strata flagged at 5% {f['pay_gap']['flagged']}, expected ['G4']")

# 2. Palmer penguins (Debian r-cran-palmerpenguins).
if os.path.exists(PENGUINS):
    peng = pd.read_csv(PENGUINS)
    doc = scan(PENGUINS, "--mean", "body_mass_g", "--exposure", "sex=female,male", "--strata", "species",
               "--no-pairs")
    if doc:
        compare("penguins", peng, "body_mass_g", "sex", "female", "male", "species", doc)
else:
    print("penguins.csv not installed (r-cran-palmerpenguins): that check is skipped")

# 3. Simulation.
rng = np.random.default_rng(20261205)
ALPHA, RUNS = 0.05, 60
found, false_runs = 0, 0
with tempfile.TemporaryDirectory() as tmp:
    for run in range(RUNS):
        n = 1200
        z = rng.integers(0, 4, n)  # the confounder
        g = rng.random(n) < np.array([0.15, 0.35, 0.65, 0.85])[z]
        noise = [rng.integers(0, k, n) for k in (2, 3, 4)]
        # Planted: z lowers y and raises the share of group B; within z, B is +1.5 higher.
        y_planted = 50 - 6 * z + 1.5 * g + rng.normal(0, 3, n)
        # Null: z explains the whole gap; no group effect within strata.
        y_null = 50 - 6 * z + rng.normal(0, 3, n)
        for kind, y in (("planted", y_planted), ("null", y_null)):
            df = pd.DataFrame({"grp": np.where(g, "B", "A"), "z": z.astype(str), "n1": noise[0], "n2": noise[1],
                               "n3": noise[2], "y": y})
            path = os.path.join(tmp, f"{kind}.csv")
            df.to_csv(path, index=False)
            d = scan(path, "--mean", "y", "--exposure", "grp=B,A", "--alpha", str(ALPHA), "--bootstrap", "0")
            if not d:
                continue
            rev = [x["strata"] for x in d["findings"] if x["kind"] == "mean" and x["class"] == "reversal"]
            if kind == "planted":
                found += ["z"] in rev
            else:
                false_runs += bool(rev)
if found < RUNS * 0.9:
    failures.append(f"simulation: planted reversal by z found in {found} of {RUNS} runs (expected >= 90%)")
# Under the null every reported reversal is false, so FDR = P(any reversal); allow the 99% binomial margin.
limit = ALPHA + 2.33 * math.sqrt(ALPHA * (1 - ALPHA) / RUNS)
if false_runs / RUNS > limit:
    failures.append(f"simulation: false reversals in {false_runs} of {RUNS} null runs, above {limit:.3f}")
print(f"simulation: planted found {found}/{RUNS}; null runs with a false reversal {false_runs}/{RUNS}")

for f in failures:
    print("FAIL", f)
print("mean scan reference:", "FAILED" if failures else "ok")
sys.exit(1 if failures else 0)
