#!/usr/bin/python3
"""Writes clinic_visits.csv, the reader's cross-check fixture (seeded, re-makeable).

Invented scenario: visits to a fictional network of community clinics (Larkspur Community
Clinics). Nothing here describes real places or people. The file exercises what a reader must
get right: CRLF line ends, quoted fields with commas, doubled quotes and line breaks, missing
markers (empty, NA, N/A, NULL, .), integers, decimals and exponents, leading zeros, and a
column that looks numeric for thousands of rows before one text cell makes it categorical.
"""
import random
import sys

rng = random.Random(1973)
clinics = ["Larkspur North", "Larkspur, Riverside", "Harbour \"Old Mill\" site", "Eastgate",
           "Upper Vale", "Kestrel Park", "Saltmarsh", "Fernhill"]
visit_types = ["walk-in", "booked", "follow-up", "telehealth"]
missing = ["", "NA", "N/A", "NULL", "."]
notes = ["", "routine", "asked about \"repeat\" prescription", "two issues:\nknee, and sleep",
         "interpreter present", "left before triage", "see letter; returns in 2 weeks"]


def quote(text):
    return '"' + text.replace('"', '""') + '"'


def maybe_missing(value, rate=0.02):
    return rng.choice(missing) if rng.random() < rate else value


rows = int(sys.argv[1]) if len(sys.argv) > 1 else 3000
out = sys.argv[2] if len(sys.argv) > 2 else "clinic_visits.csv"
lines = ["clinic,visit_type,age,wait_minutes,referred,postcode,lab_value,note"]
for i in range(rows):
    clinic = rng.choice(clinics)
    clinic_cell = quote(clinic) if ("," in clinic or '"' in clinic or rng.random() < 0.1) else clinic
    age = maybe_missing(str(rng.randint(0, 99)))
    wait = maybe_missing("%.1f" % rng.uniform(0, 180))
    referred = str(int(rng.random() < 0.3))
    postcode = "%05d" % rng.randint(0, 99999) if i != rows - 7 else "unknown"
    lab = maybe_missing(rng.choice(["%.3e" % rng.uniform(1e-3, 1e4), "%.2f" % rng.uniform(0, 50), "-%d" % rng.randint(1, 9)]))
    note = rng.choice(notes)
    note_cell = quote(note) if note and (rng.random() < 0.7 or any(c in note for c in ',"\n')) else note
    lines.append(",".join([clinic_cell, rng.choice(visit_types), age, wait, referred, postcode, lab, note_cell]))
with open(out, "w", newline="", encoding="utf-8") as f:
    f.write("\r\n".join(lines) + "\r\n")
