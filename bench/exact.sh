#!/usr/bin/env bash
# Exact-test benchmark (not a test): what the small-count rules and the exact tests cost on the
# sample files, on a seeded 1,000,000-row file and on published small tables. Prints one table.
#
#   bench/exact.sh         environment: RUNS=5 BUILD=build DATA=/tmp/foldline_scale
#
# Per file (bench/exact_bench.cpp, medians of RUNS runs): the rate scan without bootstrap (the
# small-count rules included), the rules alone over every finding, and the exact conditional test
# and Zelen's test forced on every finding (computed, or above the limits of
# core/stats/exact_stratified.h / exact_homogeneity.h). The 1 M-row file is
# ../shared/bench/gen_audit_data.py --rows 1000000 --seed 42 (compare.sh's question), written to
# DATA, never the repository; an existing file of that name is reused.
set -euo pipefail
cd "$(dirname "$0")/.."
PY=/usr/bin/python3
SHARED=${FOLDLINE_SHARED:-../shared/bench}
[ -d "$SHARED" ] || SHARED=../../shared/bench   # from a git worktree one level deeper
BUILD=${BUILD:-build}
RUNS=${RUNS:-5}
DATA=${DATA:-/tmp/foldline_scale}
BIN=$BUILD/bench/exact_bench
[ -x "$BIN" ] || { echo "build first: cmake --build $BUILD --target exact_bench" >&2; exit 2; }
mkdir -p "$DATA"
big=$DATA/audit_1000000.csv
if [ ! -s "$big" ]; then
    echo "generating $big" >&2
    $PY "$SHARED/gen_audit_data.py" --rows 1000000 --seed 42 --strata-cols 12 --out "$big.tmp" >/dev/null
    mv "$big.tmp" "$big"
fi

echo "Exact tests, $(date -u +%Y-%m-%d), commit $(git rev-parse --short HEAD), load average $(cut -d' ' -f1 /proc/loadavg), medians of $RUNS runs"
echo
echo "| file | rows | findings | small-count flags | rate scan (no bootstrap) | small-count rules, all findings | exact test forced on every finding | Zelen forced on every finding |"
echo "|---|---|---|---|---|---|---|---|"
row() {  # label, file, outcome, exposure
    printf '| %s ' "$1"
    "$BIN" "$2" --outcome "$3" --exposure "$4" --runs "$RUNS"
}
row "lender sample" sample_data/lender_approvals.csv approved=1 applicant_group=B,A
row "clinic sample" sample_data/clinic_outcomes.csv recovered=yes treatment=new_protocol,standard
row "1 M rows (seed 42)" "$big" approved=1 applicant_group=B,A
echo
"$BIN" --tables --runs "$RUNS"
