#!/usr/bin/python3
"""Rows filters checked from outside, against SQLite (Python's sqlite3 module).

For random filters over a random file with missing cells, `foldline scan --where EXPR` must
(1) keep exactly the rows SQLite's WHERE keeps with the same condition written in SQL (three-valued
logic, SQL:1992: a comparison with NULL is unknown and WHERE keeps only true rows), and
(2) give the same findings, candidates and exclusions as `foldline scan` of a file holding only
those rows (written here from SQLite's answer, in the original order).
A filter that keeps no row must fail with exit code 3, and a malformed one with exit code 2.
(3) The model-audit recipe on sample_data/screening_alerts.csv: the false- and true-positive
rates by group, pooled and per ward, equal pandas' group means over the same subsets.

Usage: row_filter_reference.py FOLDLINE [SOURCE_DIR]
"""
import csv
import json
import os
import random
import sqlite3
import subprocess
import sys
import tempfile

failures = 0


def check(ok, what):
    global failures
    if not ok:
        failures += 1
        print("FAIL:", what)


REGIONS = ["north", "south", "east", "west", "it's"]
CHANNELS = ["web", "branch", "phone"]


def make_rows(rng, n):
    rows = []
    for _ in range(n):
        region = rng.choice(REGIONS) if rng.random() > 0.1 else None
        channel = rng.choice(CHANNELS)
        year = rng.randint(2019, 2024) if rng.random() > 0.05 else None
        score = round(rng.uniform(300, 850), 1) if rng.random() > 0.05 else None
        group = rng.choice(["A", "B"])
        # A reversal-prone outcome: channel drives both group mix and approval.
        p = {"web": 0.7, "branch": 0.4, "phone": 0.55}[channel] + (0.05 if group == "B" else 0)
        if group == "B" and channel == "web" and rng.random() < 0.5:
            channel = "branch"
        approved = 1 if rng.random() < p else 0
        rows.append({"group": group, "approved": approved, "region": region, "channel": channel,
                     "year": year, "score": score})
    return rows


def text_lit(s):
    return "'" + s.replace("'", "''") + "'"


def random_test(rng):
    """One comparison: (foldline text, SQL text)."""
    kind = rng.choice(["region", "channel", "year", "score", "missing", "in_text", "in_num"])
    if kind in ("region", "channel"):
        v = rng.choice(REGIONS if kind == "region" else CHANNELS)
        op = rng.choice(["=", "<>"])
        t = f"{kind} {op} {text_lit(v)}"
        return t, t
    if kind == "year":
        op = rng.choice(["=", "<>", "<", "<=", ">", ">="])
        v = rng.randint(2018, 2025)
        return f"year {op} {v}", f"year {op} {v}"
    if kind == "score":
        op = rng.choice(["<", "<=", ">", ">="])
        v = round(rng.uniform(300, 850), 1)
        return f"score {op} {v}", f"score {op} {v}"
    if kind == "missing":
        col = rng.choice(["region", "year", "score"])
        neg = rng.random() < 0.5
        return (f"{col} is {'not ' if neg else ''}missing", f"{col} IS {'NOT ' if neg else ''}NULL")
    if kind == "in_text":
        vs = rng.sample(REGIONS, rng.randint(1, 3))
        neg = rng.random() < 0.4
        lst = ", ".join(text_lit(v) for v in vs)
        return (f"region {'not ' if neg else ''}in ({lst})", f"region {'NOT ' if neg else ''}IN ({lst})")
    vs = sorted(rng.sample(range(2019, 2025), rng.randint(1, 3)))
    lst = ", ".join(str(v) for v in vs)
    neg = rng.random() < 0.4
    return (f"year {'not ' if neg else ''}in ({lst})", f"year {'NOT ' if neg else ''}IN ({lst})")


def random_filter(rng, depth=0):
    r = rng.random()
    if depth >= 2 or r < 0.4:
        return random_test(rng)
    if r < 0.55:
        a, s = random_filter(rng, depth + 1)
        return f"not ({a})", f"NOT ({s})"
    a1, s1 = random_filter(rng, depth + 1)
    a2, s2 = random_filter(rng, depth + 1)
    word = rng.choice(["and", "or"])
    return f"({a1}) {word} ({a2})", f"({s1}) {word.upper()} ({s2})"


COLUMNS = ["group", "approved", "region", "channel", "year", "score"]


