#!/usr/bin/python3
"""Reference values for Foldline's mean-gap statistics (core/stats/mean_gap.h and the mean
finding, core/scan/mean_analysis.h), from scipy and statsmodels.

Sources (general-purpose reference libraries, Debian's python3-scipy 1.10.x and
python3-statsmodels 0.13.x):
  * scipy.stats.ttest_ind(equal_var=False): Welch's t and two-sided p (pooled and per grade);
    Welch-Satterthwaite df by its textbook formula, interval limits with scipy.stats.t.ppf
  * scipy.stats.t.ppf: each group's t interval of the mean
  * statsmodels OLS y ~ g + C(grade) (informative grades only): the fixed-effects coefficient,
    classical SE and t interval, HC1 SE (cov_type="HC1"), residual df
  * statsmodels anova_lm(additive, full) with full = y ~ C(g) * C(grade): the interaction F test
  * statsmodels.stats.meta_analysis.combine_effects: Cochran's Q of the per-grade Welch
    differences with inverse-variance weights (cross-checked against a numpy sum)
  * numpy, handbook formulas: the directly standardised difference (standard = pooled mix of
    the informative grades) and its SE, the symmetric (Das Gupta) within/composition split
  * the reversal p of the class rules: the larger of the one-sided t tails of the Welch crude
    difference (its own direction) and the HC1 fixed-effects difference (the opposite one)

Data: tests/core/stats/data/pay_by_grade.csv (invented; make_pay_by_grade.py beside it), in
three variants: "rows" (salary as is), "near_1e6" (y = 1e6 + (salary - 50000) / 8000 in IEEE
double, the reference computed on y - 1e6, which is exact, since every figure but the means
is unchanged by a shift) and "repeated" (row i, 0-based, repeated 1 + i % 3 times: the rows
a pre-counted table with those counts stands for).

  mean_gap_reference.py          recompute everything and compare with the committed file
  mean_gap_reference.py --write  regenerate tests/core/stats/mean_gap_reference.json
Exit status 1 when a recomputed value differs from the committed one (relative 1e-9).
"""
import json
import math
import os
import sys
import warnings

import numpy as np
import pandas as pd
import scipy
import statsmodels
import statsmodels.formula.api as smf
from scipy import stats
from statsmodels.stats.anova import anova_lm
from statsmodels.stats.meta_analysis import combine_effects

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.join(HERE, "..", "core", "stats", "data", "pay_by_grade.csv")
GOLDEN = os.path.join(HERE, "..", "core", "stats", "mean_gap_reference.json")
ALPHA = 0.05
FOCAL, REFERENCE = "B", "A"


def welch(y1, y0):
    n1, n0 = len(y1), len(y0)
    v1, v0 = np.var(y1, ddof=1) / n1, np.var(y0, ddof=1) / n0
    se = math.sqrt(v1 + v0)
    df = (v1 + v0) ** 2 / (v1 ** 2 / (n1 - 1) + v0 ** 2 / (n0 - 1))
    res = stats.ttest_ind(y1, y0, equal_var=False)
    d = float(np.mean(y1) - np.mean(y0))
    crit = stats.t.ppf(1 - ALPHA / 2, df)
    return {"estimate": d, "se": se, "df": df, "t": float(res.statistic), "p": float(res.pvalue),
            "ci": [d - crit * se, d + crit * se]}


def group_mean(y):
    n = len(y)
    m, sd = float(np.mean(y)), float(np.std(y, ddof=1))
    half = stats.t.ppf(1 - ALPHA / 2, n - 1) * sd / math.sqrt(n)
    return {"n": n, "mean": m, "sd": sd, "ci": [m - half, m + half]}


def one_sided_t(t, df):
    return float(stats.t.sf(t, df))


