#!/usr/bin/python3
"""`foldline adjust DIAGRAM --data FILE --json -`: the diagram's claims tested on the sample data,
recomputed with general-purpose libraries (Debian python3-scipy, -numpy, -pandas, -statsmodels).

- G² claims whose columns Foldline does not cut (text columns, and whole-number columns with at
  most 50 values, taken one level per value as the scan does): per stratum of the conditioning
  set, scipy.stats.chi2_contingency(lambda_="log-likelihood", correction=False) on the table
  without empty rows and columns, statistics and df summed, p = scipy.stats.chi2.sf.
- Partial-correlation claims: residuals of both columns on the joint strata of the set's
  categorical members (one dummy per stratum) and its numeric members (numpy.linalg.lstsq),
  Pearson r of the residuals, Fisher z = atanh(r) sqrt(n - k - 3), p = 2 scipy.stats.norm.sf(|z|).
- q: statsmodels.stats.multitest.multipletests(method="fdr_bh") over every tested claim.
- a deliberately wrong diagram (the clinic sample's diagram without the arrow severity ->
  recovered, which the sample generator does draw) must be contradicted on the claim the missing
  arrow creates.

Usage: diagram_checks_reference.py FOLDLINE SOURCE_DIR
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import pandas as pd
from scipy.stats import chi2, chi2_contingency, norm
from statsmodels.stats.multitest import multipletests

failures = 0


def check(ok, what):
    global failures
    if not ok:
        failures += 1
        print("FAIL:", what)


def uncut(s):
    """True when Foldline keeps the column's values as levels (text, or few whole numbers)."""
    if s.dtype == object:
        return True
    v = s.dropna()
    return bool(np.all(v == np.floor(v))) and v.nunique() <= 50


def g_squared(df, a, b, given):
    d = df[[a, b] + given].dropna()
    groups = [d] if not given else [g for _, g in d.groupby(given if len(given) > 1 else given[0])]
    stat, dof = 0.0, 0
    for g in groups:
        t = pd.crosstab(g[a], g[b]).to_numpy()
        t = t[t.sum(1) > 0][:, t.sum(0) > 0]
        if t.shape[0] < 2 or t.shape[1] < 2:
            continue
        s, _, k, _ = chi2_contingency(t, correction=False, lambda_="log-likelihood")
        stat += s
        dof += k
    return stat, dof, chi2.sf(stat, dof)


def partial_corr(df, a, b, given):
    d = df[[a, b] + given].dropna()
    cats = [g for g in given if uncut(d[g]) or d[g].dtype == object]
    nums = [g for g in given if g not in cats]
    stratum = d[cats].astype(str).agg("|".join, axis=1) if cats else pd.Series("all", index=d.index)
    X = pd.get_dummies(stratum).to_numpy(dtype=float)
    if nums:
        X = np.column_stack([X, d[nums].to_numpy(dtype=float)])
    k = np.linalg.matrix_rank(X) - 1
    ra = d[a].to_numpy(float) - X @ np.linalg.lstsq(X, d[a].to_numpy(float), rcond=None)[0]
    rb = d[b].to_numpy(float) - X @ np.linalg.lstsq(X, d[b].to_numpy(float), rcond=None)[0]
    r = np.corrcoef(ra, rb)[0, 1]
    z = np.arctanh(r) * np.sqrt(len(d) - k - 3)
    return r, z, 2 * norm.sf(abs(z))


def run(foldline, diagram, data):
    out = subprocess.run([foldline, "adjust", diagram, "--data", data, "--json", "-"], capture_output=True,
                         text=True)
    check(out.returncode == 0, f"adjust {diagram} --data {data} exits 0 ({out.stderr.strip()})")
    return json.loads(out.stdout)["diagram_checks"]


def main():
    foldline, src = sys.argv[1], sys.argv[2]
    samples = os.path.join(src, "sample_data")
    n_g = n_r = 0
    for name in ["lender_approvals", "clinic_outcomes", "retail_weeks"]:
        data = os.path.join(samples, name + ".csv")
        df = pd.read_csv(data)
        checks = run(foldline, os.path.join(samples, name + ".diagram.json"), data)
        tested = [c for c in checks["claims"] if c["p"] is not None]
        want_q = multipletests([c["p"] for c in tested], method="fdr_bh")[1] if tested else []
        for c, q in zip(tested, want_q):
            check(abs(c["q"] - q) <= 1e-9 * max(1.0, q), f"{name}: q of {c['a']}, {c['b']}: {c['q']} vs statsmodels {q}")
            check(c["contradicted"] == (q < checks["alpha"]), f"{name}: contradicted flag of {c['a']}, {c['b']}")
        for c in tested:
            cols = [c["a"], c["b"]] + c["given"]
            label = f"{name}: {c['a']} _||_ {c['b']} | {c['given']}"
            if c["method"] == "g-squared" and all(uncut(df[x]) for x in cols):
                stat, dof, p = g_squared(df, c["a"], c["b"], c["given"])
                n_g += 1
                check(abs(c["statistic"] - stat) <= 1e-7 * max(1.0, stat) and c["df"] == dof
                      and abs(c["p"] - p) <= 1e-7 * max(p, 1e-300), f"{label}: G² {c['statistic']} df {c['df']} "
                      f"p {c['p']} vs scipy {stat} df {dof} p {p}")
            elif c["method"] == "partial-correlation":
                r, z, p = partial_corr(df, c["a"], c["b"], c["given"])
                n_r += 1
                check(abs(c["partial_r"] - r) <= 1e-9 and abs(c["statistic"] - z) <= 1e-7 * max(1.0, abs(z)),
                      f"{label}: partial r {c['partial_r']} z {c['statistic']} vs numpy {r} {z}")
    # A diagram missing an arrow: the clinic sample's diagram without severity -> recovered.
    with open(os.path.join(samples, "clinic_outcomes.diagram.json")) as f:
        diagram = json.load(f)
    edges = [e for e in diagram["edges"] if (e["from"], e["to"]) != ("severity", "recovered")]
    check(len(edges) == len(diagram["edges"]) - 1, "the clinic diagram has the arrow severity -> recovered")
    diagram["edges"] = edges
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "cut.diagram.json")
        with open(path, "w") as f:
            json.dump(diagram, f)
        checks = run(foldline, path, os.path.join(samples, "clinic_outcomes.csv"))
        hit = [c for c in checks["claims"] if {c["a"], c["b"]} == {"severity", "recovered"}]
        check(len(hit) == 1 and hit[0]["contradicted"] and "an arrow or a common cause may be missing" in hit[0]["sentence"],
              f"removing severity -> recovered is flagged: {hit}")
    print(f"{n_g} G² claims (scipy), {n_r} partial-correlation claims (numpy), q (statsmodels fdr_bh); "
          f"{failures} failures")
    return 1 if failures or n_g == 0 or n_r == 0 else 0


if __name__ == "__main__":
    sys.exit(main())
