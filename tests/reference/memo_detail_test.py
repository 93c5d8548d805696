#!/usr/bin/python3
"""The memo's shape, read back with poppler-utils (pdftotext, pdfinfo) from `foldline memo`:

- page 1 holds the plain-language answer ("The answer in brief") with the pooled rates of the
  upheld lead, recomputed here with pandas from the sample's rows;
- the lender sample's default memo (one section per family) fits on at most 8 US Letter pages
  (the target set for a memo a reader finishes; common practice, not a standard) and its appendix
  still lists every check (one row per comparison of the JSON) with its class and q;
- `--memo-detail full` gives one numbered section per flagged finding (the JSON's findings whose
  class is not stable), and `--memo-detail families` one per family lead;
- a bad `--memo-detail` value is a usage error (exit 2) naming the value.

Usage: memo_detail_test.py FOLDLINE SOURCE_DIR
"""
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile

import pandas as pd

FOLDLINE, SOURCE = sys.argv[1], sys.argv[2]
SAMPLES = os.path.join(SOURCE, "sample_data")
failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def run(args, cwd):
    env = dict(os.environ, SOURCE_DATE_EPOCH="1764633600")
    p = subprocess.run([FOLDLINE] + args, cwd=cwd, capture_output=True, text=True, env=env)
    return p.returncode, p.stdout, p.stderr


def pages(path):
    out = subprocess.run(["pdfinfo", path], capture_output=True, text=True, check=True).stdout
    return int(re.search(r"^Pages:\s+(\d+)", out, re.M).group(1))


def text(path, first=None, last=None):
    args = ["pdftotext"]
    if first:
        args += ["-f", str(first), "-l", str(last or first)]
    out = subprocess.run(args + [path, "-"], capture_output=True, text=True, check=True).stdout
    return " ".join(out.split())


def pct(x):
    return "%.1f%%" % (100 * x)


work = tempfile.mkdtemp(prefix="foldline-memo-detail-")
try:
    for f in ("lender_audit.foldline", "lender_approvals.csv", "lender_approvals.diagram.json"):
        shutil.copy(os.path.join(SAMPLES, f), work)
    rc, out, err = run(["run", "lender_audit.foldline", "--json", "x.json", "--memo", "default.pdf"], work)
    check(rc == 0, "run exits 0 (got %d: %s)" % (rc, err.strip()))
    doc = json.load(open(os.path.join(work, "x.json")))
    rate = [f for f in doc["findings"] if f.get("kind", "rate") == "rate"]
    flagged = [f for f in rate if f["class"] != "stable"]
    leads = [f for f in flagged if f["family"]["role"] == "lead"]
    check(len(flagged) > len(leads) > 0, "the lender scan has families with members (%d flagged, %d leads)"
          % (len(flagged), len(leads)))

    default = os.path.join(work, "default.pdf")
    n = pages(default)
    print("lender default memo: %d pages" % n)
    check(n <= 8, "the lender sample's default memo has at most 8 pages (%d)" % n)
    info = subprocess.run(["pdfinfo", default], capture_output=True, text=True, check=True).stdout
    check("612 x 792" in info, "US Letter pages, as the sample project asks")

    # Page 1: the plain-language answer, with the pooled rates pandas computes.
    df = pd.read_csv(os.path.join(work, "lender_approvals.csv"))
    pos = df["approved"].astype(str) == "1"
    rate_b, rate_a = pos[df["applicant_group"] == "B"].mean(), pos[df["applicant_group"] == "A"].mean()
    p1 = text(default, 1)
    check("The answer in brief" in p1, "page 1 opens with the answer in brief")
    answer = p1[p1.find("The answer in brief"):p1.find("About this audit")]
    check(pct(rate_b) in answer and pct(rate_a) in answer,
          "page 1's answer states the pooled rates %s and %s (pandas)" % (pct(rate_b), pct(rate_a)))
    check("The direction reverses" in answer and "Reviewer's decision: upheld" in answer,
          "page 1's answer says the direction reverses and gives the reviewer's decision")

    # One numbered section per family lead; the appendix lists every check with class and q.
    body = text(default)
    headings = re.findall(r"\b(\d+)\. (Reversal|Explained|Masked|Heterogeneous): ", body)
    check(len(headings) == len(leads), "default memo: one section per family lead (%d sections, %d leads)"
          % (len(headings), len(leads)))
    appendix = body[body.find("Appendix: every check"):body.find("Method notes")]
    rows = re.findall(r"(?:^| )(\d+) (reversal|explained|masked|heterogeneous|stable)(?= )", appendix)
    check(len(rows) == len(rate), "the appendix lists every check (%d rows, %d in the JSON)" % (len(rows), len(rate)))
    check([int(r[0]) for r in rows] == list(range(1, len(rate) + 1)), "appendix rows in rank order 1..%d" % len(rate))
    check([r[1] for r in rows] == [f["class"] for f in rate], "each appendix row has the JSON's class")

    # Full detail: a section per flagged finding.
    rc, out, err = run(["memo", "lender_audit.foldline", "--memo-detail", "full", "--out", "full.pdf"], work)
    check(rc == 0, "memo --memo-detail full exits 0 (%s)" % err.strip())
    full = os.path.join(work, "full.pdf")
    body = text(full)
    headings = re.findall(r"\b(\d+)\. (Reversal|Explained|Masked|Heterogeneous): ", body)
    check(len(headings) == len(flagged), "full memo: one section per flagged finding (%d sections, %d flagged)"
          % (len(headings), len(flagged)))
    print("lender full memo: %d pages" % pages(full))
    check(pages(full) > n, "the full memo is longer than the default one")

    rc, out, err = run(["memo", "lender_audit.foldline", "--memo-detail", "families", "--out", "fam.pdf"], work)
    check(rc == 0 and pages(os.path.join(work, "fam.pdf")) == n, "--memo-detail families gives the default memo")

    # The option on scan, and a bad value.
    rc, out, err = run(["memo", "lender_audit.foldline", "--memo-detail", "all", "--out", "bad.pdf"], work)
    check(rc == 2 and "'all'" in err and not os.path.exists(os.path.join(work, "bad.pdf")),
          "a bad --memo-detail value is a usage error naming it, and writes nothing (%d: %s)" % (rc, err.strip()))
    rc, out, err = run(["scan", "lender_approvals.csv", "--outcome", "approved=1", "--exposure", "applicant_group=B,A",
                        "--memo-detail", "full"], work)
    check(rc == 2 and "--memo" in err, "scan --memo-detail without --memo is a usage error (%d)" % rc)
    rc, out, err = run(["scan", "lender_approvals.csv", "--outcome", "approved=1", "--exposure", "applicant_group=B,A",
                        "--bootstrap", "0", "--memo", "s.pdf", "--memo-detail", "full"], work)
    body = text(os.path.join(work, "s.pdf")) if rc == 0 else ""
    check(rc == 0 and len(re.findall(r"\b\d+\. (?:Reversal|Explained|Masked|Heterogeneous): ", body)) == len(flagged),
          "scan --memo --memo-detail full: a section per flagged finding (%d)" % rc)
    # The project file is never written by `memo`.
    before = open(os.path.join(SAMPLES, "lender_audit.foldline"), "rb").read()
    check(open(os.path.join(work, "lender_audit.foldline"), "rb").read() == before,
          "memo --memo-detail leaves the project file as it was")
finally:
    shutil.rmtree(work, ignore_errors=True)

if failures:
    print("%d check(s) failed" % len(failures))
    sys.exit(1)
print("all checks passed")