def figures(df, shift=0.0):
    """Every figure of the mean gap for frame df (columns grade, g (1 = focal), y); `shift`
    is added back to the means only."""
    out = {}
    y1 = df.y[df.g == 1].to_numpy()
    y0 = df.y[df.g == 0].to_numpy()
    f, r = group_mean(y1), group_mean(y0)
    for gm in (f, r):
        gm["mean"] += shift
        gm["ci"] = [c + shift for c in gm["ci"]]
    w = welch(y1, y0)
    out["crude"] = {"focal": f, "reference": r, "difference": w, "ratio": f["mean"] / r["mean"]}

    grades = sorted(df.grade.unique())
    informative = [k for k in grades if df[(df.grade == k)].g.nunique() == 2]
    strata = []
    for k in grades:
        s = df[df.grade == k]
        a, b = s.y[s.g == 1].to_numpy(), s.y[s.g == 0].to_numpy()
        row = {"grade": k, "n_focal": len(a), "n_reference": len(b),
               "share_focal": len(a) / len(y1), "share_reference": len(b) / len(y0),
               "informative": k in informative}
        if k in informative:
            row["mean_focal"] = float(np.mean(a)) + shift
            row["mean_reference"] = float(np.mean(b)) + shift
            row["sd_focal"] = float(np.std(a, ddof=1))
            row["sd_reference"] = float(np.std(b, ddof=1))
            row["difference"] = welch(a, b)
        strata.append(row)
    out["strata"] = strata

    inf = df[df.grade.isin(informative)].copy()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        ols = smf.ols("y ~ g + C(grade)", data=inf).fit()
        hc1 = smf.ols("y ~ g + C(grade)", data=inf).fit(cov_type="HC1")
        full = smf.ols("y ~ C(g) * C(grade)", data=inf).fit()
        additive = smf.ols("y ~ C(g) + C(grade)", data=inf).fit()
        table = anova_lm(additive, full)
    lo, hi = ols.conf_int(alpha=ALPHA).loc["g"]
    beta, se_hc1, df_resid = float(ols.params["g"]), float(hc1.bse["g"]), float(ols.df_resid)
    crit = stats.t.ppf(1 - ALPHA / 2, df_resid)
    out["fixed_effects"] = {
        "estimate": beta, "se": float(ols.bse["g"]), "se_hc1": se_hc1, "df": df_resid,
        "ci": [float(lo), float(hi)], "p": float(ols.pvalues["g"]), "rss": float(ols.ssr),
        "ci_hc1": [beta - crit * se_hc1, beta + crit * se_hc1],
        "p_hc1": 2 * one_sided_t(abs(beta / se_hc1), df_resid)}
    out["interaction"] = {"f": float(table.F[1]), "df1": float(table.df_diff[1]),
                          "df2": float(table.df_resid[1]), "p": float(table["Pr(>F)"][1])}

    # Directly standardised difference: standard = pooled mix of the informative grades.
    n_inf = len(inf)
    est, var = 0.0, 0.0
    for k in informative:
        s = inf[inf.grade == k]
        a, b = s.y[s.g == 1].to_numpy(), s.y[s.g == 0].to_numpy()
        wk = len(s) / n_inf
        est += wk * (np.mean(a) - np.mean(b))
        var += wk ** 2 * (np.var(a, ddof=1) / len(a) + np.var(b, ddof=1) / len(b))
    se = math.sqrt(var)
    z = stats.norm.ppf(1 - ALPHA / 2)
    out["standardised"] = {"estimate": float(est), "se": se, "ci": [est - z * se, est + z * se],
                           "p": float(2 * stats.norm.sf(abs(est / se)))}

    d = np.array([r["difference"]["estimate"] for r in strata if r["informative"]])
    v = np.array([r["difference"]["se"] ** 2 for r in strata if r["informative"]])
    ce = combine_effects(d, v, use_t=False)
    wts = 1 / v
    pooled = float(np.sum(wts * d) / np.sum(wts))
    q_numpy = float(np.sum(wts * (d - pooled) ** 2))
    assert abs(ce.q - q_numpy) <= 1e-9 * q_numpy, (ce.q, q_numpy)
    out["cochran_q"] = {"q": float(ce.q), "df": float(len(d) - 1),
                        "p": float(stats.chi2.sf(ce.q, len(d) - 1)), "pooled": pooled,
                        "i_squared": max(0.0, (ce.q - (len(d) - 1)) / ce.q)}

    # Symmetric split; a grade where a group is absent takes the other group's mean.
    n1, n0 = len(y1), len(y0)
    within = comp = 0.0
    for k in grades:
        s = df[df.grade == k]
        a, b = s.y[s.g == 1].to_numpy(), s.y[s.g == 0].to_numpy()
        ma = np.mean(a) if len(a) else np.mean(b)
        mb = np.mean(b) if len(b) else ma
        c1, c0 = len(a) / n1, len(b) / n0
        within += (c1 + c0) / 2 * (ma - mb)
        comp += (ma + mb) / 2 * (c1 - c0)
    out["decomposition"] = {"crude_gap": w["estimate"], "within": float(within),
                            "composition": float(comp)}

    crude_dir = 1.0 if w["estimate"] > 0 else -1.0
    p_crude = one_sided_t(crude_dir * w["t"], w["df"])
    p_adj = one_sided_t(-crude_dir * beta / se_hc1, df_resid)
    out["p_reversal"] = max(p_crude, p_adj)
    return out


def compute():
    raw = pd.read_csv(DATA)
    base = pd.DataFrame({"grade": raw.grade, "g": (raw.group == FOCAL).astype(int),
                         "y": raw.salary.astype(float)})
    near = base.copy()
    y6 = 1e6 + (raw.salary.to_numpy(dtype=float) - 50000.0) / 8000.0
    near["y"] = y6 - 1e6  # exact (Sterbenz): the same doubles the C++ side sees, shifted
    counts = 1 + np.arange(len(base)) % 3
    repeated = base.loc[base.index.repeat(counts)].reset_index(drop=True)
    return {
        "source": "[calc] scipy %s / statsmodels %s / numpy %s on tests/core/stats/data/pay_by_grade.csv"
                  % (scipy.__version__, statsmodels.__version__, np.__version__),
        "alpha": ALPHA,
        "rows": figures(base),
        "near_1e6": figures(near, shift=1e6),
        "repeated": figures(repeated),
    }


def compare(a, b, path=""):
    bad = []
    if isinstance(a, dict):
        for k in a:
            bad += compare(a[k], b.get(k) if isinstance(b, dict) else None, path + "/" + k)
    elif isinstance(a, list):
        for i, x in enumerate(a):
            bad += compare(x, b[i] if isinstance(b, list) and i < len(b) else None, "%s[%d]" % (path, i))
    elif isinstance(a, float) and not isinstance(a, bool):
        if not isinstance(b, (int, float)) or abs(a - b) > 1e-9 * max(1.0, abs(a)):
            bad.append("%s: committed %r, recomputed %r" % (path, a, b))
    elif path != "/source" and a != b:
        bad.append("%s: committed %r, recomputed %r" % (path, a, b))
    return bad


def main():
    doc = compute()
    if "--write" in sys.argv[1:]:
        with open(GOLDEN, "w", encoding="utf-8") as f:
            json.dump(doc, f, indent=1)
            f.write("\n")
        return 0
    with open(GOLDEN, encoding="utf-8") as f:
        committed = json.load(f)
    bad = compare(committed, doc)
    for line in bad:
        print(line)
    print("mean_gap_reference: %d differences" % len(bad))
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
