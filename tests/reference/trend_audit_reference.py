#!/usr/bin/python3
"""Saved trend audits end to end: `foldline run` on sample_data/retail_audit.foldline and the slope
CSV pair of `run --csv` and `scan --trend --csv`, and `scan --covariates` (JSON and its errors).

Outside references: scipy.stats.linregress gives the pooled slope and each stratum's slope
(ordinary least squares of y on x), statsmodels OLS with one intercept per stratum
(y ~ x + C(stratum)) gives the within-stratum slope, pandas reads the raw CSV, and Python's
csv and json modules parse the exports and the project file. The CSV holds 10 significant
digits, so figures are compared to 1e-8 relative.

Usage: trend_audit_reference.py FOLDLINE SOURCE_DIR
"""
import csv
import json
import os
import shutil
import subprocess
import sys
import tempfile

import pandas as pd
import statsmodels.formula.api as smf
from scipy.stats import linregress

FOLDLINE, SOURCE = sys.argv[1], sys.argv[2]
SAMPLES = os.path.join(SOURCE, "sample_data")
failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def run(args, cwd):
    p = subprocess.run([FOLDLINE] + args, cwd=cwd, capture_output=True, text=True)
    return p.returncode, p.stdout, p.stderr


def close(a, b, rel=1e-8):
    return abs(a - b) <= rel * max(1.0, abs(b))


def rows(path):
    with open(path, newline="", encoding="utf-8") as f:
        return list(csv.DictReader(f))


def check_slopes(work, prefix, df, x, y, stratum):
    """The slope CSV pair against scipy / statsmodels for the single-column finding `stratum`."""
    findings = rows(os.path.join(work, prefix + "-slope-findings.csv"))
    strata = rows(os.path.join(work, prefix + "-slope-strata.csv"))
    used = df.dropna(subset=[x, y])
    pooled = linregress(used[x], used[y]).slope
    check(all(close(float(f["pooled_slope"]), pooled) for f in findings),
          "%s: every finding's pooled slope is scipy's %.6g" % (prefix, pooled))
    number = [i + 1 for i, f in enumerate(findings) if f["strata"] == stratum]
    check(len(number) == 1, "%s: one finding stratified by %s" % (prefix, stratum))
    if len(number) != 1:
        return findings
    f = findings[number[0] - 1]
    ols = smf.ols("Q('%s') ~ Q('%s') + C(Q('%s'))" % (y, x, stratum), data=used).fit()
    within = ols.params["Q('%s')" % x]
    check(close(float(f["within_slope"]), within), "%s: within slope %.6g is statsmodels' OLS with stratum "
          "intercepts (%.6g)" % (prefix, float(f["within_slope"]), within))
    mine = {r["stratum"]: r for r in strata if r["finding"] == str(number[0])}
    levels = sorted(used[stratum].unique())
    check(sorted(mine) == levels, "%s: one strata row per level of %s (%d)" % (prefix, stratum, len(levels)))
    for level in levels:
        g = used[used[stratum] == level]
        ref = linregress(g[x], g[y]).slope
        r = mine.get(level)
        check(r is not None and close(float(r["slope"]), ref) and int(float(r["n"])) == len(g),
              "%s: %s = %s slope %.6g (scipy), n %d" % (prefix, stratum, level, ref, len(g)))
    return findings


