#!/usr/bin/python3
"""Generate sample_data/screening_alerts.csv: a screening model's alerts and the true outcomes.

Scenario (fictional): the Larkspur Community Clinics network reviews an early-warning model
that raises an alert when a patient is likely to deteriorate within 48 hours. The review asks
whether the model's error rates differ between two patient groups (A and B):
  * the true-positive rate: alerts among patients who did deteriorate (`deteriorated = 1`);
  * the false-positive rate: alerts among patients who did not (`deteriorated = 0`).
Both are rates within a subset of rows, so each is a rate scan with a rows filter.

Planted structure:
  * `ward` drives the false alarms: on the acute ward abnormal vital signs are common, so the
    model alerts far more often on patients who are fine. Group B is admitted to the acute ward
    much more often, so B's pooled false-positive rate is higher than A's, yet within every ward
    B's is slightly lower: a reversal by `ward` of the false-positive rate.
  * The true-positive rate is about the same for both groups in every ward (no reversal).
  * `age_band` raises the chance of deterioration; `shift` (day/night) is noise.

Run with Debian's interpreter: /usr/bin/python3 sample_data/generate_screening.py
"""
import argparse

import numpy as np
import pandas as pd

WARDS = ["general", "cardiology", "acute"]
P_WARD = {"A": [0.55, 0.30, 0.15], "B": [0.20, 0.25, 0.55]}
FPR = np.array([0.06, 0.12, 0.30])      # false-alert rate by ward (group A)
FPR_B_SHIFT = -0.04                     # B lower within each ward
TPR = np.array([0.78, 0.80, 0.84])      # alert rate among those who deteriorate
AGE_BANDS = ["18-39", "40-59", "60-74", "75+"]
P_DETERIORATE_AGE = np.array([0.04, 0.07, 0.11, 0.16])
WARD_DETERIORATE = np.array([0.8, 1.0, 1.6])


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--rows", type=int, default=12000)
    p.add_argument("--seed", type=int, default=27182)
    p.add_argument("--out", default="sample_data/screening_alerts.csv")
    a = p.parse_args(argv)
    rng = np.random.default_rng(a.seed)
    n = a.rows
    group = np.where(rng.random(n) < 0.5, "A", "B")
    ward = np.empty(n, dtype=object)
    for g in ("A", "B"):
        m = group == g
        ward[m] = rng.choice(WARDS, size=m.sum(), p=P_WARD[g])
    wi = np.array([WARDS.index(w) for w in ward])
    age = rng.choice(len(AGE_BANDS), size=n, p=[0.25, 0.3, 0.25, 0.2])
    p_det = np.clip(P_DETERIORATE_AGE[age] * WARD_DETERIORATE[wi], 0, 0.9)
    deteriorated = (rng.random(n) < p_det).astype(int)
    fpr = FPR[wi] + np.where(group == "B", FPR_B_SHIFT, 0.0)
    p_alert = np.where(deteriorated == 1, TPR[wi], fpr)
    alert = (rng.random(n) < p_alert).astype(int)
    shift = rng.choice(["day", "night"], size=n)
    df = pd.DataFrame({"patient_group": group, "alert": alert, "deteriorated": deteriorated, "ward": ward,
                       "age_band": [AGE_BANDS[i] for i in age], "shift": shift})
    df.to_csv(a.out, index=False)
    neg = df[df.deteriorated == 0]
    pos = df[df.deteriorated == 1]
    print(f"wrote {a.out}: {n} rows; false-positive rate A {neg[neg.patient_group == 'A'].alert.mean():.3f}, "
          f"B {neg[neg.patient_group == 'B'].alert.mean():.3f}; true-positive rate "
          f"A {pos[pos.patient_group == 'A'].alert.mean():.3f}, B {pos[pos.patient_group == 'B'].alert.mean():.3f}")


if __name__ == "__main__":
    main()
