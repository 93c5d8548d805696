#!/usr/bin/python3
"""Reference values for Foldline's slope statistics, from scipy and statsmodels.

Sources (general-purpose reference libraries, Debian's python3-scipy / python3-statsmodels):
  * scipy.stats.linregress: slope, intercept, classical SE, r, two-sided p (pooled and per group)
  * scipy.stats.pearsonr(...).confidence_interval: Fisher-z interval of r
  * statsmodels OLS: classical and HC3 SE of the pooled slope, 95% t interval
  * statsmodels OLS with one dummy per group (y ~ x + C(g)): fixed-effects (within) slope, SE, CI
  * statsmodels compare_f_test of y ~ C(g) + x against y ~ C(g) * x: the equal-slopes F-test
  * statsmodels OLS y ~ x + covariates (+ C(g)): covariate-adjusted pooled and within slopes
  * statsmodels.stats.meta_analysis.combine_effects: fixed-effect (inverse-variance) mean of
    the per-group slopes

Data are drawn from numpy's seeded generator and stored with the values in
tests/core/stats/slope_reference.json, so the C++ tests run without Python.

  slope_reference.py            recompute everything and compare with the committed file
  slope_reference.py --write    regenerate the committed file
Exit status 1 when a recomputed value differs from the committed one (relative 1e-9).
"""
import json
import math
import os
import sys

import numpy as np
import pandas as pd
import statsmodels.formula.api as smf
from scipy import stats
from statsmodels.stats.meta_analysis import combine_effects

HERE = os.path.dirname(os.path.abspath(__file__))
GOLDEN = os.path.join(HERE, "..", "core", "stats", "slope_reference.json")


def make_cases():
    rng = np.random.default_rng(20261202)
    cases = []
    # 1: three groups, slope reversal, heteroskedastic noise.
    sizes = [60, 80, 50]
    g = np.repeat(np.arange(3), sizes)
    x = rng.normal(loc=np.array([0.0, 2.0, 4.0])[g], scale=1.0)
    y = np.array([0.0, 4.0, 8.0])[g] - 0.5 * x + rng.normal(scale=0.3 + 0.2 * np.abs(x))
    cases.append({"name": "three_groups_reversal", "x": x, "y": y, "g": g})
    # 2: four groups with different slopes, one group of two rows, large offset in y.
    sizes = [40, 35, 2, 45]
    g = np.repeat(np.arange(4), sizes)
    x = rng.uniform(0, 10, size=g.size)
    slopes = np.array([1.5, -0.7, 0.3, 0.2])
    y = 1000.0 + slopes[g] * x + rng.normal(scale=1.5, size=g.size)
    cases.append({"name": "four_groups_heterogeneous", "x": x, "y": y, "g": g})
    # 3: two groups and two covariates correlated with x.
    n = 150
    g = (rng.uniform(size=n) < 0.4).astype(int)
    c1 = rng.normal(size=n)
    c2 = rng.normal(size=n) + 0.5 * g
    x = 0.8 * c1 + rng.normal(size=n) + g
    y = 2.0 + 0.6 * x - 1.2 * c1 + 0.4 * c2 + 1.5 * g + rng.normal(scale=0.8, size=n)
    cases.append({"name": "covariates", "x": x, "y": y, "g": g, "c": [c1, c2]})
    return cases


