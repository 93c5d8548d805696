#!/usr/bin/python3
"""Shared audits end to end: `foldline run` / `memo` / `scan --memo --csv` on the sample projects.

Outside references: pandas recomputes the pooled rates from the raw CSV, statsmodels'
StratifiedTable the Mantel-Haenszel odds ratio of the memo's single-column finding, hashlib the
SHA-256, Python's csv and json modules parse the exports and the project file, and poppler-utils
(pdftotext, pdfinfo, pdffonts, pdftoppm) read the PDF memo: its text must hold those numbers,
the section titles and the caution; data and notes with markup or right-to-left text must print
literally; pages 1 and 2 must render.

Usage: memo_reference.py FOLDLINE SOURCE_DIR
"""
import csv
import hashlib
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile

import pandas as pd
from statsmodels.stats.contingency_tables import StratifiedTable

FOLDLINE, SOURCE = sys.argv[1], sys.argv[2]
SAMPLES = os.path.join(SOURCE, "sample_data")
failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def run(args, cwd):
    env = dict(os.environ, SOURCE_DATE_EPOCH="1764633600")  # 2025-12-02, a fixed memo date
    p = subprocess.run([FOLDLINE] + args, cwd=cwd, capture_output=True, text=True, env=env)
    return p.returncode, p.stdout, p.stderr


def pdf_text(path):
    out = subprocess.run(["pdftotext", path, "-"], capture_output=True, text=True, check=True).stdout
    return " ".join(out.split())


def pdf_info(path):
    out = subprocess.run(["pdfinfo", path], capture_output=True, text=True, check=True).stdout
    return dict(line.split(":", 1) for line in out.splitlines() if ":" in line)


def fonts_embedded(path):
    out = subprocess.run(["pdffonts", path], capture_output=True, text=True, check=True).stdout.splitlines()[2:]
    return len(out) > 0 and all(line.split()[-5] == "yes" for line in out)


def renders_pages_1_and_2(path, work):
    prefix = os.path.join(work, "page")
    p = subprocess.run(["pdftoppm", "-png", "-r", "40", "-f", "1", "-l", "2", path, prefix], capture_output=True)
    pngs = sorted(f for f in os.listdir(work) if f.startswith("page") and f.endswith(".png"))
    ok = p.returncode == 0 and len(pngs) == 2 and all(os.path.getsize(os.path.join(work, f)) > 1000 for f in pngs)
    for f in pngs:
        os.remove(os.path.join(work, f))
    return ok


def pct(x):
    return "%.1f%%" % (100 * x)


SCENARIOS = [
    # project, data, outcome, positive, exposure, focal, reference, stratifier, page size (pt)
    ("lender_audit.foldline", "lender_approvals.csv", "approved", 1, "applicant_group", "B", "A", "product",
     "612 x 792"),
    ("clinic_audit.foldline", "clinic_outcomes.csv", "recovered", "yes", "treatment", "new_protocol", "standard",
     "severity", "595 x 842"),
]

