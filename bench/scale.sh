#!/usr/bin/env bash
# Scale benchmark (not a test): how time and memory grow with the rows (100 k, 1 M, 10 M) and with
# the candidates (12, 24, 48 at 1 M rows), and how soon the first finding exists at the largest
# size. Prints one table per part.
#
#   bench/scale.sh                 environment: SIZES="100000 1000000 10000000" RUNS=5 RUNS_BIG=3
#                                  PEER_RUNS=3 PEER_BIG=0 GROWTH="12 24 48" GROWTH_RUNS=3
#                                  DATA=/tmp/foldline_scale BUILD=build
#
# The question is compare.sh's: rate scan of approved by applicant_group (B against A) with every
# pair of candidates, 1,000 bootstrap resamples of flagged findings, plus the slope of loan_amount
# on credit_score within each candidate; the JSON document is written each run. Files come from
# the seeded generator in ../shared/bench (seed 42) and go to DATA, never the repository.
#
# Per size: the medians of RUNS runs of `foldline scan` (RUNS_BIG at 10 M rows and more) for the
# load (read and digest, from --timings), the scan (candidates, cubes, statistics, bootstrap,
# slopes) and end to end (process start to exit, timed outside); the peak resident memory of the
# process (getrusage of the child, the largest of its runs) and its ratio to the file size; the
# peer (../shared/bench/peer_pandas_scan.py) end to end, median of PEER_RUNS runs in the same
# benchmark run, and the ratio. The peer takes about 20 s per million rows, so at 10 M rows it is
# skipped unless PEER_BIG=1 (then run once); the table says which.
set -euo pipefail
cd "$(dirname "$0")/.."
PY=/usr/bin/python3
SHARED=${FOLDLINE_SHARED:-../shared/bench}
[ -d "$SHARED" ] || SHARED=../../shared/bench   # from a git worktree one level deeper
DATA=${DATA:-/tmp/foldline_scale}
BUILD=${BUILD:-build}
BIN=$BUILD/app/foldline
SIZES=${SIZES:-"100000 1000000 10000000"}
RUNS=${RUNS:-5}
RUNS_BIG=${RUNS_BIG:-3}
PEER_RUNS=${PEER_RUNS:-3}
PEER_BIG=${PEER_BIG:-0}
GROWTH=${GROWTH:-"12 24 48"}
GROWTH_RUNS=${GROWTH_RUNS:-3}
mkdir -p "$DATA"
[ -x "$BIN" ] || { echo "build first: cmake --build $BUILD --target foldline first_finding_bench" >&2; exit 2; }

gen() {  # rows, categorical columns, file
    if [ ! -s "$3" ]; then
        echo "generating $3" >&2
        $PY "$SHARED/gen_audit_data.py" --rows "$1" --seed 42 --strata-cols "$2" --out "$3.tmp" >/dev/null
        mv "$3.tmp" "$3"
    fi
}
file_for() {  # rows, categorical columns
    if [ "$2" = 12 ]; then echo "$DATA/audit_$1.csv"; else echo "$DATA/audit_$1_k$2.csv"; fi
}
median() { tr ' ' '\n' | grep -v '^$' | sort -g | awk '{ v[NR] = $1 } END { print (NR % 2) ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2 }'; }
maxof() { tr ' ' '\n' | grep -v '^$' | sort -g | tail -1; }

# One foldline run: prints "wall_s load_s scan_s peak_rss_kb cpu_s" (cpu = user + system, all threads).
foldline_run() {
    local csv=$1 log="$DATA/run.log"
    /usr/bin/time -f "TIME %e %M %U %S" "$BIN" scan "$csv" --outcome approved=1 --exposure applicant_group=B,A --bins 0 \
        --trend credit_score:loan_amount --json "$DATA/foldline.json" --timings >/dev/null 2>"$log"
    awk '/^timing_s/ { for (i = 2; i <= NF; ++i) { split($i, kv, "="); t[kv[1]] = kv[2] } }
         /^TIME/ { w = $2; m = $3; c = $4 + $5 }
         END { print w, t["load"], t["scan"], m, c }' "$log"
}

