#!/usr/bin/python3
"""d-separation and minimal adjustment sets of core/causal checked against networkx.

Source of truth: networkx's `d_separated` (Debian python3-networkx 2.8, algorithm of
Darwiche 2009 / Shachter 1998 as documented by networkx) on random DAGs; adjustment sets by
brute force: every subset of the usable nodes is tested with the generalised adjustment
criterion (van der Zander, Liskiewicz & Textor 2019, Artificial Intelligence 270:1-40,
Definition of the constructive back-door criterion), built here from networkx primitives
(descendants, ancestors, d_separated), and the minimal valid subsets are compared with
Foldline's enumeration; the smallest set's size with the least size found by brute force.

Usage: dsep_reference.py ORACLE [--write-golden FILE] [--graphs N] [--seed S]
ORACLE is the causal_oracle executable (tests/reference/causal_oracle.cpp).
"""
import argparse
import itertools
import random
import subprocess
import sys

import networkx as nx


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


def valid_adjustment(g, X, Y, Z):
    """Generalised adjustment criterion from networkx primitives."""
    if Z & (X | Y):
        return False
    g_no_in = g.copy()
    g_no_in.remove_edges_from([(u, x) for x in X for u in list(g.predecessors(x))])
    de = set().union(*[nx.descendants(g_no_in, x) for x in X]) - X
    g_no_out = g.copy()
    g_no_out.remove_edges_from([(x, w) for x in X for w in list(g.successors(x))])
    an = set(Y).union(*[nx.ancestors(g_no_out, y) for y in Y])
    cn = de & an
    forb = set(X) | cn | set().union(*[nx.descendants(g, c) for c in cn]) if cn else set(X)
    if Z & forb:
        return False
    pbd = g.copy()
    pbd.remove_edges_from([(x, w) for x in X for w in g.successors(x) if w in cn])
    return nx.d_separated(pbd, set(X), set(Y), set(Z))


