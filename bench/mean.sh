#!/usr/bin/env bash
# The mean-gap scan against the pandas peer (../shared/bench/peer_pandas_scan.py --mean Y) and
# against Foldline's own rate scan on the same file: both scans answer their questions over every
# candidate and every pair, interleaved, RUNS times each; prints medians and ratios, and whether
# Foldline and the peer agree on which checks change sign under stratification.
#
#   bench/mean.sh [ROWS] [RUNS]        (defaults 1000000 and 5)
#
# Questions: mean of `income` by applicant_group (B against A), and for the scan-time ratio the
# rate of approved = 1 by the same groups; --bins 0 so that, like the peer, continuous numeric
# columns are left out of the candidates. Data go to $DATA (default: a folder under /tmp).
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
secs() { awk -v a="$1" -v b="$2" 'BEGIN { printf "%.4f", (b - a) / 1e9 }'; }
scan_time() { sed -n 's/.*scan=\([0-9.]*\).*/\1/p' "$1"; }
fl=(); peer=(); mean_scan=(); rate_scan=()
for i in $(seq "$RUNS"); do
    t0=$(now)
    "$BIN" scan "$CSV" --mean income --exposure applicant_group=B,A --bins 0 --timings \
        --json "$DATA/foldline_mean.json" >/dev/null 2>"$DATA/mean_timings.txt"
    t1=$(now)
    $PY "$SHARED/peer_pandas_scan.py" --csv "$CSV" --mean income --exposure applicant_group \
        --pairs --out "$DATA/peer_mean.json" 2>/dev/null
    t2=$(now)
    "$BIN" scan "$CSV" --outcome approved=1 --exposure applicant_group=B,A --bins 0 --bootstrap 0 --timings \
        --json "$DATA/foldline_rate.json" >/dev/null 2>"$DATA/rate_timings.txt"
    fl+=("$(secs "$t0" "$t1")"); peer+=("$(secs "$t1" "$t2")")
    mean_scan+=("$(scan_time "$DATA/mean_timings.txt")"); rate_scan+=("$(scan_time "$DATA/rate_timings.txt")")
    printf 'run %d: foldline %.3f s (scan %s s), peer %.3f s, rate scan %s s\n' "$i" "${fl[-1]}" "${mean_scan[-1]}" \
        "${peer[-1]}" "${rate_scan[-1]}" >&2
done

$PY - "$DATA/foldline_mean.json" "$DATA/peer_mean.json" "${fl[*]}" "${peer[*]}" "${mean_scan[*]}" "${rate_scan[*]}" <<'PYEOF'
import json, statistics, sys
ours, peer = json.load(open(sys.argv[1])), json.load(open(sys.argv[2]))
fl, pe, ms, rs = ([float(x) for x in a.split()] for a in sys.argv[3:7])
med = statistics.median
checks = [f for f in ours["findings"] if f["kind"] == "mean"]
flips = {frozenset(f["strata"]) for f in checks if f["direction_flip"]}
s = peer["summary"]
peer_flips = {frozenset([c]) for c in s["single_reversals"]} | {frozenset(p) for p in s["pair_reversals"]}
print(f"checks: foldline {len(checks)}, peer {s['mean_checks']}; sign changes: foldline {len(flips)}, peer {len(peer_flips)}")
print(f"end to end, median of {len(fl)}: foldline {med(fl):.3f} s (min {min(fl):.3f}), peer {med(pe):.3f} s (min {min(pe):.3f})")
print(f"ratio peer / foldline: {med(pe) / med(fl):.1f}x  (target >= 20x)")
print(f"scan time, median: mean scan {med(ms):.3f} s, rate scan {med(rs):.3f} s, ratio {med(ms) / med(rs):.2f}  (target <= 1.5)")
agree = flips == peer_flips
print("agreement on which checks change sign: " + ("yes" if agree else "NO"))
if not agree:
    print("  only foldline:", sorted(map(sorted, flips - peer_flips)))
    print("  only peer:", sorted(map(sorted, peer_flips - flips)))
PYEOF
