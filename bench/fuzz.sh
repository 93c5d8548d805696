#!/usr/bin/env bash
# Builds the libFuzzer targets (tests/fuzz) with clang and runs each for a given time.
#   bench/fuzz.sh [SECONDS_PER_TARGET] [TARGET...]           explore: grow a local corpus
#   bench/fuzz.sh --smoke [SECONDS_PER_TARGET] [TARGET...]   CI check: fixed seed, scratch corpus
# SECONDS_PER_TARGET defaults to 600 (30 with --smoke). Targets: csv_reader project_file
# diagram_file rate_analysis slope_scan xlsx_reader row_filter (default: all). Each target starts from its committed
# seeds in tests/fuzz/corpus/<target>/, which are never rewritten: an exploring run keeps what
# it finds in build-fuzz/corpus/<target>/; a smoke run builds in build-fuzz-smoke (-O1, line
# tables only, to keep the build short), starts every target from an empty scratch corpus with
# -seed=1 and throws what it found away. Crashes are written to <build dir>/crashes/<target>/;
# the script exits non-zero when any target crashed, hung or ran out of memory. Needs clang-14,
# libclang-rt-14-dev and libfuzzer-14-dev (Debian packages).
set -euo pipefail
cd "$(dirname "$0")/.."
SMOKE=0
if [ "${1:-}" = "--smoke" ]; then
    SMOKE=1
    shift
fi
if [ "$SMOKE" -eq 1 ]; then SECONDS_PER_TARGET=${1:-30}; else SECONDS_PER_TARGET=${1:-600}; fi
shift || true
TARGETS=("$@")
[ ${#TARGETS[@]} -eq 0 ] && TARGETS=(csv_reader project_file diagram_file rate_analysis slope_scan xlsx_reader row_filter)
JOBS=${FOLDLINE_JOBS:-2}
CXX_FUZZ=${CXX_FUZZ:-clang++-14}
if [ "$SMOKE" -eq 1 ]; then
    DIR=${FOLDLINE_FUZZ_DIR:-build-fuzz-smoke}
    flags=(-DCMAKE_BUILD_TYPE=RelWithDebInfo "-DCMAKE_CXX_FLAGS_RELWITHDEBINFO=-O1 -gline-tables-only")
else
    DIR=${FOLDLINE_FUZZ_DIR:-build-fuzz}
    flags=(-DCMAKE_BUILD_TYPE=RelWithDebInfo)
fi

gen=()
command -v ninja >/dev/null && [ ! -f "$DIR/CMakeCache.txt" ] && gen=(-G Ninja)
cmake -S . -B "$DIR" "${gen[@]}" -DCMAKE_CXX_COMPILER="$CXX_FUZZ" "${flags[@]}" \
    -DFOLDLINE_FUZZ=ON -DFOLDLINE_BUILD_UI=OFF -DFOLDLINE_BUILD_TESTS=OFF -DFOLDLINE_BUILD_BENCH=OFF >/dev/null
cmake --build "$DIR" -j "$JOBS" --target $(printf 'fuzz_%s ' "${TARGETS[@]}")

export ASAN_OPTIONS=${ASAN_OPTIONS:-halt_on_error=1:print_stacktrace=1:detect_leaks=1}
export UBSAN_OPTIONS=${UBSAN_OPTIONS:-halt_on_error=1:print_stacktrace=1}
failed=0
for t in "${TARGETS[@]}"; do
    extra=()
    if [ "$SMOKE" -eq 1 ]; then
        corpus="$DIR/smoke-corpus/$t"
        rm -rf "$corpus"
        extra=(-seed="${FOLDLINE_FUZZ_SEED:-1}")
    else
        corpus="$DIR/corpus/$t"
    fi
    mkdir -p "$corpus" "$DIR/crashes/$t"
    log="$DIR/fuzz_$t.log"
    echo "fuzz.sh: $t for ${SECONDS_PER_TARGET}s (log $log)"
    rc=0
    "$DIR/tests/fuzz/fuzz_$t" -max_total_time="$SECONDS_PER_TARGET" -timeout=10 -rss_limit_mb=2048 \
        -max_len=65536 -print_final_stats=1 -artifact_prefix="$DIR/crashes/$t/" "${extra[@]}" \
        "$corpus" "tests/fuzz/corpus/$t" >"$log" 2>&1 || rc=$?
    # Summary: executions, coverage (edges) and features reached, corpus size.
    grep -E '^stat::(number_of_executed_units|average_exec_per_sec|peak_rss_mb)' "$log" | tr '\n' ' ' || true
    grep -E '#[0-9]+.*(DONE|pulse|NEW|REDUCE)' "$log" | tail -1 || true
    if [ "$rc" -ne 0 ]; then
        echo "fuzz.sh: $t FAILED (exit $rc); the end of $log follows, the input is in $DIR/crashes/$t/"
        tail -n 60 "$log"
        failed=1
    fi
done
exit "$failed"
