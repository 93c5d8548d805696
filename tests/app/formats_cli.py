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
    # Pre-counted, in every format: the counts leave out the 6 unrecorded outcomes, which the
    # row-level scan drops as missing too, so the findings are the same (make_workbooks.py,
    # make_count_files.R and make_count_xls.py write them; sav and dta through value labels).
    a = [(f["strata"], f["class"]) for f in reference["findings"]]
    counted_text = None
    for path in ["clinic_counts.xlsx", "clinic_counts.xls", "clinic_counts.xpt", "clinic_counts.sas7bdat",
                 "clinic_counts.sav", "clinic_counts.dta"]:
        counted = scan(path, "--count-column", "n")
        if counted is None:
            continue
        b = [(f["strata"], f["class"]) for f in counted["findings"]]
        if a != b:
            failures.append(f"{path}: findings {b} differ from the rows' {a}")
        text, info = comparable(counted)
        if counted_text is None:
            counted_text = text
        elif text != counted_text:
            failures.append(f"{path}: findings differ from clinic_counts.xlsx's")
        if info.get("rows") != 8:
            failures.append(f"{path}: data.rows is {info.get('rows')!r}, expected the 8 site x sex x recov cells")

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


def peak_rss_kib(*args):
    """Runs foldline with args and returns (exit code, stderr, the child's own peak RSS in KiB)."""
    p = subprocess.Popen([foldline, *args], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    err = p.stderr.read()
    _, status, usage = os.wait4(p.pid, 0)
    p.returncode = os.waitstatus_to_exitcode(status)
    return p.returncode, err, usage.ru_maxrss


# Bounded memory: the bomb's sheet inflates to 64 MiB and the huge sheet declares 2^34 cells;
# each is refused with no more memory than reading the small workbook takes, plus 16 MiB.
_, _, small_rss = peak_rss_kib("inspect", os.path.join(data, "clinic_followup.xlsx"), "--sheet", "visits")
for name, words in [("bomb.xlsx", "zip bomb"), ("huge_dimension.xlsx", "has no name")]:
    rc, err, rss = peak_rss_kib("inspect", os.path.join(data, name))
    if rc != 3 or words not in err:
        failures.append(f"{name}: exit {rc}, message {err.strip()!r}")
    if rss > small_rss + 16 * 1024:
        failures.append(f"{name}: peak memory {rss} KiB, the small workbook's {small_rss} KiB + 16 MiB at most")
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

# `run` says how the decimal marks were read, as `scan` does (a project over decimal_comma.csv).
with tempfile.TemporaryDirectory() as tmp:
    csv_path = os.path.join(tmp, "shop.csv")
    with open(csv_path, "w", encoding="utf-8") as f:
        f.write("branch;returned;margin;late\n")
        for i in range(40):
            f.write(f"{'Nord' if i % 2 else 'Süd'};{'ja' if i % 3 else 'nein'};0,{10 + i};{'1' if i % 5 else '0'}\n")
    project = os.path.join(tmp, "shop.foldline")
    with open(project, "w", encoding="utf-8") as f:
        json.dump({"format": "foldline-project", "version": 1,
                   "data": {"path": "shop.csv", "columns": ["branch", "returned", "margin", "late"],
                            "count_column": None, "delimiter": "auto", "type_overrides": {}},
                   "question": {"outcome": "late", "positive": "1", "exposure": "returned", "focal": ["ja"],
                                "reference": "nein"},
                   "scan": {"strata": ["branch"], "bootstrap": 0}}, f)
    r = subprocess.run([foldline, "run", project], capture_output=True, text=True)
    if r.returncode not in (0, 4) or "foldline run: column 'margin' read with a decimal comma (e.g. '0,10')" not in r.stderr:
        failures.append(f"run on decimal commas: exit {r.returncode}, stderr {r.stderr.strip()!r}")

for f in failures:
    print("FAIL:", f)
print("formats_cli:", "failed" if failures else "passed")
sys.exit(1 if failures else 0)
