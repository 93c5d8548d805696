#!/usr/bin/python3
"""Compared groups formed by two columns, checked from outside.

An invented hiring file with `sex` and `ethnicity` (and a department that mediates): `foldline
scan --exposure sex+ethnicity=female+b,male+a` must compare exactly the rows pandas selects for
those two combinations (crude and per-department rates equal to pandas' group means), leave the
parts out of the stratifiers, and give a diagram drawn with the parts the same verdicts as the
same diagram drawn with the combined node (one node whose parents are the parts' parents).

Usage: combined_groups_reference.py FOLDLINE
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import pandas as pd

failures = 0


def check(ok, what):
    global failures
    if not ok:
        failures += 1
        print("FAIL:", what)


def main():
    foldline = sys.argv[1]
    rng = np.random.default_rng(4242)
    n = 6000
    sex = rng.choice(["female", "male"], n)
    eth = rng.choice(["a", "b", "c"], n, p=[0.5, 0.3, 0.2])
    region = rng.choice(["north", "south"], n)
    # Group female+b applies mostly to the department that hires least often.
    p_dept = np.where((sex == "female") & (eth == "b"), 0.8, 0.3)
    dept = np.where(rng.random(n) < p_dept, "care", "ops")
    p_hire = np.where(dept == "care", 0.15, 0.45) + np.where((sex == "female") & (eth == "b"), 0.04, 0.0)
    hired = (rng.random(n) < p_hire).astype(int)
    df = pd.DataFrame({"sex": sex, "ethnicity": eth, "region": region, "department": dept, "hired": hired})
    df.loc[rng.choice(n, 50, replace=False), "ethnicity"] = np.nan
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "hiring.csv")
        df.to_csv(path, index=False)
        nodes = ["region", "sex", "ethnicity", "department", "hired"]
        parts = {"format": "foldline-diagram", "version": 1, "exposure": "sex", "outcome": "hired",
                 "nodes": [{"name": v} for v in nodes],
                 "edges": [{"from": a, "to": b} for a, b in [("region", "ethnicity"), ("region", "hired"),
                                                            ("sex", "department"), ("ethnicity", "department"),
                                                            ("department", "hired"), ("sex", "hired"),
                                                            ("ethnicity", "hired")]]}
        combined = {"format": "foldline-diagram", "version": 1, "exposure": "sex+ethnicity", "outcome": "hired",
                    "nodes": [{"name": v} for v in ["region", "sex+ethnicity", "department", "hired"]],
                    "edges": [{"from": a, "to": b} for a, b in [("region", "sex+ethnicity"), ("region", "hired"),
                                                               ("sex+ethnicity", "department"),
                                                               ("department", "hired"), ("sex+ethnicity", "hired")]]}
        docs = []
        for name, d in (("parts", parts), ("combined", combined)):
            dpath = os.path.join(tmp, name + ".diagram.json")
            json.dump(d, open(dpath, "w"))
            p = subprocess.run([foldline, "scan", path, "--outcome", "hired=1", "--exposure",
                                "sex+ethnicity=female+b,male+a", "--bootstrap", "0", "--no-pairs",
                                "--diagram", dpath, "--json", "-"], capture_output=True, text=True)
            check(p.returncode == 0, f"scan with the {name} diagram: exit {p.returncode}: {p.stderr.strip()}")
            if p.returncode:
                return
            docs.append(json.loads(p.stdout))
        doc = docs[0]
        check(doc["question"]["exposure"] == "sex+ethnicity", f"exposure {doc['question']['exposure']}")
        cands = [c["column"] for c in doc["candidates"]]
        check("sex" not in cands and "ethnicity" not in cands, f"a part stratifies: {cands}")
        excluded = {e["column"]: e["reason"] for e in doc["excluded"]}
        check("part of the compared groups" in excluded.get("sex", ""), f"sex not listed as a part: {excluded}")
        combo = df.sex + "+" + df.ethnicity
        focal, ref = df[combo == "female+b"], df[combo == "male+a"]
        f = next(f for f in doc["findings"] if f["strata"] == ["department"])
        check(f["crude"]["n_focal"] == len(focal) and f["crude"]["n_reference"] == len(ref),
              f"rows {f['crude']['n_focal']}/{f['crude']['n_reference']} vs pandas {len(focal)}/{len(ref)}")
        check(abs(f["crude"]["rate_focal"] - focal.hired.mean()) < 1e-12, "focal rate differs from pandas")
        check(abs(f["crude"]["rate_reference"] - ref.hired.mean()) < 1e-12, "reference rate differs from pandas")
        print(f"crude: female+b {focal.hired.mean():.4f} (n={len(focal)}), male+a {ref.hired.mean():.4f} "
              f"(n={len(ref)}); class by department: {f['class']}")
        # The same verdicts whether the reviewer drew the parts or the combined node.
        va = [(g["strata"], g.get("verdict")) for g in docs[0]["findings"]]
        vb = [(g["strata"], g.get("verdict")) for g in docs[1]["findings"]]
        check(va == vb, "verdicts differ between the diagram with parts and the combined diagram")
        check(all(v is not None for _, v in va), "some finding has no verdict")
        print("verdicts (parts = combined):", [(s, v["answer"] if v else None) for s, v in va])
    if failures:
        print(f"{failures} check(s) failed")
        sys.exit(1)
    print("combined groups reference: all checks passed")


if __name__ == "__main__":
    main()