work = tempfile.mkdtemp(prefix="foldline-trend-")
try:
    for f in ("retail_audit.foldline", "retail_weeks.csv"):
        shutil.copy(os.path.join(SAMPLES, f), work)
    retail = pd.read_csv(os.path.join(work, "retail_weeks.csv"))
    before = open(os.path.join(work, "retail_audit.foldline"), "rb").read()

    print("-- the saved trend audit")
    rc, out, err = run(["run", "retail_audit.foldline", "--csv", "r", "--json", "r.json"], work)
    check(rc == 0, "run exits 0 on the sample trend audit (got %d: %s)" % (rc, err.strip()))
    check("Classes: as saved in the project." in out, "run finds the saved classes")
    check("Slope of weekly_sales on promo_spend" in out, "run prints the slope summary")
    check(open(os.path.join(work, "retail_audit.foldline"), "rb").read() == before, "run leaves the project untouched")
    check(not os.path.exists(os.path.join(work, "r-findings.csv")), "a trend audit writes no rate CSV pair")
    findings = check_slopes(work, "r", retail, "promo_spend", "weekly_sales", "store_format")
    doc = json.load(open(os.path.join(work, "r.json")))
    slope_json = [f for f in doc["findings"] if f["kind"] == "slope"]
    check(len(slope_json) == len(findings), "one CSV row per slope finding of the JSON (%d)" % len(findings))
    check([f["class"] for f in slope_json] == [f["class"] for f in findings], "CSV classes follow the JSON's order")
    sf = [f for f in findings if f["strata"] == "store_format"]
    check(sf and sf[0]["class"] == "reversal" and sf[0]["decision"] == "upheld" and "trading desk" in sf[0]["note"],
          "the store_format reversal carries the reviewer's decision and note")
    check(float(sf[0]["pooled_slope"]) > 0 > float(sf[0]["within_slope"]),
          "pooled slope positive, within-format slope negative (the planted story)")

    print("-- a class that changed")
    proj = json.load(open(os.path.join(work, "retail_audit.foldline")))
    for r in proj["findings"]:
        if r["strata"] == ["store_format"]:
            r["class"] = "stable"
    json.dump(proj, open(os.path.join(work, "retail_audit.foldline"), "w"), indent=2)
    rc, out, err = run(["run", "retail_audit.foldline"], work)
    check(rc == 4, "run exits 4 when a slope finding's class differs from the saved one (got %d)" % rc)
    check("slope: store_format (weekly_sales on promo_spend): stable -> reversal" in out,
          "run names the slope class change")
    rc, out, err = run(["run", "retail_audit.foldline", "--update"], work)
    rc2, out2, err2 = run(["run", "retail_audit.foldline"], work)
    check(rc == 4 and rc2 == 0, "--update records the new class, then run exits 0 (got %d, %d)" % (rc, rc2))

    print("-- covariates in a saved slope question")
    proj["question"]["covariates"] = ["footfall"]
    proj["findings"] = []
    json.dump(proj, open(os.path.join(work, "covariates.foldline"), "w"), indent=2)
    rc, out, err = run(["run", "covariates.foldline", "--csv", "c"], work)
    check(rc == 0, "a slope question with a covariate runs (got %d: %s)" % (rc, err.strip()))
    cov = [f for f in rows(os.path.join(work, "c-slope-findings.csv")) if f["strata"] == "store_format"]
    used = retail.dropna(subset=["promo_spend", "weekly_sales", "footfall"])
    pooled_adj = smf.ols("weekly_sales ~ promo_spend + footfall", data=used).fit().params["promo_spend"]
    within_adj = smf.ols("weekly_sales ~ promo_spend + footfall + C(store_format)", data=used).fit().params["promo_spend"]
    check(len(cov) == 1 and cov[0]["covariates"] == "footfall" and int(cov[0]["rows_used"]) == len(used),
          "the covariate is recorded and rows missing it are left out (%d rows)" % len(used))
    check(len(cov) == 1 and close(float(cov[0]["adjusted_pooled_slope"]), pooled_adj) and
          close(float(cov[0]["adjusted_within_slope"]), within_adj),
          "adjusted pooled %.6g and within %.6g slopes are statsmodels' OLS with footfall" % (pooled_adj, within_adj))

    print("-- scan --covariates (statsmodels OLS with the covariate, pooled and with format intercepts)")
    rc, out, err = run(["scan", "retail_weeks.csv", "--outcome", "weekly_sales", "--exposure", "promo_spend",
                        "--covariates", "footfall", "--strata", "store_format,region", "--json", "cov.json"], work)
    check(rc == 0, "scan --covariates footfall exits 0 (got %d: %s)" % (rc, err.strip()))
    check("adjusted for footfall" in out, "the printed summary says what the slopes are adjusted for")
    doc = json.load(open(os.path.join(work, "cov.json")))
    check(doc["slope_question"].get("covariates") == ["footfall"], "the JSON question records the covariate")
    sf = [f for f in doc["findings"] if f["kind"] == "slope" and f["strata"] == ["store_format"]]
    pooled_fit = smf.ols("weekly_sales ~ promo_spend + footfall", data=used).fit()
    within_fit = smf.ols("weekly_sales ~ promo_spend + footfall + C(store_format)", data=used).fit()
    for name, fit in (("pooled", pooled_fit), ("within", within_fit)):
        got = sf[0]["adjusted"][name] if sf else {}
        lo, hi = fit.conf_int().loc["promo_spend"]
        check(bool(sf) and close(got["slope"], fit.params["promo_spend"]) and close(got["se"], fit.bse["promo_spend"])
              and close(got["slope_ci"][0], lo, 1e-7) and close(got["slope_ci"][1], hi, 1e-7)
              and got["df"] == fit.df_resid,
              "adjusted %s slope %.6g (SE %.4g, df %d) is statsmodels' OLS" %
              (name, fit.params["promo_spend"], fit.bse["promo_spend"], fit.df_resid))
    check(bool(sf) and sf[0]["covariates"] == ["footfall"] and sf[0]["rows"] == len(used),
          "the finding records the covariate and the %d rows with it present" % len(used))
    for bad, words in (("region", "'region' is not numeric"), ("nope", "'nope' not found"),
                       ("promo_spend", "'promo_spend' is the trend's exposure"), ("footfall,", "an empty name")):
        rc, out, err = run(["scan", "retail_weeks.csv", "--outcome", "weekly_sales", "--exposure", "promo_spend",
                            "--covariates", bad], work)
        check(rc == 2 and words in err, "--covariates %s: exit 2 naming the column (got %d: %s)" % (bad, rc, err.strip()))
    rc, out, err = run(["scan", "retail_weeks.csv", "--outcome", "weekly_sales", "--exposure", "promo_spend",
                        "--covariates", "footfall", "--strata", "store_format,footfall"], work)
    check(rc == 2 and "'footfall' is in both --strata and --covariates" in err,
          "a column named as both stratifier and covariate is a usage error (got %d: %s)" % (rc, err.strip()))
    rc, out, err = run(["scan", "retail_weeks.csv", "--outcome", "store_format=mall", "--exposure", "region",
                        "--covariates", "footfall"], work)
    check(rc == 2 and "--covariates adjusts a trend" in err, "--covariates without a trend is a usage error (got %d)" % rc)

    print("-- trend checks saved beside a rate question")
    shutil.copy(os.path.join(SAMPLES, "lender_approvals.csv"), work)
    lp = json.load(open(os.path.join(SAMPLES, "lender_audit.foldline")))
    lp["version"] = 2
    lp["trend"] = {"x": "income", "y": "loan_amount", "covariates": []}
    lp["scan"]["bootstrap"] = 0
    json.dump(lp, open(os.path.join(work, "lender_trend.foldline"), "w"), indent=2)
    rc, out, err = run(["run", "lender_trend.foldline", "--csv", "lt"], work)
    check(rc == 4 and "slope: " in out and "(not saved) ->" in out,
          "new slope findings of a rate audit count as changes until recorded (got %d)" % rc)
    check(all(os.path.exists(os.path.join(work, "lt-" + n)) for n in
              ("findings.csv", "strata.csv", "slope-findings.csv", "slope-strata.csv")),
          "run --csv on a rate audit with trend checks writes both pairs")
    rc, out, err = run(["run", "lender_trend.foldline", "--update"], work)
    rc2, out2, err2 = run(["run", "lender_trend.foldline"], work)
    check(rc2 == 0, "after --update the rate-and-trend audit re-runs as saved (got %d)" % rc2)

    print("-- scan --trend beside a rate question")
    lender = pd.read_csv(os.path.join(work, "lender_approvals.csv"))
    rc, out, err = run(["scan", "lender_approvals.csv", "--outcome", "approved=1", "--exposure", "applicant_group=B,A",
                        "--bootstrap", "0", "--no-pairs", "--trend", "income:loan_amount", "--csv", "l"], work)
    check(rc == 0, "scan --trend --csv exits 0 (got %d: %s)" % (rc, err.strip()))
    check(all(os.path.exists(os.path.join(work, "l-" + n)) for n in
              ("findings.csv", "strata.csv", "slope-findings.csv", "slope-strata.csv")),
          "scan --trend --csv writes the rate pair and the slope pair")
    check_slopes(work, "l", lender, "income", "loan_amount", "product")
finally:
    shutil.rmtree(work, ignore_errors=True)

print("%d failure(s)" % len(failures))
sys.exit(1 if failures else 0)
