#!/usr/bin/python3
"""Cross-check of the CSV reader against pandas.read_csv (pandas 1.5, Debian's python3-pandas).

For the fixture tests/core/io/data/clinic_visits.csv, pandas gives every column's type
(numeric when pandas infers a numeric dtype), missing count (same markers as Foldline:
"", NA, N/A, NULL, "."), distinct count, levels in order of first appearance (pd.unique),
and the sum, minimum and maximum of numeric columns. The script

  * writes those figures as the golden file the C++ test reads (--write GOLDEN), or
  * compares them with the committed golden file and with `foldline inspect --json -`
    (--check GOLDEN --foldline BINARY); exit 1 on any difference.
"""
import argparse
import json
import math
import subprocess
import sys

import pandas as pd

MARKERS = ["", "NA", "N/A", "NULL", "."]


def pandas_figures(path):
    df = pd.read_csv(path, keep_default_na=False, na_values=MARKERS, encoding="utf-8")
    cols = []
    for name in df.columns:
        s = df[name]
        numeric = pd.api.types.is_numeric_dtype(s.dtype)
        c = {"name": name, "type": "numeric" if numeric else "categorical",
             "missing": int(s.isna().sum()), "distinct": int(s.nunique(dropna=True))}
        if numeric:
            v = s.dropna().astype(float)
            c["sum"] = float(v.sum())
            c["min"] = float(v.min())
            c["max"] = float(v.max())
        else:
            c["levels"] = [str(x) for x in pd.unique(s.dropna())]
        cols.append(c)
    return {"source": "pandas %s read_csv(keep_default_na=False, na_values=%s)" % (pd.__version__, MARKERS),
            "rows": int(len(df)), "columns": cols}


def compare(expected, actual, what):
    problems = []
    if expected["rows"] != actual["rows"]:
        problems.append("%s: rows %s != %s" % (what, expected["rows"], actual["rows"]))
    for e, a in zip(expected["columns"], actual["columns"]):
        for key in ("name", "type", "missing", "distinct"):
            if e[key] != a[key]:
                problems.append("%s: column %s %s: %r != %r" % (what, e["name"], key, e[key], a[key]))
        if e["type"] == "categorical" and "levels" in a and e["levels"] != a["levels"]:
            problems.append("%s: column %s levels differ" % (what, e["name"]))
        for key in ("sum", "min", "max"):
            if key in e and key in a and not math.isclose(e[key], a[key], rel_tol=1e-9, abs_tol=1e-9):
                problems.append("%s: column %s %s: %r != %r" % (what, e["name"], key, e[key], a[key]))
    if len(expected["columns"]) != len(actual["columns"]):
        problems.append("%s: column count differs" % what)
    return problems


def foldline_figures(binary, path):
    out = subprocess.run([binary, "inspect", path, "--json", "-"], check=True, capture_output=True, text=True).stdout
    j = json.loads(out)
    cols = []
    for c in j["columns"]:
        d = {k: c[k] for k in ("name", "type", "missing", "distinct")}
        if c["type"] == "categorical":
            d["levels"] = c["levels"]
        else:
            d["min"], d["max"] = c["min"], c["max"]
        cols.append(d)
    return {"rows": j["rows"], "columns": cols}


def main():
    p = argparse.ArgumentParser()
    p.add_argument("csv")
    p.add_argument("--write", metavar="GOLDEN")
    p.add_argument("--check", metavar="GOLDEN")
    p.add_argument("--foldline", metavar="BINARY")
    a = p.parse_args()
    fig = pandas_figures(a.csv)
    if a.write:
        with open(a.write, "w", encoding="utf-8") as f:
            json.dump(fig, f, indent=1, ensure_ascii=False)
            f.write("\n")
        return 0
    problems = []
    if a.check:
        with open(a.check, encoding="utf-8") as f:
            problems += compare(fig, json.load(f), "golden file vs pandas")
    if a.foldline:
        problems += compare(fig, foldline_figures(a.foldline, a.csv), "foldline inspect vs pandas")
    for line in problems:
        print(line, file=sys.stderr)
    print("checked %d columns, %d problems" % (len(fig["columns"]), len(problems)))
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