def brute_force_minimal(g, X, Y, usable):
    usable = sorted(usable)
    k = len(usable)
    valid = [False] * (1 << k)
    for mask in range(1 << k):
        Z = {usable[i] for i in range(k) if mask >> i & 1}
        valid[mask] = valid_adjustment(g, X, Y, Z)
    has_valid_subset = [False] * (1 << k)
    for mask in sorted(range(1 << k), key=lambda m: bin(m).count("1")):
        has_valid_subset[mask] = valid[mask] or any(
            has_valid_subset[mask ^ (1 << i)] for i in range(k) if mask >> i & 1)
    minimal = []
    for mask in range(1 << k):
        if valid[mask] and not any(has_valid_subset[mask ^ (1 << i)] for i in range(k) if mask >> i & 1):
            minimal.append(frozenset(usable[i] for i in range(k) if mask >> i & 1))
    return minimal


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("oracle")
    ap.add_argument("--write-golden")
    ap.add_argument("--graphs", type=int, default=300)
    ap.add_argument("--seed", type=int, default=20261202)
    args = ap.parse_args()
    rng = random.Random(args.seed)

    lines, expected = [], []  # protocol lines and, per answer, what networkx says
    for gi in range(args.graphs):
        n = rng.randint(2, 12)
        g = random_dag(rng, n, rng.uniform(0.1, 0.6))
        lines.append(f"G {n}")
        lines += [f"E {a} {b}" for a, b in g.edges()]
        nodes = list(range(n))
        for _ in range(6):
            rng.shuffle(nodes)
            nx_ = rng.randint(1, min(2, n - 1))
            ny = rng.randint(1, min(2, n - nx_))
            X, Y = set(nodes[:nx_]), set(nodes[nx_:nx_ + ny])
            rest = nodes[nx_ + ny:]
            Z = {v for v in rest if rng.random() < 0.4}
            ans = nx.d_separated(g, X, Y, Z)
            lines.append(f"D {fmt(X)} ; {fmt(Y)} ; {fmt(Z)}")
            expected.append(("D", lines[-1], "1" if ans else "0"))
        # A denser graph of its own for the adjustment question, with the exposure in the
        # middle of a topological order (it has causes, so there are back-door paths) and
        # the outcome after it (an outcome that causes the exposure has no valid set).
        n = rng.randint(5, 12)
        g = random_dag(rng, n, rng.uniform(0.25, 0.6))
        lines.append(f"G {n}")
        lines += [f"E {a} {b}" for a, b in g.edges()]
        topo = list(nx.topological_sort(g))
        i = rng.randrange(n // 3, n - 1)
        j = rng.randrange(i + 1, n)
        X, Y = {topo[i]}, {topo[j]}
        if rng.random() < 0.2:
            extra = [v for v in topo[:j] if v != topo[i]]
            if extra:
                X.add(rng.choice(extra))
        nodes = list(range(n))
        usable = {v for v in nodes if v not in X | Y and rng.random() < 0.8}
        usable = set(sorted(usable)[:10])
        minimal = brute_force_minimal(g, X, Y, usable)
        lines.append(f"A {fmt(X)} ; {fmt(Y)} ; {fmt(usable)}")
        expected.append(("A", lines[-1], minimal))

    out = subprocess.run([args.oracle], input="\n".join(lines) + "\n", capture_output=True, text=True, check=True)
    answers = out.stdout.split("\n")
    pos, failures, n_d, n_a = 0, 0, 0, 0
    for kind, query, want in expected:
        if kind == "D":
            got = answers[pos]
            pos += 1
            n_d += 1
            if got != want:
                failures += 1
                print(f"d-separation mismatch: {query}: foldline {got}, networkx {want}")
        else:
            sets_line, small_line = answers[pos], answers[pos + 1]
            pos += 2
            n_a += 1
            _, count, *body = sets_line.split(" ")
            got = set()
            if int(count) > 0:
                for s in body[0].split("|"):
                    got.add(frozenset() if s == "-" else frozenset(int(v) for v in s.split(",")))
            small = small_line.split(" ")[1]
            want_small = min((len(s) for s in want), default=None)
            got_small = None if small == "none" else (0 if small == "-" else len(small.split(",")))
            if got != set(want) or got_small != want_small:
                failures += 1
                print(f"adjustment mismatch: {query}: foldline {sorted(map(sorted, got))} smallest {small}, "
                      f"brute force {sorted(map(sorted, want))} smallest size {want_small}")

    if args.write_golden:
        with open(args.write_golden, "w") as f:
            f.write("# Golden d-separation and minimal-adjustment-set cases for causal tests.\n")
            f.write(f"# Source: networkx {nx.__version__} d_separated (Debian python3-networkx); adjustment sets\n")
            f.write("# by brute force over every subset with the generalised adjustment criterion built from\n")
            f.write("# networkx primitives. Written by tests/reference/dsep_reference.py --write-golden,\n")
            f.write(f"# seed {args.seed}, {args.graphs} graphs. Lines: G/E as the oracle protocol;\n")
            f.write("# D xs ; ys ; zs = 0|1 ; A xs ; ys ; usable = set|set|... (\"none\" when no set is valid).\n")
            it = iter(expected)
            cur = next(it, None)
            for line in lines:
                if cur is not None and line == cur[1] and line[0] in "DA":
                    if cur[0] == "D":
                        f.write(f"{line} = {cur[2]}\n")
                    else:
                        sets = sorted((sorted(s) for s in cur[2]), key=lambda s: (len(s), s))
                        f.write(f"{line} = {'|'.join(fmt(s) for s in sets) if sets else 'none'}\n")
                    cur = next(it, None)
                else:
                    f.write(line + "\n")

    print(f"networkx {nx.__version__}: {n_d} d-separation queries, {n_a} adjustment-set queries "
          f"on {args.graphs} random DAGs; {failures} mismatches")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
