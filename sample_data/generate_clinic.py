#!/usr/bin/python3
"""Generate sample_data/clinic_outcomes.csv (row level) and clinic_outcomes_counts.csv (pre-counted).

Scenario (fictional): the Larkspur Community Clinics network compares a new wound-care
protocol with the standard one across six sites.

Planted structure:
  * Reversal by `severity` (a confounder): severe cases are sent to the new protocol far more
    often and recover less often whatever the treatment, so the pooled recovery rate of the new
    protocol is lower, yet within every severity level it is higher
    (severity -> treatment, severity -> recovered, treatment -> recovered).
  * `age_band` raises severity; `site` shifts which protocol is used but not recovery.
  * `days_in_care` depends on treatment and severity (a common effect, not a stratifier to use).
  * `sex` is noise.

clinic_outcomes_counts.csv holds the same patients counted by treatment, severity, site and
recovered, with the count in `patients`: it must give the same findings for those columns.

Run with Debian's interpreter: /usr/bin/python3 sample_data/generate_clinic.py
"""
import argparse
import sys

import numpy as np
import pandas as pd

SEVERITY = ["mild", "moderate", "severe"]
AGE_BANDS = ["18-39", "40-59", "60-74", "75+"]
SITES = ["Northfold", "Brindle Cross", "Saltmarsh", "Orchard Rise", "Pellham Down", "Weyford"]
RECOVERY_STANDARD = np.array([0.90, 0.74, 0.48])
NEW_PROTOCOL_LIFT = 0.06
P_NEW = np.array([0.15, 0.45, 0.80])          # share on the new protocol by severity
SITE_SHIFT = np.array([-0.08, -0.04, 0.0, 0.02, 0.05, 0.08])


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--rows", type=int, default=8000)
    p.add_argument("--seed", type=int, default=31415)
    p.add_argument("--out", default="sample_data/clinic_outcomes.csv")
    p.add_argument("--counts-out", default="sample_data/clinic_outcomes_counts.csv")
    a = p.parse_args(argv)
    rng = np.random.default_rng(a.seed)
    n = a.rows

    age = rng.choice(4, size=n, p=[0.25, 0.30, 0.27, 0.18])
    sev_p = np.array([[0.55, 0.32, 0.13], [0.45, 0.35, 0.20], [0.32, 0.38, 0.30], [0.22, 0.38, 0.40]])
    severity = np.array([rng.choice(3, p=sev_p[x]) for x in age])
    site = rng.integers(0, len(SITES), n)
    new = rng.random(n) < np.clip(P_NEW[severity] + SITE_SHIFT[site], 0.02, 0.98)
    recovered = rng.random(n) < RECOVERY_STANDARD[severity] + NEW_PROTOCOL_LIFT * new
    days = np.round(rng.gamma(2.0 + 2.5 * severity, 1.6) + 1.5 * new + 1, 1)

    df = pd.DataFrame({
        "treatment": np.where(new, "new_protocol", "standard"),
        "recovered": np.where(recovered, "yes", "no"),
        "severity": np.array(SEVERITY)[severity],
        "site": np.array(SITES)[site],
        "age_band": np.array(AGE_BANDS)[age],
        "sex": np.where(rng.random(n) < 0.52, "female", "male"),
        "days_in_care": days,
    })
    rec = df["recovered"] == "yes"
    crude = rec.groupby(df["treatment"]).mean()
    within = rec.groupby([df["severity"], df["treatment"]]).mean().unstack()
    ok = crude["new_protocol"] < crude["standard"] and bool((within["new_protocol"] > within["standard"]).all())
    print(f"pooled recovery new {crude['new_protocol']:.4f} standard {crude['standard']:.4f}; "
          f"new ahead within every severity: {bool((within['new_protocol'] > within['standard']).all())}")
    if not ok:
        print("planted reversal did not hold; change --seed or --rows", file=sys.stderr)
        return 2
    df.to_csv(a.out, index=False, lineterminator="\n")
    counts = (df.groupby(["treatment", "severity", "site", "recovered"]).size()
                .rename("patients").reset_index())
    counts.to_csv(a.counts_out, index=False, lineterminator="\n")
    print(f"wrote {a.out} ({n} rows) and {a.counts_out} ({len(counts)} cells)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