echo "load average at start: $(cut -d' ' -f1-3 /proc/loadavg); $(nproc) cores"
rows_table=()
for rows in $SIZES; do
    csv=$(file_for "$rows" 12)
    gen "$rows" 12 "$csv"
    n=$RUNS
    [ "$rows" -ge 10000000 ] && n=$RUNS_BIG
    walls=() loads=() scans=() rss=() cpus=()
    for i in $(seq "$n"); do
        read -r w l s m c < <(foldline_run "$csv")
        walls+=("$w") loads+=("$l") scans+=("$s") rss+=("$m") cpus+=("$c")
        echo "  $rows rows, run $i: end to end $w s, load $l s, scan $s s, peak RSS $((m / 1024)) MB, cpu $c s" >&2
    done
    pn=$PEER_RUNS
    if [ "$rows" -ge 10000000 ]; then pn=$([ "$PEER_BIG" = 1 ] && echo 1 || echo 0); fi
    peers=()
    for i in $(seq "$pn"); do
        t0=$(date +%s%N)
        $PY "$SHARED/peer_pandas_scan.py" --csv "$csv" --outcome approved --exposure applicant_group \
            --pairs --slope credit_score:loan_amount --out "$DATA/peer.json" 2>/dev/null
        t1=$(date +%s%N)
        peers+=("$(awk -v a="$t0" -v b="$t1" 'BEGIN { printf "%.3f", (b - a) / 1e9 }')")
        echo "  $rows rows, peer run $i: ${peers[-1]} s" >&2
    done
    bytes=$(stat -L -c %s "$csv")
    mw=$(echo "${walls[*]}" | median)
    ml=$(echo "${loads[*]}" | median)
    ms=$(echo "${scans[*]}" | median)
    mr=$(echo "${rss[*]}" | maxof)
    mc=$(echo "${cpus[*]}" | median)
    if [ "$pn" -gt 0 ]; then mp=$(echo "${peers[*]}" | median); else mp=-; fi
    rows_table+=("$rows $bytes $ml $ms $mw $mr $n $mp $pn $mc")
done

echo
echo "Rows: foldline scan (rate scan with pairs and 1,000 resamples, slope checks, JSON written);"
echo "medians of the runs shown; peak RSS is the largest of the runs; peer = pandas/statsmodels script."
printf '%-11s %9s %8s %8s %11s %8s %9s %8s %5s %12s %8s\n' rows "file MB" "load s" "scan s" "end-end s" "cpu s" "RSS MB" "RSS/file" runs "peer s (n)" "peer/fl"
for r in "${rows_table[@]}"; do
    read -r rows bytes ml ms mw mr n mp pn mc <<<"$r"
    awk -v rows="$rows" -v b="$bytes" -v l="$ml" -v s="$ms" -v w="$mw" -v m="$mr" -v n="$n" -v p="$mp" -v pn="$pn" -v c="$mc" 'BEGIN {
        peer = p == "-" ? "skipped" : sprintf("%.2f (%d)", p, pn)
        ratio = p == "-" ? "-" : sprintf("%.1fx", p / w)
        printf "%-11s %9.1f %8.3f %8.3f %11.3f %8.3f %9.0f %7.2fx %5d %12s %8s\n", rows, b / 1e6, l, s, w, c, m * 1024 / 1e6, m * 1024 / b, n, peer, ratio
    }'
done
echo "(peer at 10 M rows: $([ "$PEER_BIG" = 1 ] && echo "one run" || echo "skipped, about 20 s per million rows; PEER_BIG=1 runs it once"))"

# Candidate growth at 1 M rows: more categorical columns from the same generator.
echo
echo "Candidates at 1,000,000 rows (extra noise columns from gen_audit_data.py --strata-cols K; medians of $GROWTH_RUNS):"
printf '%-11s %8s %12s %8s %11s %14s %9s\n' candidates pairs "rate checks" "scan s" "end-end s" "scan ms/check" "RSS MB"
for k in $GROWTH; do
    csv=$(file_for 1000000 "$k")
    gen 1000000 "$k" "$csv"
    walls=() scans=() rss=()
    for i in $(seq "$GROWTH_RUNS"); do
        read -r w l s m c < <(foldline_run "$csv")
        walls+=("$w") scans+=("$s") rss+=("$m")
    done
    counts=$($PY -c 'import json, sys
d = json.load(open(sys.argv[1]))
r = [f for f in d["findings"] if f["kind"] == "rate"]
print(len([f for f in r if len(f["strata"]) == 1]), len([f for f in r if len(f["strata"]) == 2]), len(r))' "$DATA/foldline.json")
    read -r singles pairs checks <<<"$counts"
    awk -v c="$singles" -v p="$pairs" -v k="$checks" -v s="$(echo "${scans[*]}" | median)" \
        -v w="$(echo "${walls[*]}" | median)" -v m="$(echo "${rss[*]}" | maxof)" 'BEGIN {
        printf "%-11d %8d %12d %8.3f %11.3f %14.2f %9.0f\n", c, p, k, s, w, 1000 * s / k, m * 1024 / 1e6 }'
done

echo "Pairs grow as k (k - 1) / 2. Each check costs one pass over one-byte code arrays (no rows are"
echo "re-read as text); the pairs of one candidate with up to 8 later ones share one fused pass that"
echo "combines the first code with the row's cell once; cubes and bootstrap run on every core; so the"
echo "time per check stays about flat while the checks grow (scan ms/check above)."

# Time to the first finding at the largest size, on the workbench's path (read, select, scan
# with a per-finding callback).
big=$(echo "$SIZES" | tr ' ' '\n' | sort -g | tail -1)
ff=$BUILD/bench/first_finding_bench
if [ -x "$ff" ]; then
    echo
    echo "First finding at $big rows (first_finding_bench, 1 run):"
    "$ff" "$(file_for "$big" 12)" --runs 1 | sed 's/^/  /'
fi
echo "load average at end: $(cut -d' ' -f1-3 /proc/loadavg)"