work = tempfile.mkdtemp(prefix="foldline-memo-")
try:
    for project, data, outcome, positive, exposure, focal, ref, stratum, page in SCENARIOS:
        print("--", project)
        for f in (project, data, data.replace(".csv", ".diagram.json")):
            shutil.copy(os.path.join(SAMPLES, f), work)
        rc, out, err = run(["run", project, "--memo", "m.pdf", "--csv", "x", "--json", "x.json"], work)
        check(rc == 0, "run exits 0 when the classes are as saved (got %d: %s%s)" % (
            rc, err.strip(), "; if the scan changed on purpose, refresh the sample with "
            "`foldline run sample_data/%s --update`" % project if rc == 4 else ""))
        text = pdf_text(os.path.join(work, "m.pdf"))
        df = pd.read_csv(os.path.join(work, data))
        pos = df[outcome].astype(str) == str(positive)
        rate_f = pos[df[exposure] == focal].mean()
        rate_r = pos[df[exposure] == ref].mean()
        check(pct(rate_f) in text and pct(rate_r) in text,
              "memo shows the pooled rates %s and %s (pandas)" % (pct(rate_f), pct(rate_r)))
        tables = []
        for _, g in df.groupby(stratum):
            gp = pos[g.index]
            a = int((gp & (g[exposure] == focal)).sum()); b = int((~gp & (g[exposure] == focal)).sum())
            c = int((gp & (g[exposure] == ref)).sum()); d = int((~gp & (g[exposure] == ref)).sum())
            if a + b > 0 and c + d > 0:
                tables.append([[a, b], [c, d]])
        mh = StratifiedTable(tables).oddsratio_pooled
        check("%.2f" % mh in text, "memo shows the MH odds ratio %.2f within %s (statsmodels)" % (mh, stratum))
        digest = hashlib.sha256(open(os.path.join(work, data), "rb").read()).hexdigest()
        check(digest in text, "memo shows the data's SHA-256 (hashlib)")
        for title in ["Summary", "Findings", "Pooled and adjusted figures", "Side by side: pooled and each stratum",
                      "Causal diagram", "Verdict", "Decomposition", "Sensitivity to unmeasured confounding",
                      "Method notes", "Caution", "Reviewer's note"]:
            check(title in text, "memo has the section '%s'" % title)
        check(not any(ch in text for ch in "\ufb00\ufb01\ufb02\ufb03\ufb04"),
              "no ligature glyphs in the text (a search for 'figures' finds it)")
        check("statistical screen, not a legal or clinical determination" in text
              and "local law, counsel and licensed practice" in text, "memo carries the caution")
        info = pdf_info(os.path.join(work, "m.pdf"))
        pages = int(info["Pages"])
        check(("Page 1 of %d" % pages) in text and ("Page %d of %d" % (pages, pages)) in text, "page numbers")
        check(page in info["Page size"], "page size %s (%s)" % (page, info["Page size"].strip()))
        check(fonts_embedded(os.path.join(work, "m.pdf")), "every font embedded (pdffonts)")
        images = subprocess.run(["pdfimages", "-list", os.path.join(work, "m.pdf")], capture_output=True,
                                text=True, check=True).stdout.splitlines()[2:]
        check(len(images) == 0, "charts and diagram are vector graphics: no raster image in the PDF (pdfimages)")
        check(renders_pages_1_and_2(os.path.join(work, "m.pdf"), work), "pdftoppm renders pages 1 and 2")

        doc = json.load(open(os.path.join(work, "x.json")))
        with open(os.path.join(work, "x-findings.csv"), newline="") as fh:
            frows = list(csv.DictReader(fh))
        with open(os.path.join(work, "x-strata.csv"), newline="") as fh:
            srows = list(csv.DictReader(fh))
        check(len(frows) == len(doc["findings"]), "findings CSV: one row per finding (%d)" % len(frows))
        check(len(srows) == sum(len(f["strata_table"]) for f in doc["findings"]),
              "strata CSV: one row per stratum (%d)" % len(srows))
        check([r["class"] for r in frows] == [f["class"] for f in doc["findings"]], "CSV classes match the JSON")

        # An estimate a verdict points to over another set: direct standardisation recomputed
        # with pandas (weights = each stratum's share of the rows in strata holding both groups).
        quoted = re.findall(r"difference standardised over ([^:]+): ([+-][0-9.]+) pp", text)
        for over, shown in sorted(set(quoted)):
            cols = over.split(", ")
            if not all(c in df.columns and df[c].dtype == object for c in cols):
                continue
            used = df.dropna(subset=cols + [outcome, exposure])
            used = used[used[exposure].isin([focal, ref])]
            rd, total = 0.0, 0
            for _, g in used.groupby(cols):
                gf, gr = g[g[exposure] == focal], g[g[exposure] == ref]
                if len(gf) and len(gr):
                    rd += len(g) * ((gf[outcome].astype(str) == str(positive)).mean()
                                    - (gr[outcome].astype(str) == str(positive)).mean())
                    total += len(g)
            check("%+.1f" % (100 * rd / total) == shown,
                  "the estimate to quote over %s, %s pp, is the standardised difference (pandas %+.3f pp)"
                  % (over, shown, 100 * rd / total))
        rc, out, err = run(["memo", project, "--out", "again.pdf"], work)
        check(rc == 0 and os.path.getsize(os.path.join(work, "again.pdf")) > 10000, "foldline memo writes the PDF")
        for f in os.listdir(work):
            os.remove(os.path.join(work, f))

    # --- a trend audit's memo: slopes from statsmodels, the chart as vectors --------------------
    print("-- retail_audit.foldline (trend)")
    import statsmodels.formula.api as smf
    for f in ("retail_audit.foldline", "retail_weeks.csv"):
        shutil.copy(os.path.join(SAMPLES, f), work)
    rc, out, err = run(["memo", "retail_audit.foldline", "--out", "t.pdf"], work)
    check(rc == 0, "foldline memo on the trend audit exits 0 (got %d: %s)" % (rc, err.strip()))
    text = pdf_text(os.path.join(work, "t.pdf"))
    retail = pd.read_csv(os.path.join(work, "retail_weeks.csv"))
    pooled = smf.ols("weekly_sales ~ promo_spend", data=retail).fit().params["promo_spend"]
    within = smf.ols("weekly_sales ~ promo_spend + C(store_format)", data=retail).fit().params["promo_spend"]
    check("Pooled slope %+.4g" % pooled in text and "Within slope (one intercept per stratum) %+.4g" % within in text,
          "memo quotes the pooled slope %+.4g and the within-format slope %+.4g (statsmodels)" % (pooled, within))
    check("The estimate to quote, the within slope over store_format: %+.4g" % within in text,
          "a finding stratified by a mediator points to the within-format slope %+.4g" % within)
    check("weekly_sales on promo_spend by store_format" in text and "superstore (slope" in text,
          "the trend chart's title and legend are text")
    images = subprocess.run(["pdfimages", "-list", os.path.join(work, "t.pdf")], capture_output=True,
                            text=True, check=True).stdout.splitlines()[2:]
    check(len(images) == 0, "the trend chart is vector graphics: no raster image (pdfimages)")
    check("Wilson" not in text and "ordinary least squares slope of weekly_sales on promo_spend" in text,
          "a trend memo's method notes name the slope estimators only")
    check(renders_pages_1_and_2(os.path.join(work, "t.pdf"), work), "pdftoppm renders pages 1 and 2 of the trend memo")
    for f in os.listdir(work):
        os.remove(os.path.join(work, f))

    # --- exit code 4 when a saved class differs; --update is deterministic --------------------
    print("-- re-runs")
    for f in ("lender_audit.foldline", "lender_approvals.csv"):
        shutil.copy(os.path.join(SAMPLES, f), work)
    proj = json.load(open(os.path.join(work, "lender_audit.foldline")))
    flipped = next(r for r in proj["findings"] if r["class"] == "reversal")
    flipped["class"] = "stable"
    json.dump(proj, open(os.path.join(work, "lender_audit.foldline"), "w"), indent=2)
    rc, out, err = run(["run", "lender_audit.foldline"], work)
    check(rc == 4, "run exits 4 when a finding's class differs from the saved one (got %d)" % rc)
    check("stable -> reversal" in out, "run names the class change")
    rc, out, err = run(["run", "lender_audit.foldline", "--update"], work)
    first = open(os.path.join(work, "lender_audit.foldline"), "rb").read()
    rc2, out2, _ = run(["run", "lender_audit.foldline", "--update"], work)
    check(rc2 == 0 and open(os.path.join(work, "lender_audit.foldline"), "rb").read() == first,
          "after --update the classes match (exit 0) and a second update writes the same bytes")

    df = pd.read_csv(os.path.join(work, "lender_approvals.csv"))
    df.drop(columns=["term"]).head(15000).to_csv(os.path.join(work, "lender_approvals.csv"), index=False)
    rc, out, err = run(["run", "lender_audit.foldline"], work)
    check(rc in (0, 4) and "data file changed" in out and "20,000 → 15,000" in out
          and 'missing columns: "term"' in out, "hash check reports the changed rows and columns")
    df.sample(frac=0.6, random_state=3).to_csv(os.path.join(work, "extract_q2.csv"), index=False)
    rc, out, err = run(["run", "lender_audit.foldline", "--data", "extract_q2.csv", "--json", "q2.json"], work)
    q2 = json.load(open(os.path.join(work, "q2.json")))
    check(rc in (0, 4) and q2["data"]["rows"] == 12000, "run --data re-audits a new extract (12,000 rows)")
    rc, out, err = run(["scan", "extract_q2.csv", "--outcome", "approved=1", "--exposure", "applicant_group=B,A",
                        "--bootstrap", "20", "--memo", "scan.pdf", "--csv", "scan"], work)
    check(rc == 0 and os.path.exists(os.path.join(work, "scan.pdf"))
          and os.path.exists(os.path.join(work, "scan-strata.csv")), "scan --memo --csv writes both")
    before = open(os.path.join(work, "lender_audit.foldline"), "rb").read()
    rc, out, err = run(["run", "lender_audit.foldline", "--memo", "lender_audit.foldline"], work)
    check(rc == 2 and open(os.path.join(work, "lender_audit.foldline"), "rb").read() == before,
          "an output naming the project file is refused (2) and the project is untouched")
    # A slope scan's memo: scipy's linregress gives the pooled slope the memo must quote.
    from scipy.stats import linregress
    shutil.copy(os.path.join(SAMPLES, "retail_weeks.csv"), work)
    rc, out, err = run(["scan", "retail_weeks.csv", "--outcome", "weekly_sales", "--exposure", "promo_spend",
                        "--bootstrap", "0", "--memo", "retail.pdf"], work)
    rw = pd.read_csv(os.path.join(work, "retail_weeks.csv")).dropna(subset=["promo_spend", "weekly_sales"])
    pooled = linregress(rw["promo_spend"], rw["weekly_sales"]).slope
    text = pdf_text(os.path.join(work, "retail.pdf")) if rc == 0 else ""
    check(rc == 0 and ("%+.4g" % pooled) in text and "Reversal: store_format" in text,
          "slope memo quotes the pooled slope %+.4g (scipy) and the store_format reversal" % pooled)
    rc, out, err = run(["run", "no_such.foldline"], work)
    check(rc == 3 and "cannot open the project file" in err, "a missing project is an input error (3)")
    open(os.path.join(work, "bad.foldline"), "w").write('{"format": "foldline-project", "version": 99}')
    rc, out, err = run(["memo", "bad.foldline"], work)
    check(rc == 3 and "newer Foldline" in err, "a newer project version is refused (3)")
    for f in os.listdir(work):
        os.remove(os.path.join(work, f))

    # --- escaping: markup and right-to-left text from the data and the reviewer -----------------
    print("-- escaping")
    col = "<b>x</b>"
    rows = ["grp,ok,%s" % col]
    levels = ["<i>lvl</i>", "\u05e9\u05dc\u05d5\u05dd", "a&amp;b"]
    import random
    rnd = random.Random(5)
    for i in range(900):
        lv = levels[i % 3]
        g = "B" if rnd.random() < (0.8 if lv == levels[0] else 0.2) else "A"
        p = (0.2 if lv == levels[0] else 0.7) + (0.08 if g == "B" else 0.0)
        rows.append("%s,%d,%s" % (g, rnd.random() < p, lv))
    open(os.path.join(work, "esc.csv"), "w").write("\n".join(rows) + "\n")
    note = "<script>alert(1)</script> <b>bold</b> & \u05e9\u05dc\u05d5\u05dd \u05e2\u05d5\u05dc\u05dd \u202eevil"
    proj = {"format": "foldline-project", "version": 1, "data": {"path": "esc.csv"},
            "question": {"outcome": "ok", "positive": "1", "exposure": "grp", "focal": ["B"], "reference": "A"},
            "scan": {"strata": [col], "bootstrap": 0},
            "findings": [{"kind": "rate", "strata": [col], "comparison": "B vs A", "decision": "follow up",
                          "note": note, "in_memo": True}],
            "memo": {"title": "<h1>Escaping</h1> check", "findings": "chosen"}}
    json.dump(proj, open(os.path.join(work, "esc.foldline"), "w"))
    rc, out, err = run(["run", "esc.foldline", "--memo", "esc.pdf"], work)
    check(rc == 0, "escaping project runs (got %d: %s)" % (rc, err.strip()))
    text = pdf_text(os.path.join(work, "esc.pdf"))
    # The RLO control shows as a visible mark; poppler reorders the neutral "[" next to the Hebrew
    # run when it extracts text, so the mark is looked for from "U+" on.
    for literal in ["<h1>Escaping</h1> check", "<b>x</b>", "<i>lvl</i>", "a&amp;b", "<script>alert(1)</script>",
                    "<b>bold</b> &", "U+202E]evil"]:
        check(literal in text, "prints literally: %s" % literal)
    hebrew = "\u05e9\u05dc\u05d5\u05dd"
    check(hebrew in text or hebrew[::-1] in text, "right-to-left level and note text present")
    check(renders_pages_1_and_2(os.path.join(work, "esc.pdf"), work), "escaping memo renders pages 1 and 2")
finally:
    shutil.rmtree(work, ignore_errors=True)

print("%d failure(s)" % len(failures))
sys.exit(1 if failures else 0)
