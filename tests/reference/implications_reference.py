#!/usr/bin/python3
"""The testable implications of a diagram (core/causal/implications.h) against networkx.

Source of truth: networkx's `d_separated` (Debian python3-networkx 2.8). On random DAGs with a
random set of unobserved nodes, every pair of observed, non-adjacent nodes is examined by brute
force: every subset of the other observed nodes is tested for d-separation with networkx.
The expected claim, following the form documented in implications.h and docs/methods.md:
  - "parents" when a node of the pair is not an ancestor of the other and all its parents are
    observed: exactly the smaller such parent set (tie: the later node's parents);
  - otherwise "separator": the size must equal the smallest separating subset brute force finds,
    and networkx must confirm that Foldline's set d-separates the pair;
  - "untestable" exactly when no subset of observed nodes separates the pair; the set given
    must d-separate the pair (networkx) and hold an unobserved node.
The list of pairs must be exactly the observed, non-adjacent pairs.

Usage: implications_reference.py ORACLE [--graphs N] [--seed S]
"""
import argparse
import itertools
import random
import subprocess
import sys

import networkx as nx

dsep = getattr(nx, "is_d_separator", None) or nx.d_separated


def random_dag(rng, n, p):
    order = list(range(n))
    rng.shuffle(order)
    g = nx.DiGraph()
    g.add_nodes_from(range(n))
    for i in range(n):
        for j in range(i + 1, n):
            if rng.random() < p:
                g.add_edge(order[i], order[j])
    return g


def fmt(nodes):
    return ",".join(str(v) for v in sorted(nodes)) if nodes else "-"


def parse(s):
    return [] if s == "-" else [int(v) for v in s.split(",")]


def expected_claims(g, observed):
    """(a, b) -> (form, parents set or None, smallest observed separator size or None)."""
    out = {}
    n = g.number_of_nodes()
    for a in range(n):
        for b in range(a + 1, n):
            if a not in observed or b not in observed or g.has_edge(a, b) or g.has_edge(b, a):
                continue
            best = None
            for v in (b, a):
                other = a if v == b else b
                if other in nx.descendants(g, v):
                    continue
                pa = set(g.predecessors(v))
                if not pa <= observed:
                    continue
                if best is None or len(pa) < len(best):
                    best = pa
            if best is not None:
                out[(a, b)] = ("parents", best, None)
                continue
            rest = sorted(observed - {a, b})
            smallest = None
            for k in range(len(rest) + 1):
                if any(dsep(g, {a}, {b}, set(z)) for z in itertools.combinations(rest, k)):
                    smallest = k
                    break
            out[(a, b)] = ("separator", None, smallest) if smallest is not None else ("untestable", None, None)
    return out


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("oracle")
    ap.add_argument("--graphs", type=int, default=200)
    ap.add_argument("--seed", type=int, default=20261205)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    graphs, lines = [], []
    for _ in range(args.graphs):
        n = rng.randint(2, 10)
        g = random_dag(rng, n, rng.uniform(0.15, 0.6))
        observed = {v for v in range(n) if rng.random() < 0.75}
        graphs.append((g, observed))
        lines.append(f"G {n}")
        lines += [f"E {a} {b}" for a, b in g.edges()]
        lines.append(f"I {fmt(observed)}")
    out = subprocess.run([args.oracle], input="\n".join(lines) + "\n", capture_output=True, text=True, check=True)
    answers = iter(out.stdout.split("\n"))
    failures, counts = 0, {"parents": 0, "separator": 0, "untestable": 0}
    for gi, (g, observed) in enumerate(graphs):
        k = int(next(answers).split(" ")[1])
        got = {}
        for _ in range(k):
            a, b, form, given = next(answers).split(" ")
            got[(int(a), int(b))] = (form, set(parse(given)))
        want = expected_claims(g, observed)
        where = f"graph {gi} edges {sorted(g.edges())} observed {sorted(observed)}"
        if set(got) != set(want):
            failures += 1
            print(f"pairs differ: {where}: foldline {sorted(got)}, networkx {sorted(want)}")
            continue
        for pair, (form, given) in got.items():
            wform, wparents, wsize = want[pair]
            counts[wform] += 1
            ok = form == wform
            if ok and form == "parents":
                ok = given == wparents
            elif ok and form == "separator":
                ok = len(given) == wsize and given <= observed and dsep(g, {pair[0]}, {pair[1]}, given)
            elif ok:
                ok = bool(given - observed) and dsep(g, {pair[0]}, {pair[1]}, given)
            if not ok:
                failures += 1
                print(f"claim differs: {where}: pair {pair}: foldline {form} {sorted(given)}, "
                      f"expected {wform} {sorted(wparents) if wparents is not None else wsize}")
    print(f"networkx {nx.__version__}: {sum(counts.values())} claims on {args.graphs} random diagrams "
          f"({counts['parents']} parents, {counts['separator']} separator, {counts['untestable']} untestable); "
          f"{failures} mismatches")
    return 1 if failures or counts["separator"] == 0 or counts["untestable"] == 0 else 0


if __name__ == "__main__":
    sys.exit(main())
