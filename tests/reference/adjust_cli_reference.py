#!/usr/bin/python3
"""`foldline adjust` checked from outside.

1. Every sample diagram (sample_data/*.diagram.json): the minimal adjustment sets and whether
   the empty set is valid must equal a brute force over every subset of the observed columns,
   tested with the generalised adjustment criterion built from networkx 2.8 primitives
   (see dsep_reference.py for the criterion and its sources).
2. Exit codes and messages (0 ok, 2 usage, 3 input error naming the file and the problem).
3. The DOT export of awkward names is read back by Graphviz's own parser (`dot -Tjson`,
   Debian package graphviz) and the names are recovered exactly (DOT language reference:
   in quoted IDs only \\" is an escape; the \\N label is an escString where \\\\ and \\n apply).

Usage: adjust_cli_reference.py FOLDLINE SOURCE_DIR
"""
import glob
import json
import os
import shutil
import subprocess
import sys
import tempfile

import networkx as nx

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from dsep_reference import brute_force_minimal  # noqa: E402

failures = 0


def check(ok, what):
    global failures
    if not ok:
        failures += 1
        print("FAIL:", what)


def run(foldline, *args):
    p = subprocess.run([foldline, "adjust", *args], capture_output=True, text=True)
    return p.returncode, p.stdout, p.stderr


def check_samples(foldline, source_dir):
    paths = sorted(glob.glob(os.path.join(source_dir, "sample_data", "*.diagram.json")))
    check(len(paths) >= 3, f"expected at least 3 sample diagrams, found {len(paths)}")
    for path in paths:
        doc = json.load(open(path))
        names = [n["name"] for n in doc["nodes"]]
        idx = {n: i for i, n in enumerate(names)}
        g = nx.DiGraph()
        g.add_nodes_from(range(len(names)))
        g.add_edges_from((idx[e["from"]], idx[e["to"]]) for e in doc["edges"])
        x, y = idx[doc["exposure"]], idx[doc["outcome"]]
        usable = {idx[n["name"]] for n in doc["nodes"] if n.get("observed", True)} - {x, y}
        want = {frozenset(names[v] for v in s) for s in brute_force_minimal(g, {x}, {y}, usable)}
        rc, out, err = run(foldline, path, "--json", "-")
        check(rc == 0, f"{path}: exit {rc}: {err}")
        got = json.loads(out)
        check({frozenset(s) for s in got["minimal_sets"]} == want,
              f"{path}: minimal sets {got['minimal_sets']} vs brute force {sorted(map(sorted, want))}")
        check(got["empty_set_valid"] == (frozenset() in want), f"{path}: empty_set_valid")
        print(f"{os.path.basename(path)}: {len(want)} minimal set(s) agree with networkx brute force")


def check_exit_codes(foldline, tmp):
    cyclic = os.path.join(tmp, "cyclic.diagram.json")
    json.dump({"nodes": [{"name": "a"}, {"name": "b"}, {"name": "c"}],
               "edges": [{"from": "a", "to": "b"}, {"from": "b", "to": "c"}, {"from": "c", "to": "a"}],
               "exposure": "a", "outcome": "c"}, open(cyclic, "w"))
    rc, _, err = run(foldline, cyclic)
    check(rc == 3 and cyclic in err and '"a" -> "b" -> "c" -> "a"' in err, f"cycle: exit {rc}, {err!r}")
    hidden = os.path.join(tmp, "hidden.diagram.json")
    json.dump({"nodes": [{"name": "x", "observed": False}, {"name": "y"}], "edges": [], "exposure": "x",
               "outcome": "y"}, open(hidden, "w"))
    rc, _, err = run(foldline, hidden)
    check(rc == 3 and "unobserved" in err, f"unobserved exposure: exit {rc}, {err!r}")
    broken = os.path.join(tmp, "broken.diagram.json")
    open(broken, "w").write('{"nodes": [\n  {"name": "a"\n]}')
    rc, _, err = run(foldline, broken)
    check(rc == 3 and f"{broken}:3:" in err, f"syntax error position: exit {rc}, {err!r}")
    rc, _, err = run(foldline, os.path.join(tmp, "missing.diagram.json"))
    check(rc == 3 and "cannot open" in err, f"missing file: exit {rc}, {err!r}")
    rc, _, _ = run(foldline)
    check(rc == 2, f"no arguments: exit {rc}")
    rc, _, _ = run(foldline, cyclic, "--colour", "blue")
    check(rc == 2, f"unknown option: exit {rc}")
    sample = os.path.join(tmp, "ok.diagram.json")
    json.dump({"nodes": [{"name": "x"}, {"name": "y"}], "edges": [{"from": "x", "to": "y"}]}, open(sample, "w"))
    rc, _, _ = run(foldline, sample)
    check(rc == 2, f"no exposure anywhere: exit {rc}")
    rc, out, _ = run(foldline, sample, "--exposure", "x", "--outcome", "y")
    check(rc == 0 and "Pooled comparison (empty set) valid: yes" in out, f"options override: exit {rc}")
    rc, _, err = run(foldline, sample, "--exposure", "x", "--outcome", "y", "--stratify", "zz")
    check(rc == 3 and "zz" in err, f"unknown stratifier: exit {rc}, {err!r}")
    before = open(sample).read()
    rc, _, _ = run(foldline, sample, "--exposure", "x", "--outcome", "y", "--json", sample)
    check(rc == 2 and open(sample).read() == before, "the input file must never be written")


def check_dot(foldline, tmp):
    dot = shutil.which("dot")
    if not dot:
        print("graphviz 'dot' not installed: DOT parse check skipped")
        return
    names = ['income band', 'say "hi"', 'back\\slash', 'two\nlines', 'ünïcode', 'ends with \\']
    path = os.path.join(tmp, "awkward.diagram.json")
    json.dump({"nodes": [{"name": n} for n in names] + [{"name": "hidden", "observed": False}],
               "edges": [{"from": names[i], "to": names[i + 1]} for i in range(len(names) - 1)]
               + [{"from": "hidden", "to": names[0]}],
               "exposure": names[0], "outcome": names[-1]}, open(path, "w"))
    rc, out, err = run(foldline, path, "--dot", "-")
    check(rc == 0, f"--dot -: exit {rc}: {err}")
    p = subprocess.run([dot, "-Tjson"], input=out, capture_output=True, text=True)
    check(p.returncode == 0, f"graphviz rejected the DOT: {p.stderr}")
    if p.returncode != 0:
        return
    parsed = json.loads(p.stdout)
    ids = [o["name"] for o in parsed.get("objects", [])]
    # Graphviz keeps \\ and \n inside IDs; as an escString (the default \N label) they read as
    # one backslash and a line break.
    recovered = {i.replace("\\n", "\n").replace("\\\\", "\\") for i in ids}
    check(recovered == set(names) | {"hidden"}, f"DOT names: {ids}")
    check(len(parsed.get("edges", [])) == len(names), "DOT edge count")
    print(f"Graphviz read {len(ids)} nodes and {len(parsed.get('edges', []))} edges back from the DOT export")


def main():
    foldline, source_dir = sys.argv[1], sys.argv[2]
    tmp = tempfile.mkdtemp(prefix="foldline_adjust_")
    try:
        check_samples(foldline, source_dir)
        check_exit_codes(foldline, tmp)
        check_dot(foldline, tmp)
    finally:
        shutil.rmtree(tmp)
    print(f"{failures} failure(s)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