def write_csv(path, rows):
    with open(path, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(COLUMNS)
        for r in rows:
            w.writerow(["" if r[c] is None else r[c] for c in COLUMNS])


def scan(foldline, path, extra):
    p = subprocess.run([foldline, "scan", path, "--outcome", "approved=1", "--exposure", "group=B,A",
                        "--strata", "region,channel,year,score", "--bootstrap", "0", "--json", "-", *extra],
                       capture_output=True, text=True)
    return p.returncode, (json.loads(p.stdout) if p.returncode == 0 else None), p.stderr


def comparable(doc):
    return {k: doc[k] for k in ("findings", "candidates", "excluded", "summary")}


def check_model_audit(foldline, source_dir):
    import pandas as pd
    path = os.path.join(source_dir, "sample_data", "screening_alerts.csv")
    df = pd.read_csv(path)
    for truth, name in ((0, "false-positive"), (1, "true-positive")):
        p = subprocess.run([foldline, "scan", path, "--outcome", "alert=1", "--exposure", "patient_group=B,A",
                            "--strata", "ward", "--no-pairs", "--bootstrap", "0", "--where", f"deteriorated = {truth}",
                            "--json", "-"], capture_output=True, text=True)
        check(p.returncode == 0, f"{name} rate scan: exit {p.returncode}: {p.stderr.strip()}")
        if p.returncode:
            continue
        doc = json.loads(p.stdout)
        sub = df[df.deteriorated == truth]
        f = doc["findings"][0]
        want_b, want_a = sub[sub.patient_group == "B"].alert.mean(), sub[sub.patient_group == "A"].alert.mean()
        check(abs(f["crude"]["rate_focal"] - want_b) < 1e-12 and abs(f["crude"]["rate_reference"] - want_a) < 1e-12,
              f"{name} rate pooled: {f['crude']['rate_focal']}, {f['crude']['rate_reference']} vs pandas {want_b}, {want_a}")
        check(doc["data"]["rows_kept"] == len(sub), f"{name}: rows kept {doc['data']['rows_kept']} vs {len(sub)}")
        print(f"{name} rate: B {want_b:.4f}, A {want_a:.4f} (pandas), class by ward: {f['class']}")
        if truth == 0:
            check(f["class"] == "reversal", f"the planted false-positive reversal by ward is {f['class']}")


def main():
    foldline = sys.argv[1]
    if len(sys.argv) > 2:
        check_model_audit(foldline, sys.argv[2])
    rng = random.Random(20261205)
    rows = make_rows(rng, 3000)
    db = sqlite3.connect(":memory:")
    db.execute('CREATE TABLE t (rid INTEGER, "group" TEXT, approved INTEGER, region TEXT, channel TEXT, '
               'year INTEGER, score REAL)')
    db.executemany("INSERT INTO t VALUES (?, ?, ?, ?, ?, ?, ?)",
                   [(i, r["group"], r["approved"], r["region"], r["channel"], r["year"], r["score"])
                    for i, r in enumerate(rows)])
    with tempfile.TemporaryDirectory() as tmp:
        full = os.path.join(tmp, "full.csv")
        write_csv(full, rows)
        tested = 0
        for k in range(40):
            expr, sql = random_filter(rng)
            kept = [rid for (rid,) in db.execute(f"SELECT rid FROM t WHERE {sql} ORDER BY rid")]
            rc, doc, err = scan(foldline, full, ["--where", expr])
            if not kept:
                check(rc == 3, f"[{expr}] keeps no row in SQLite: expected exit 3, got {rc}: {err.strip()}")
                continue
            part = os.path.join(tmp, f"part{k}.csv")
            write_csv(part, [rows[i] for i in kept])
            rc2, doc2, err2 = scan(foldline, part, [])
            check(rc == rc2, f"[{expr}] exit {rc} with --where, {rc2} on the pre-filtered file: {err.strip()} | {err2.strip()}")
            if rc != 0 or rc2 != 0:
                continue
            tested += 1
            check(doc["data"]["rows_kept"] == len(kept),
                  f"[{expr}] rows kept {doc['data']['rows_kept']}, SQLite {len(kept)}")
            check(doc["data"]["rows"] == len(rows), f"[{expr}] rows read {doc['data']['rows']}")
            check("rows" in doc["question"], f"[{expr}] the JSON question has no rows filter")
            check(comparable(doc) == comparable(doc2), f"[{expr}] findings differ from the pre-filtered file's")
        check(tested >= 20, f"only {tested} filters kept rows a scan could use")
        # Malformed filters are usage errors (exit 2) naming the character.
        rc, _, err = scan(foldline, full, ["--where", "region = north"])
        check(rc == 2 and "character 10" in err, f"malformed filter: exit {rc}: {err.strip()}")
        rc, _, err = scan(foldline, full, ["--where", "year = '2020'"])
        check(rc == 2 and "numeric" in err, f"text against a numeric column: exit {rc}: {err.strip()}")
        print(f"{tested} filters compared with SQLite {sqlite3.sqlite_version} and with pre-filtered files")
    if failures:
        print(f"{failures} check(s) failed")
        sys.exit(1)
    print("row filter reference: all checks passed")


if __name__ == "__main__":
    main()
