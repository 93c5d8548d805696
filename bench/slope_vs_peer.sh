#!/bin/sh
# Side-by-side: the slope scan against the pandas peer's slope check (../shared/bench/), on the
# same generated file, in one run. Usage: bench/slope_vs_peer.sh BUILD_DIR [ROWS] [RUNS]
# Needs Debian's /usr/bin/python3 with numpy, pandas and statsmodels. The data go to a
# temporary folder that is removed at the end.
set -eu
BUILD=${1:?build directory}
ROWS=${2:-1000000}
RUNS=${3:-5}
# The peer lives in ../shared/bench beside the repository (one level further up from a worktree).
PEER=${FOLDLINE_SHARED:-}
for d in "$(dirname "$0")/../../shared/bench" "$(dirname "$0")/../../../shared/bench"; do
    [ -n "$PEER" ] || { [ -f "$d/peer_pandas_scan.py" ] && PEER=$(cd "$d" && pwd); }
done
[ -n "$PEER" ] || { echo "peer scripts not found: set FOLDLINE_SHARED" >&2; exit 2; }
DATA=$(mktemp -d)
trap 'rm -rf "$DATA"' EXIT
/usr/bin/python3 "$PEER/gen_audit_data.py" --rows "$ROWS" --seed 42 --out "$DATA/audit.csv" >/dev/null
i=0
while [ $i -lt "$RUNS" ]; do
  /usr/bin/python3 "$PEER/peer_pandas_scan.py" --csv "$DATA/audit.csv" --outcome approved \
      --exposure applicant_group --no-pairs --slope credit_score:loan_amount \
      --out "$DATA/peer.json" 2>&1 >/dev/null | sed -n 's/^timing_s /peer /p' | tee -a "$DATA/peer.txt"
  i=$((i + 1))
done
"$BUILD/bench/slope_bench" --csv "$DATA/audit.csv" --x credit_score --y loan_amount --no-pairs \
    --runs "$RUNS" | tee "$DATA/singles.txt"
"$BUILD/bench/slope_bench" --csv "$DATA/audit.csv" --x credit_score --y loan_amount \
    --runs "$RUNS" | tee "$DATA/all.txt"
# Median of the peer's slope phase (its 12 single-stratifier slope checks) against ours.
peer=$(sed -n 's/.* slope=\([0-9.]*\).*/\1/p' "$DATA/peer.txt" | sort -n | awk '{v[NR]=$1} END {print v[int((NR+1)/2)]}')
ours=$(sed -n 's/.*scan_median_s=\([0-9.]*\).*/\1/p' "$DATA/singles.txt")
all=$(sed -n 's/.*scan_median_s=\([0-9.]*\).*/\1/p' "$DATA/all.txt")
awk -v p="$peer" -v o="$ours" -v a="$all" 'BEGIN {
  printf "ratio peer_slope_median_s=%s foldline_singles_median_s=%s speedup=%.1fx\n", p, o, p / o
  printf "ratio foldline_singles_and_pairs_median_s=%s speedup_vs_peer_singles=%.1fx\n", a, p / a }'
