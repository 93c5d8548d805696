#!/usr/bin/python3
"""Writes clinic_followup.csv: an invented clinic network's follow-up visits (no real patients).

Two clinics; the North clinic sees mostly women and has higher recovery overall, so pooled
recovery favours women while within each clinic men recover slightly more (a reversal). Some
outcomes are not recorded, some ages missing; `comment` is empty throughout; `city` holds
non-ASCII text. This CSV is the reference the SAS, SPSS, Stata and workbook fixtures are
written from (make_stat_files.R, make_workbooks.py), so each of them must read as the same table.
"""
import csv
import datetime
import pathlib

HERE = pathlib.Path(__file__).parent
CITIES = ["Zürich", "Kraków", "São Paulo", "Malmö", "Ørsted"]


def rows():
    # (site, sex, n, recovered) per cell: North 80 women (60 yes) 20 men (16 yes);
    # South 20 women (6 yes) 80 men (28 yes).
    cells = [("North clinic", "female", 80, 60), ("North clinic", "male", 20, 16),
             ("South clinic", "female", 20, 6), ("South clinic", "male", 80, 28)]
    i = 0
    for site, sex, n, yes in cells:
        for k in range(n):
            recov = "yes" if k < yes else "no"
            if i % 37 == 5:
                recov = ""  # not recorded
            age = "" if i % 41 == 7 else str(30 + (i * 7) % 45)
            day = datetime.date(2024, 1, 1) + datetime.timedelta(days=(i * 3) % 300)
            yield [site, sex, recov, age, day.isoformat(), CITIES[i % len(CITIES)], ""]
            i += 1


def main():
    with open(HERE / "clinic_followup.csv", "w", newline="", encoding="utf-8") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["site", "sex", "recov", "age", "visitdt", "city", "comment"])
        w.writerows(rows())


if __name__ == "__main__":
    main()
