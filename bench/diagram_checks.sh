#!/usr/bin/env bash
# Diagram checks benchmark (not a test): how long `foldline adjust DIAGRAM --data FILE` takes to
# list and test every claim of a diagram, on the three samples and on 1 M rows.
#
#   bench/diagram_checks.sh        environment: RUNS=5 ROWS=1000000 DATA=/tmp/foldline_scale BUILD=build
#
# Samples: sample_data/NAME.diagram.json against NAME.csv. At ROWS rows: the seeded file of
# ../shared/bench/gen_audit_data.py (seed 42, 12 categorical columns; the file scale.sh uses),
# with a diagram of our own written to DATA (11 observed columns, 36 claims: G² with cut numeric
# columns and partial correlations). Per case the median of RUNS runs of the whole command
# (process start to exit: reading the CSV, listing and testing the claims) and, for the large
# file, the median load time of the same reader (`scan --timings`, load = read and digest), so
# the checks' own share is the difference. Files go to DATA, never the repository.
set -euo pipefail
cd "$(dirname "$0")/.."
PY=/usr/bin/python3
SHARED=${FOLDLINE_SHARED:-../shared/bench}
[ -d "$SHARED" ] || SHARED=../../shared/bench
DATA=${DATA:-/tmp/foldline_scale}
BUILD=${BUILD:-build}
BIN=$BUILD/app/foldline
RUNS=${RUNS:-5}
ROWS=${ROWS:-1000000}
mkdir -p "$DATA"
[ -x "$BIN" ] || { echo "build first: cmake --build $BUILD --target foldline" >&2; exit 2; }
median() { tr ' ' '\n' | grep -v '^$' | sort -g | awk '{ v[NR] = $1 } END { print (NR % 2) ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2 }'; }

csv="$DATA/audit_$ROWS.csv"
if [ ! -s "$csv" ]; then
    echo "generating $csv" >&2
    $PY "$SHARED/gen_audit_data.py" --rows "$ROWS" --seed 42 --strata-cols 12 --out "$csv.tmp" >/dev/null
    mv "$csv.tmp" "$csv"
fi
diagram="$DATA/bench.diagram.json"
$PY - "$diagram" <<'PY'
import json, sys
nodes = ["applicant_group", "segment", "product", "region", "branch", "channel", "income", "credit_score",
         "loan_amount", "approved", "employment_type"]
edges = [("segment", "product"), ("applicant_group", "product"), ("segment", "approved"), ("product", "approved"),
         ("applicant_group", "approved"), ("region", "branch"), ("branch", "approved"), ("employment_type", "income"),
         ("income", "loan_amount"), ("income", "credit_score"), ("credit_score", "approved"), ("product", "loan_amount"),
         ("channel", "approved")]
json.dump({"format": "foldline-diagram", "version": 1, "nodes": [{"name": n, "observed": True} for n in nodes],
           "edges": [{"from": a, "to": b} for a, b in edges], "exposure": "applicant_group", "outcome": "approved"},
          open(sys.argv[1], "w"), indent=1)
PY

time_adjust() {  # diagram, data → wall seconds
    /usr/bin/time -f "%e" "$BIN" adjust "$1" --data "$2" >/dev/null 2>"$DATA/dc_time.log"
    tail -1 "$DATA/dc_time.log"
}
echo "load average at start: $(cut -d' ' -f1-3 /proc/loadavg); $(nproc) cores"
echo "| data | rows | claims (tested, contradicted) | adjust --data, median of $RUNS |"
echo "|---|---|---|---|"
for name in lender_approvals clinic_outcomes retail_weeks; do
    d=sample_data/$name.diagram.json f=sample_data/$name.csv
    walls=()
    for _ in $(seq "$RUNS"); do walls+=("$(time_adjust "$d" "$f")"); done
    claims=$("$BIN" adjust "$d" --data "$f" | sed -n 's/.*(\([0-9]* claims, [0-9]* tested, [0-9]* contradicted\).*/\1/p')
    echo "| $name | $(($(wc -l <"$f") - 1)) | $claims | $(echo "${walls[*]}" | median) s |"
done
walls=() loads=()
for _ in $(seq "$RUNS"); do
    walls+=("$(time_adjust "$diagram" "$csv")")
    loads+=("$("$BIN" scan "$csv" --outcome approved=1 --exposure applicant_group=B,A --strata product --bins 0 \
        --timings 2>&1 >/dev/null | sed -n 's/^timing_s load=\([0-9.]*\).*/\1/p')")
done
claims=$("$BIN" adjust "$diagram" --data "$csv" | sed -n 's/.*(\([0-9]* claims, [0-9]* tested, [0-9]* contradicted\).*/\1/p')
echo "| audit_$ROWS.csv (bench diagram) | $ROWS | $claims | $(echo "${walls[*]}" | median) s (load alone $(echo "${loads[*]}" | median) s) |"
echo "load average at end: $(cut -d' ' -f1-3 /proc/loadavg)"
