#!/usr/bin/python3
"""Generate sample_data/lender_approvals.csv: an invented lender's approval decisions.

Scenario (fictional): Harrowgate Credit Co-op reviews personal-finance applications from
two applicant groups, A and B, across eight branches and six products.

Planted structure:
  * Reversal by `product`: group B's pooled approval rate is lower than A's, yet within every
    product B is approved slightly more often. B applies mostly for products with low approval
    rates (applicant_group -> product -> approved: product is a mediator of the group gap).
  * `income_band` shifts both the product mix and approval, independently of the group.
  * `credit_score` raises approval; `loan_amount` depends on product and income.
  * `branch`, `channel` and `term` are noise. About 0.5% of `income` cells are empty.

Run with Debian's interpreter: /usr/bin/python3 sample_data/generate_lender.py
The same seed gives the same file for a given numpy version.
"""
import argparse
import sys

import numpy as np
import pandas as pd

PRODUCTS = ["secured_card", "auto_loan", "home_improvement",
            "personal_loan", "small_business", "debt_consolidation"]
BASE_RATE = np.array([0.88, 0.76, 0.63, 0.50, 0.37, 0.25])   # group A, middle income
GROUP_B_LIFT = 0.04                                           # B ahead inside every product
MIX_A = np.array([0.30, 0.26, 0.18, 0.13, 0.08, 0.05])
MIX_B = np.array([0.05, 0.08, 0.13, 0.19, 0.25, 0.30])
INCOME_BANDS = ["under_30k", "30k_60k", "60k_100k", "over_100k"]
INCOME_SHARE = np.array([0.22, 0.36, 0.28, 0.14])
INCOME_RATE_SHIFT = np.array([-0.06, -0.02, 0.02, 0.05])
INCOME_CENTRE = np.array([22000.0, 45000.0, 78000.0, 135000.0])
BRANCHES = ["Eastgate", "Millbrook", "Harrow Lane", "Quayside",
            "Stonebridge", "Fairholt", "Kilnworth", "Ashcombe"]
CHANNELS = ["online", "phone", "in_branch"]
TERMS = ["12m", "24m", "36m", "60m"]
LOAN_CENTRE = np.array([2500.0, 18000.0, 14000.0, 9000.0, 32000.0, 16000.0])


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--rows", type=int, default=20000)
    p.add_argument("--seed", type=int, default=20261202)
    p.add_argument("--out", default="sample_data/lender_approvals.csv")
    a = p.parse_args(argv)
    rng = np.random.default_rng(a.seed)
    n = a.rows

    group_b = rng.random(n) < 0.40
    income = rng.choice(len(INCOME_BANDS), size=n, p=INCOME_SHARE)
    # Higher income tilts both groups towards the products with high approval rates.
    product = np.empty(n, dtype=np.int64)
    for g, mix in ((False, MIX_A), (True, MIX_B)):
        for b in range(len(INCOME_BANDS)):
            m = (group_b == g) & (income == b)
            tilt = mix * np.exp(-0.25 * (b - 1.5) * np.arange(len(PRODUCTS)) / 5.0)
            product[m] = rng.choice(len(PRODUCTS), size=int(m.sum()), p=tilt / tilt.sum())

    credit = np.clip(np.rint(rng.normal(680 + 15 * income, 45)), 350, 850)
    rate = (BASE_RATE[product] + GROUP_B_LIFT * group_b + INCOME_RATE_SHIFT[income]
            + 0.0008 * (credit - 680 - 15 * income))
    approved = (rng.random(n) < np.clip(rate, 0.02, 0.98)).astype(int)

    income_val = np.round(INCOME_CENTRE[income] * np.exp(rng.normal(0, 0.18, n)), -2)
    income_col = pd.array(income_val, dtype="Float64")
    income_col[rng.random(n) < 0.005] = pd.NA
    loan = np.round(LOAN_CENTRE[product] * (0.7 + 0.3 * income) * np.exp(rng.normal(0, 0.3, n)), -1)

    df = pd.DataFrame({
        "applicant_group": np.where(group_b, "B", "A"),
        "approved": approved,
        "product": np.array(PRODUCTS)[product],
        "branch": np.array(BRANCHES)[rng.integers(0, len(BRANCHES), n)],
        "channel": np.array(CHANNELS)[rng.choice(3, size=n, p=[0.55, 0.15, 0.30])],
        "term": np.array(TERMS)[rng.integers(0, len(TERMS), n)],
        "income_band": np.array(INCOME_BANDS)[income],
        "credit_score": credit.astype(int),
        "loan_amount": loan,
        "income": income_col,
    })

    crude = df.groupby("applicant_group")["approved"].mean()
    within = df.groupby(["product", "applicant_group"])["approved"].mean().unstack()
    ok = crude["B"] < crude["A"] and bool((within["B"] > within["A"]).all())
    print(f"pooled approval A {crude['A']:.4f} B {crude['B']:.4f}; "
          f"B ahead within every product: {bool((within['B'] > within['A']).all())}")
    if not ok:
        print("planted reversal did not hold; change --seed or --rows", file=sys.stderr)
        return 2
    df.to_csv(a.out, index=False, lineterminator="\n")
    print(f"wrote {a.out} ({n} rows)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
