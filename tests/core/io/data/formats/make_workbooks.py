#!/usr/bin/python3
"""Writes the workbook and pandas fixtures from clinic_followup.csv with independent writers
that Debian ships:
  clinic_followup.xlsx        python3-openpyxl: sheets "notes" (a text cell) then "visits" (the
                              data: numbers, text, dates as date cells with a date format, empty
                              cells), so reading it needs the sheet's name;
  clinic_followup.xls         python3-xlwt (BIFF8): the same data on the first sheet, dates as
                              date-formatted numbers;
  clinic_followup_pandas.dta  pandas DataFrame.to_stata (format 118, UTF-8): site, sex and
                              recov as value labels (from categoricals), dates as %td;
  clinic_counts.xlsx          openpyxl: the same visits pre-counted by site, sex and recov
                              (count column "n"), the unrecorded outcomes left out;
  kinds.xlsx                  openpyxl: booleans, an inline string, a 1904 date, an error cell;
  merged.xlsx, formula.xlsx   openpyxl: merged cells, and a formula saved without a result
                              (openpyxl stores no cached values), both to be refused.
Run from this folder: /usr/bin/python3 make_workbooks.py
"""
import collections
import csv
import datetime
import pathlib

import openpyxl
import pandas as pd
import xlwt

HERE = pathlib.Path(__file__).parent
COLUMNS = ["site", "sex", "recov", "age", "visitdt", "city", "comment"]


def load():
    with open(HERE / "clinic_followup.csv", encoding="utf-8") as f:
        return list(csv.DictReader(f))


def cell_value(name, text):
    if text == "":
        return None
    if name == "age":
        return int(text)
    if name == "visitdt":
        return datetime.date.fromisoformat(text)
    return text


def xlsx(rows):
    wb = openpyxl.Workbook()
    wb.active.title = "notes"
    wb.active["A1"] = "Follow-up visits are on the sheet 'visits'."
    ws = wb.create_sheet("visits")
    ws.append(COLUMNS)
    for r in rows:
        ws.append([cell_value(c, r[c]) for c in COLUMNS])
    for cell in ws["E"][1:]:
        cell.number_format = "yyyy-mm-dd"
    wb.save(HERE / "clinic_followup.xlsx")


def xls(rows):
    wb = xlwt.Workbook(encoding="utf-8")
    ws = wb.add_sheet("visits")
    date_style = xlwt.easyxf(num_format_str="YYYY-MM-DD")
    for j, c in enumerate(COLUMNS):
        ws.write(0, j, c)
    for i, r in enumerate(rows, start=1):
        for j, c in enumerate(COLUMNS):
            v = cell_value(c, r[c])
            if v is None:
                continue
            if isinstance(v, datetime.date):
                ws.write(i, j, datetime.datetime(v.year, v.month, v.day), date_style)
            else:
                ws.write(i, j, v)
    wb.save(str(HERE / "clinic_followup.xls"))


def pandas_dta(rows):
    df = pd.DataFrame(rows)
    for c in ["site", "sex", "recov"]:
        df[c] = pd.Categorical(df[c].replace("", None))
    df["age"] = pd.to_numeric(df["age"])
    df["visitdt"] = pd.to_datetime(df["visitdt"])
    df["comment"] = pd.to_numeric(df["comment"])
    df.to_stata(HERE / "clinic_followup_pandas.dta", write_index=False, version=118,
                convert_dates={"visitdt": "td"},
                variable_labels={"site": "Clinic site", "recov": "Recovered at follow-up"})


def counts(rows):
    n = collections.Counter((r["site"], r["sex"], r["recov"]) for r in rows if r["recov"])
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "counts"
    ws.append(["site", "sex", "recov", "n"])
    for key in sorted(n):
        ws.append([*key, n[key]])
    wb.save(HERE / "clinic_counts.xlsx")


def kinds():
    wb = openpyxl.Workbook()
    wb.epoch = openpyxl.utils.datetime.CALENDAR_MAC_1904
    ws = wb.active
    ws.append(["flag", "when", "score", "label"])
    ws.append([True, datetime.date(2024, 3, 1), 1.5, "Ünïcode"])
    ws.append([False, datetime.date(1999, 12, 31), "#N/A", "plain"])
    ws["C3"].data_type = "e"
    ws.append([None, None, 2, None])
    for cell in ws["B"][1:]:
        cell.number_format = "yyyy-mm-dd"
    wb.save(HERE / "kinds.xlsx")


def merged():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["site", "recov"])
    ws.append(["North clinic", "yes"])
    ws.append([None, "no"])
    ws.merge_cells("A2:A3")
    wb.save(HERE / "merged.xlsx")


def formula():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["a", "b"])
    ws.append([1, "=A2*2"])
    wb.save(HERE / "formula.xlsx")


def main():
    rows = load()
    xlsx(rows)
    xls(rows)
    pandas_dta(rows)
    counts(rows)
    kinds()
    merged()
    formula()


if __name__ == "__main__":
    main()
