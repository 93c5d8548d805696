#!/usr/bin/env bash
# End-to-end comparison with the pandas/statsmodels peer (../shared/bench/peer_pandas_scan.py):
# both answer the same questions on the same seeded file, interleaved, RUNS times each; prints
# both medians, the ratio, and whether they agree on which comparisons reverse.
#
#   bench/compare.sh [ROWS] [RUNS]        (defaults 1000000 and 5)
#
# Questions (the peer's): rate scan of approved by applicant_group (B against A) over every
# categorical column and every pair; slope of loan_amount on credit_score within each single
# column. Foldline is run with --bins 0 so that it, like the peer, leaves continuous numeric
# columns out of the candidates. Data go to $DATA (default: a folder under /tmp), never the repo.
set -euo pipefail
cd "$(dirname "$0")/.."
ROWS=${1:-1000000}
RUNS=${2:-5}
PY=/usr/bin/python3
SHARED=${FOLDLINE_SHARED:-../shared/bench}
[ -d "$SHARED" ] || SHARED=../../shared/bench   # from a git worktree one level deeper
DATA=${DATA:-/tmp/foldline_bench}
BIN=${FOLDLINE_BIN:-build/app/foldline}
mkdir -p "$DATA"
CSV="$DATA/audit_${ROWS}.csv"
[ -x "$BIN" ] || { echo "build first: cmake --build build --target foldline" >&2; exit 2; }
if [ ! -s "$CSV" ]; then
    echo "generating $CSV" >&2
    $PY "$SHARED/gen_audit_data.py" --rows "$ROWS" --seed 42 --out "$CSV" >/dev/null
fi

now() { date +%s%N; }
fl_times=(); peer_times=()
for i in $(seq "$RUNS"); do
    t0=$(now)
    "$BIN" scan "$CSV" --outcome approved=1 --exposure applicant_group=B,A --bins 0 \
        --trend credit_score:loan_amount --json "$DATA/foldline.json" >/dev/null
    t1=$(now)
    $PY "$SHARED/peer_pandas_scan.py" --csv "$CSV" --outcome approved --exposure applicant_group \
        --pairs --slope credit_score:loan_amount --out "$DATA/peer.json" 2>/dev/null
    t2=$(now)
    fl_times+=("$(awk -v a="$t0" -v b="$t1" 'BEGIN { printf "%.4f", (b - a) / 1e9 }')")
    peer_times+=("$(awk -v a="$t1" -v b="$t2" 'BEGIN { printf "%.4f", (b - a) / 1e9 }')")
    printf 'run %d: foldline %.3f s, peer %.3f s\n' "$i" "${fl_times[-1]}" "${peer_times[-1]}" >&2
done

$PY - "$DATA/foldline.json" "$DATA/peer.json" "$CSV" "${fl_times[*]}" "${peer_times[*]}" <<'PYEOF'
import json, os, statistics, sys
fl, peer = json.load(open(sys.argv[1])), json.load(open(sys.argv[2]))
csv = sys.argv[3]
ft = [float(x) for x in sys.argv[4].split()]
pt = [float(x) for x in sys.argv[5].split()]
mf, mp = statistics.median(ft), statistics.median(pt)
# Which comparisons reverse: rate checks as sets of stratifier names, slope checks as names.
ours_rate = {frozenset(f["strata"]) for f in fl["findings"] if f["kind"] == "rate" and f["reversal"]}
ours_slope = {frozenset(f["strata"]) for f in fl["findings"] if f["kind"] == "slope" and f["reversal"]}
ours_checks = {frozenset(f["strata"]) for f in fl["findings"] if f["kind"] == "rate"}
s = peer["summary"]
peer_rate = {frozenset([c]) for c in s["single_reversals"]} | {frozenset(p) for p in s["pair_reversals"]}
peer_slope = {frozenset([r[2]]) for r in s["slope_reversals"]}
agree = ours_rate == peer_rate and ours_slope == peer_slope
print(f"file {csv}: {fl['data']['rows']} rows, {os.path.getsize(csv) / 1e6:.1f} MB")
print(f"checks: foldline {len(ours_checks)} rate + {sum(f['kind'] == 'slope' for f in fl['findings'])} slope; "
      f"peer {s['binary_checks']} rate + {s['slope_checks']} slope")
print(f"reversals: foldline {len(ours_rate)} rate, {len(ours_slope)} slope; peer {len(peer_rate)} rate, {len(peer_slope)} slope")
print(f"end to end, median of {len(ft)}: foldline {mf:.3f} s (min {min(ft):.3f}), peer {mp:.3f} s (min {min(pt):.3f})")
print(f"ratio peer / foldline: {mp / mf:.1f}x  (bar 20x, target 50x)")
print("agreement on which comparisons reverse: " + ("yes" if agree else "NO"))
if not agree:
    print("  only foldline:", sorted(map(sorted, (ours_rate - peer_rate) | (ours_slope - peer_slope))))
    print("  only peer:", sorted(map(sorted, (peer_rate - ours_rate) | (peer_slope - ours_slope))))
    sys.exit(1)
PYEOF
