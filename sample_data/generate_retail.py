#!/usr/bin/python3
"""Generate sample_data/retail_weeks.csv: weekly figures of an invented store chain.

Scenario (fictional): Tallow & Pine Outfitters runs four store formats. Head office asks
whether weekly promotion spend goes with higher sales.

Planted structure:
  * Slope reversal of `weekly_sales` on `promo_spend` by `store_format` (a confounder):
    bigger formats both spend more on promotion and sell more, so across all store-weeks the
    slope is strongly positive; inside every format, managers push promotion in weeks of weak
    demand (an unrecorded weekly demand shock), so weeks with more promotion spend have lower
    sales (within slope about -4 sales per unit of spend in every format), although each unit
    of spend itself adds +0.5 to sales.
  * `footfall` follows sales (visitors x basket): a consequence of sales, not a stratifier.
  * `quarter` shifts sales seasonally for every format alike (and leaves spend alone);
    `region` is noise.
  * About 0.5% of `footfall` cells are empty.

Prints a one-line summary (pooled slope, within-format slopes) and exits 2 if the planted
structure failed to hold. Run with Debian's interpreter:
    /usr/bin/python3 sample_data/generate_retail.py [--rows 5000] [--seed 20261202]
"""
import argparse
import json
import os
import sys

import numpy as np
import pandas as pd

FORMATS = ["kiosk", "high_street", "mall", "superstore"]
FORMAT_SHARE = np.array([0.30, 0.30, 0.25, 0.15])
PROMO_MEAN = np.array([300.0, 900.0, 1600.0, 2500.0])
PROMO_SD = np.array([80.0, 150.0, 250.0, 350.0])
SALES_MEAN = np.array([9000.0, 22000.0, 38000.0, 60000.0])
SALES_NOISE = np.array([500.0, 1000.0, 1800.0, 2800.0])
PROMO_EFFECT = 0.5        # sales per unit of spend, demand held fixed
DEMAND = 5.6 * PROMO_SD   # sales per SD of the weekly demand shock, per format
REGIONS = ["Fernmoor", "Caddon Vale", "Lowmarch", "Brackenhurst", "Eastwold"]
QUARTER_EFFECT = {"Q1": -0.04, "Q2": 0.0, "Q3": 0.02, "Q4": 0.06}
BASKET = 31.5


def ols_slope(x, y):
    x = x - x.mean()
    return float((x * (y - y.mean())).sum() / (x * x).sum())


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--rows", type=int, default=5000)
    p.add_argument("--seed", type=int, default=20261202)
    p.add_argument("--out", default=os.path.join(os.path.dirname(os.path.abspath(__file__)),
                                                 "retail_weeks.csv"))
    a = p.parse_args(argv)
    rng = np.random.default_rng(a.seed)
    n = a.rows

    fmt = rng.choice(len(FORMATS), size=n, p=FORMAT_SHARE)
    region = rng.integers(0, len(REGIONS), size=n)
    quarters = list(QUARTER_EFFECT)
    quarter = rng.integers(0, 4, size=n)
    # Weak weeks draw more promotion: spend deviates against an unseen weekly demand shock.
    shock = rng.normal(size=n)
    promo = PROMO_MEAN[fmt] + PROMO_SD[fmt] * (-0.8 * shock + 0.6 * rng.normal(size=n))
    promo = np.maximum(promo, 20.0)
    season = np.array([QUARTER_EFFECT[q] for q in quarters])[quarter]
    sales = (SALES_MEAN[fmt] * (1 + season)
             + PROMO_EFFECT * (promo - PROMO_MEAN[fmt])
             + DEMAND[fmt] * shock
             + SALES_NOISE[fmt] * rng.normal(size=n))
    footfall = np.round(sales / BASKET * np.exp(rng.normal(scale=0.05, size=n)))
    footfall[rng.uniform(size=n) < 0.005] = np.nan

    df = pd.DataFrame({
        "store_format": np.array(FORMATS)[fmt],
        "region": np.array(REGIONS)[region],
        "quarter": np.array(quarters)[quarter],
        "promo_spend": np.round(promo, 2),
        "weekly_sales": np.round(sales, 2),
        "footfall": pd.array(footfall, dtype="Int64"),
    })
    df.to_csv(a.out, index=False)

    pooled = ols_slope(df.promo_spend.to_numpy(), df.weekly_sales.to_numpy())
    within = {f: ols_slope(g.promo_spend.to_numpy(), g.weekly_sales.to_numpy())
              for f, g in df.groupby("store_format")}
    ok = pooled > 0 and all(s < 0 for s in within.values())
    print(json.dumps({"file": os.path.basename(a.out), "rows": n, "pooled_slope": round(pooled, 4),
                      "within_slopes": {k: round(v, 4) for k, v in within.items()},
                      "verified": ok}))
    return 0 if ok else 2


if __name__ == "__main__":
    sys.exit(main())
