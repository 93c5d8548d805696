#!/usr/bin/python3
"""Generate sample_data/pay_review.csv: an invented employer's annual pay review.

Scenario (fictional): Ashcombe Mill Logistics reviews the base pay of its 2,400 employees by
gender, across six job grades, three sites and four tenure bands.

Planted structure (a mediator story):
  * Pooled, women's mean base pay is far below men's, because women are concentrated in the
    lower grades (gender -> grade -> base_pay: grade lies on the path from gender to pay).
  * Within every grade but one, women earn the same as men or slightly more (+3%); in grade
    G4 women earn 7% less, a gap that reaches the 5% threshold of the pay-reporting convention.
  * `tenure_band` raises grade and pay; `site` shifts pay a little for everyone; `department`
    is noise.
So the pooled gap answers "do women and men at this employer earn the same?", and the
within-grade gap answers "do women and men in the same grade earn the same?" — different
questions, which the audit's diagram (pay_review.diagram.json) spells out.

Run with Debian's interpreter: /usr/bin/python3 sample_data/generate_pay.py
The same seed gives the same file for a given numpy version.
"""
import argparse

import numpy as np
import pandas as pd

GRADES = ["G1", "G2", "G3", "G4", "G5", "G6"]
GRADE_PAY = np.array([24000, 29500, 36000, 45000, 57000, 74000])
SITES = ["Ashcombe", "Kettlebury", "Fenmoor"]
SITE_SHIFT = np.array([1.00, 0.97, 1.03])
TENURE = ["0-2", "3-5", "6-10", "11+"]
DEPARTMENTS = ["Warehouse", "Transport", "Finance", "Customer care", "Planning"]


def generate(n, seed):
    rng = np.random.default_rng(seed)
    woman = rng.random(n) < 0.48
    tenure = rng.choice(4, size=n, p=[0.3, 0.3, 0.25, 0.15])
    # Grade: men and longer tenure reach higher grades.
    score = rng.normal(0, 1, n) + 0.45 * tenure - 0.9 * woman
    grade = np.digitize(score, [-0.9, -0.1, 0.6, 1.3, 2.0])
    site = rng.choice(3, size=n, p=[0.45, 0.35, 0.20])
    department = rng.choice(len(DEPARTMENTS), size=n)
    within = np.where(woman, np.where(grade == 3, 0.93, 1.03), 1.0)
    pay = GRADE_PAY[grade] * SITE_SHIFT[site] * (1 + 0.02 * tenure) * within
    pay = pay * np.exp(rng.normal(0, 0.06, n))
    return pd.DataFrame({
        "employee": [f"AM{i:05d}" for i in range(1, n + 1)],
        "gender": np.where(woman, "woman", "man"),
        "grade": np.array(GRADES)[grade],
        "site": np.array(SITES)[site],
        "tenure_band": np.array(TENURE)[tenure],
        "department": np.array(DEPARTMENTS)[department],
        "base_pay": np.round(pay, 0).astype(int),
    })


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--rows", type=int, default=2400)
    ap.add_argument("--seed", type=int, default=20261205)
    ap.add_argument("--out", default="sample_data/pay_review.csv")
    a = ap.parse_args()
    generate(a.rows, a.seed).to_csv(a.out, index=False)


if __name__ == "__main__":
    main()
