#!/usr/bin/env bash
# Builds the libFuzzer targets (tests/fuzz) with clang and runs each for a given time.
#   bench/fuzz.sh [SECONDS_PER_TARGET] [TARGET...]
# SECONDS_PER_TARGET defaults to 600. Targets: csv_reader project_file diagram_file
# rate_analysis (default: all). Each target starts from its committed seeds in
# tests/fuzz/corpus/<target>/ and keeps what it finds in build-fuzz/corpus/<target>/ (the
# committed seeds are never rewritten). Crashes are written to build-fuzz/crashes/<target>/;
# the script exits non-zero when any target crashed. Needs clang-14, libclang-rt-14-dev and
# libfuzzer-14-dev (Debian packages).
set -euo pipefail
cd "$(dirname "$0")/.."
SECONDS_PER_TARGET=${1:-600}
shift || true
TARGETS=("$@")
[ ${#TARGETS[@]} -eq 0 ] && TARGETS=(csv_reader project_file diagram_file rate_analysis)
DIR=${FOLDLINE_FUZZ_DIR:-build-fuzz}
JOBS=${FOLDLINE_JOBS:-2}
CXX_FUZZ=${CXX_FUZZ:-clang++-14}

gen=()
command -v ninja >/dev/null && [ ! -f "$DIR/CMakeCache.txt" ] && gen=(-G Ninja)
cmake -S . -B "$DIR" "${gen[@]}" -DCMAKE_CXX_COMPILER="$CXX_FUZZ" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
    -DFOLDLINE_FUZZ=ON -DFOLDLINE_BUILD_UI=OFF -DFOLDLINE_BUILD_TESTS=OFF -DFOLDLINE_BUILD_BENCH=OFF >/dev/null
cmake --build "$DIR" -j "$JOBS" --target $(printf 'fuzz_%s ' "${TARGETS[@]}")

export ASAN_OPTIONS=${ASAN_OPTIONS:-halt_on_error=1:print_stacktrace=1:detect_leaks=1}
export UBSAN_OPTIONS=${UBSAN_OPTIONS:-halt_on_error=1:print_stacktrace=1}
failed=0
for t in "${TARGETS[@]}"; do
    mkdir -p "$DIR/corpus/$t" "$DIR/crashes/$t"
    log="$DIR/fuzz_$t.log"
    echo "fuzz.sh: $t for ${SECONDS_PER_TARGET}s (log $log)"
    rc=0
    "$DIR/tests/fuzz/fuzz_$t" -max_total_time="$SECONDS_PER_TARGET" -timeout=10 -rss_limit_mb=2048 \
        -max_len=65536 -print_final_stats=1 -artifact_prefix="$DIR/crashes/$t/" \
        "$DIR/corpus/$t" "tests/fuzz/corpus/$t" >"$log" 2>&1 || rc=$?
    # Summary: executions, coverage (edges) and features reached, corpus size.
    grep -E '^stat::(number_of_executed_units|average_exec_per_sec|peak_rss_mb)' "$log" | tr '\n' ' ' || true
    grep -E '#[0-9]+.*(DONE|pulse|NEW|REDUCE)' "$log" | tail -1 || true
    if [ "$rc" -ne 0 ]; then
        echo "fuzz.sh: $t FAILED (exit $rc); see $log and $DIR/crashes/$t/"
        failed=1
    fi
done
exit "$failed"
