#!/usr/bin/python3
"""Writes clinic_counts.xls with python3-xlwt (BIFF8): the visits of clinic_followup.csv counted
by site, sex and recov (count column "n"), the unrecorded outcomes left out, as in
clinic_counts.xlsx. Run from this folder: /usr/bin/python3 make_count_xls.py
"""
import collections
import csv
import pathlib

import xlwt

HERE = pathlib.Path(__file__).parent

with open(HERE / "clinic_followup.csv", encoding="utf-8") as f:
    rows = list(csv.DictReader(f))
n = collections.Counter((r["site"], r["sex"], r["recov"]) for r in rows if r["recov"])
wb = xlwt.Workbook(encoding="utf-8")
ws = wb.add_sheet("counts")
for j, c in enumerate(["site", "sex", "recov", "n"]):
    ws.write(0, j, c)
for i, key in enumerate(sorted(n), start=1):
    for j, v in enumerate([*key, n[key]]):
        ws.write(i, j, v)
wb.save(str(HERE / "clinic_counts.xls"))
