#!/usr/bin/env python3
"""Structural difference of two Foldline JSON documents, one line per differing path.

Used to show what a change does to the JSON of the sample audits: run `foldline run
sample_data/X.foldline --json A.json` with the old and the new build, then
`json_diff.py A.json B.json`. Numbers equal within --tol (relative) are the same. Exit 0 when
the documents agree, 1 otherwise. Only the Python standard library is used.
"""
import argparse
import json
import math
import sys


def walk(a, b, path, tol, out):
    if isinstance(a, dict) and isinstance(b, dict):
        for k in sorted(set(a) | set(b)):
            p = f"{path}.{k}"
            if k not in a:
                out.append(f"+ {p} = {json.dumps(b[k])[:120]}")
            elif k not in b:
                out.append(f"- {p} (was {json.dumps(a[k])[:120]})")
            else:
                walk(a[k], b[k], p, tol, out)
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            out.append(f"~ {path}: {len(a)} items -> {len(b)} items")
        for i, (x, y) in enumerate(zip(a, b)):
            walk(x, y, f"{path}[{i}]", tol, out)
    elif isinstance(a, (int, float)) and isinstance(b, (int, float)) and not isinstance(a, bool) \
            and not isinstance(b, bool):
        if type(a) is not type(b) and a == b:
            out.append(f"~ {path}: {json.dumps(a)} -> {json.dumps(b)} (type)")
        elif not math.isclose(a, b, rel_tol=tol, abs_tol=tol):
            out.append(f"~ {path}: {a!r} -> {b!r}")
    elif a != b:
        out.append(f"~ {path}: {json.dumps(a)[:120]} -> {json.dumps(b)[:120]}")


def generalise(line):
    """Collapse list indices so that one kind of change is counted once."""
    import re
    return re.sub(r"\[\d+\]", "[]", line.split(":")[0].split(" (")[0].split(" = ")[0])


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("old")
    ap.add_argument("new")
    ap.add_argument("--tol", type=float, default=0.0)
    ap.add_argument("--summary", action="store_true", help="count the differences by path pattern")
    args = ap.parse_args()
    with open(args.old, encoding="utf-8") as f:
        a = json.load(f)
    with open(args.new, encoding="utf-8") as f:
        b = json.load(f)
    out = []
    walk(a, b, "$", args.tol, out)
    if args.summary:
        counts = {}
        for line in out:
            key = generalise(line)
            counts[key] = counts.get(key, 0) + 1
        for key, n in sorted(counts.items()):
            print(f"{n:6d}  {key}")
    else:
        print("\n".join(out))
    print(f"{len(out)} differences", file=sys.stderr)
    return 0 if not out else 1


if __name__ == "__main__":
    sys.exit(main())