def reference(case):
    x, y, g = case["x"], case["y"], case["g"]
    df = pd.DataFrame({"x": x, "y": y, "g": g})
    out = {"name": case["name"], "x": x.tolist(), "y": y.tolist(), "g": g.tolist()}

    lr = stats.linregress(x, y)
    ols = smf.ols("y ~ x", df).fit()
    hc3 = smf.ols("y ~ x", df).fit(cov_type="HC3")
    ci = ols.conf_int(0.05).loc["x"].tolist()
    rci = stats.pearsonr(x, y).confidence_interval(0.95)
    out["pooled"] = {"slope": lr.slope, "intercept": lr.intercept, "se": lr.stderr,
                     "se_statsmodels": float(ols.bse["x"]), "se_hc3": float(hc3.bse["x"]),
                     "ci": ci, "r": lr.rvalue, "p": lr.pvalue,
                     "r_ci": [rci.low, rci.high]}

    groups = []
    for k in sorted(set(g.tolist())):
        m = g == k
        if m.sum() < 3:
            groups.append({"level": int(k), "n": int(m.sum()), "informative": False})
            continue
        lk = stats.linregress(x[m], y[m])
        fk = smf.ols("y ~ x", df[m]).fit()
        groups.append({"level": int(k), "n": int(m.sum()), "informative": True,
                       "slope": lk.slope, "se": lk.stderr, "r": lk.rvalue, "p": lk.pvalue,
                       "ci": fk.conf_int(0.05).loc["x"].tolist()})
    out["groups"] = groups

    fe = smf.ols("y ~ x + C(g)", df).fit()
    out["within"] = {"slope": float(fe.params["x"]), "se": float(fe.bse["x"]),
                     "ci": fe.conf_int(0.05).loc["x"].tolist(), "df": float(fe.df_resid),
                     "p": float(fe.pvalues["x"])}

    full = smf.ols("y ~ C(g) * x", df[df.groupby("g")["g"].transform("size") >= 2]).fit()
    common = smf.ols("y ~ C(g) + x", df[df.groupby("g")["g"].transform("size") >= 2]).fit()
    f, p, dfd = full.compare_f_test(common)
    out["equal_slopes"] = {"f": float(f), "p": float(p), "df1": float(dfd),
                           "df2": float(full.df_resid)}

    inf = [gr for gr in groups if gr["informative"]]
    ce = combine_effects(np.array([gr["slope"] for gr in inf]),
                         np.array([gr["se"] ** 2 for gr in inf]), method_re="chi2")
    out["precision_weighted"] = {"slope": float(ce.mean_effect_fe), "se": float(ce.sd_eff_w_fe)}

    if "c" in case:
        for j, c in enumerate(case["c"]):
            df[f"c{j + 1}"] = c
        out["c"] = [c.tolist() for c in case["c"]]
        terms = " + ".join(f"c{j + 1}" for j in range(len(case["c"])))
        adj = smf.ols(f"y ~ x + {terms}", df).fit()
        adjw = smf.ols(f"y ~ x + {terms} + C(g)", df).fit()
        out["adjusted"] = {"slope": float(adj.params["x"]), "se": float(adj.bse["x"]),
                           "ci": adj.conf_int(0.05).loc["x"].tolist()}
        out["adjusted_within"] = {"slope": float(adjw.params["x"]), "se": float(adjw.bse["x"]),
                                  "ci": adjw.conf_int(0.05).loc["x"].tolist()}
    return out


def compare(a, b, path=""):
    bad = []
    if isinstance(a, dict):
        for k in set(a) | set(b):
            if k not in a or k not in b:
                bad.append(f"{path}/{k}: missing")
            else:
                bad += compare(a[k], b[k], f"{path}/{k}")
    elif isinstance(a, list):
        if len(a) != len(b):
            return [f"{path}: length {len(a)} vs {len(b)}"]
        for i, (u, v) in enumerate(zip(a, b)):
            bad += compare(u, v, f"{path}[{i}]")
    elif isinstance(a, float) or isinstance(b, float):
        if not math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12):
            bad.append(f"{path}: {a!r} vs {b!r}")
    elif a != b:
        bad.append(f"{path}: {a!r} vs {b!r}")
    return bad


def main(argv):
    doc = {"source": "scipy.stats.linregress / pearsonr, statsmodels OLS (nonrobust, HC3), "
                     "OLS with group dummies, compare_f_test, combine_effects; generated by "
                     "tests/reference/slope_reference.py",
           "cases": [reference(c) for c in make_cases()]}
    if "--write" in argv:
        with open(GOLDEN, "w") as f:
            json.dump(doc, f, indent=1)
            f.write("\n")
        print(f"wrote {GOLDEN}")
        return 0
    with open(GOLDEN) as f:
        stored = json.load(f)
    bad = compare(doc, stored)
    for b in bad[:20]:
        print("MISMATCH", b)
    print(f"{len(doc['cases'])} cases, {len(bad)} mismatches")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
