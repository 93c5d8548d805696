#!/usr/bin/python3
"""`foldline scan` on the same invented clinic visits stored as CSV, SAS transport (v5, v8),
SAS data set, SPSS (.sav, .zsav), Stata (haven and pandas writers), .xlsx and .xls gives the
same findings; the pre-counted workbook (count column) gives the findings of the rows it was
counted from; damaged and hostile files exit with 3 and a message naming the file.
The fixtures and their writers (R's haven, pandas, openpyxl, xlwt): tests/core/io/data/formats.
Usage: formats_cli.py FOLDLINE DATA_DIR
"""
import json
import os
import subprocess
import sys
import tempfile

foldline, data = sys.argv[1], sys.argv[2]
failures = []


def scan(path, *extra):
    r = subprocess.run([foldline, "scan", os.path.join(data, path), "--outcome", "recov=yes",
                        "--exposure", "sex=male,female", "--strata", "site", "--bootstrap", "0",
                        "--json", "-", *extra], capture_output=True, text=True)
    if r.returncode not in (0, 4):
        failures.append(f"{path}: exit {r.returncode}: {r.stderr.strip()}")
        return None
    doc = json.loads(r.stdout)
    return doc


def comparable(doc):
    doc = dict(doc)
    data_info = doc.pop("data")
    doc.pop("timings", None)
    return json.dumps(doc, sort_keys=True), data_info


reference = scan("clinic_followup.csv")
if reference is None or not reference.get("findings"):
    failures.append("the CSV reference scan gave no findings")
else:
    ref_text, _ = comparable(reference)
    for path, extra, fmt in [("clinic_followup_v5.xpt", [], "xpt"), ("clinic_followup_v8.xpt", [], "xpt"),
                             ("clinic_followup.sas7bdat", [], "sas7bdat"), ("clinic_followup.sav", [], "sav"),
                             ("clinic_followup.zsav", [], "sav"), ("clinic_followup_haven.dta", [], "dta"),
                             ("clinic_followup_pandas.dta", [], "dta"),
                             ("clinic_followup.xlsx", ["--sheet", "visits"], "xlsx"),
                             ("clinic_followup.xls", [], "xls")]:
        doc = scan(path, *extra)
        if doc is None:
            continue
        text, info = comparable(doc)
        if text != ref_text:
            failures.append(f"{path}: findings differ from the CSV's")
        if info.get("format") != fmt:
            failures.append(f"{path}: data.format is {info.get('format')!r}, expected {fmt!r}")
    # Pre-counted: the counts workbook leaves out the 6 unrecorded outcomes, which the row-level
    # scan drops as missing too, so the findings are the same.
    counted = scan("clinic_counts.xlsx", "--count-column", "n")
    if counted is not None:
        a = [(f["strata"], f["class"]) for f in reference["findings"]]
        b = [(f["strata"], f["class"]) for f in counted["findings"]]
        if a != b:
            failures.append(f"clinic_counts.xlsx: findings {b} differ from the rows' {a}")

with tempfile.TemporaryDirectory() as tmp:
    for name in ["clinic_followup.sav", "clinic_followup.xlsx", "clinic_followup_haven.dta"]:
        raw = open(os.path.join(data, name), "rb").read()
        cut = os.path.join(tmp, "cut_" + name)
        with open(cut, "wb") as f:
            f.write(raw[: len(raw) // 2 + 3])
        r = subprocess.run([foldline, "inspect", cut], capture_output=True, text=True)
        if r.returncode != 3 or cut not in r.stderr:
            failures.append(f"truncated {name}: exit {r.returncode}, message {r.stderr.strip()!r}")
for name, words in [("bomb.xlsx", "zip bomb"), ("merged.xlsx", "merged cells"),
                    ("formula.xlsx", "formula with no saved result")]:
    r = subprocess.run([foldline, "inspect", os.path.join(data, name)], capture_output=True, text=True)
    if r.returncode != 3 or words not in r.stderr:
        failures.append(f"{name}: exit {r.returncode}, message {r.stderr.strip()!r}")
r = subprocess.run([foldline, "inspect", os.path.join(data, "clinic_followup.csv"), "--decimal", "x"],
                   capture_output=True, text=True)
if r.returncode != 2:
    failures.append(f"--decimal x: exit {r.returncode}")
r = subprocess.run([foldline, "inspect", os.path.join(data, "decimal_comma.csv"), "--json", "-"],
                   capture_output=True, text=True)
readings = {n["column"]: n["reading"] for n in json.loads(r.stdout)["number_readings"]} if r.returncode == 0 else {}
if readings != {"revenue": "decimal_comma", "margin": "decimal_comma", "returned": "ambiguous",
                "units": "decimal_point_kept"}:
    failures.append(f"decimal_comma.csv readings: {readings}")

for f in failures:
    print("FAIL:", f)
print("formats_cli:", "failed" if failures else "passed")
sys.exit(1 if failures else 0)
