#!/bin/sh
# Load benchmark (not a test): generates the 1,000,000-row synthetic audit CSV, times the
# Foldline reader on it 5 times (median MB/s, rows/s, peak RSS), then times pandas' read_csv on
# the same file 5 times in the same run and prints the median ratio.
#
# Usage: bench/load.sh            (environment: ROWS=1000000 DATA=dir BUILD=dir SHARED=dir)
# The data file is kept outside the repository (DATA, default a temporary folder).
set -eu

here=$(cd "$(dirname "$0")" && pwd)
repo=$(cd "$here/.." && pwd)
rows=${ROWS:-1000000}
repeat=5
py=/usr/bin/python3
build=${BUILD:-$repo/build}

# The shared generator lives next to the repository: ../shared/bench.
shared=${SHARED:-$repo/../shared/bench}
[ -f "$shared/gen_audit_data.py" ] || shared=$repo/../../shared/bench
if [ ! -f "$shared/gen_audit_data.py" ]; then
  echo "load.sh: cannot find gen_audit_data.py in ../shared/bench (set SHARED=dir)" >&2
  exit 2
fi

if ! "$py" -c "import pandas, numpy" 2>/dev/null; then
  echo "== installing python3-pandas (needs root)"
  apt-get install -y python3-pandas
fi

DATA=${DATA:-$(mktemp -d)}
mkdir -p "$DATA"
if [ "$rows" = 1000000 ]; then file=$DATA/audit_1m.csv; else file=$DATA/audit_$rows.csv; fi
if [ ! -s "$file" ]; then
  echo "== generating $rows rows into $file"
  "$py" "$shared/gen_audit_data.py" --rows "$rows" --seed 42 --out "$file" > /dev/null
fi

if [ ! -f "$build/CMakeCache.txt" ]; then
  echo "== configuring $build (Release, no workbench)"
  cmake -S "$repo" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Release -DFOLDLINE_BUILD_UI=OFF > /dev/null
fi
echo "== building foldline_load_bench"
cmake --build "$build" -j2 --target foldline_load_bench > /dev/null

echo "== foldline reader, $repeat runs"
fl_out=$("$build/bench/foldline_load_bench" "$file" --repeat "$repeat")
echo "$fl_out"

# Peak memory of one load in a fresh process (repeated loads in one process add allocator
# retention that a single open in the workbench does not have).
fl_rss=$("$build/bench/foldline_load_bench" "$file" --repeat 1 | awk '$1 == "peak_rss_bytes" { print $2 }')

echo "== pandas read_csv, $repeat runs"
pd_out=$("$py" - "$file" "$repeat" <<'PY'
import resource, statistics, sys, time
import pandas as pd
path, repeat = sys.argv[1], int(sys.argv[2])
runs = []
for _ in range(repeat):
    t0 = time.perf_counter()
    df = pd.read_csv(path)
    runs.append(time.perf_counter() - t0)
    rows = len(df)
    del df
print("runs_s " + " ".join("%.4f" % r for r in runs))
print("median_s %.4f" % statistics.median(runs))
print("rows %d" % rows)
print("pandas_version %s" % pd.__version__)
PY
)
pd_rss=$("$py" -c 'import resource, sys, pandas as pd
df = pd.read_csv(sys.argv[1])
print(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024)' "$file")
echo "$pd_out"

value() { echo "$1" | awk -v k="$2" '$1 == k { print $2 }'; }
fl_med=$(value "$fl_out" median_s)
pd_med=$(value "$pd_out" median_s)
bytes=$(value "$fl_out" file_bytes)
echo "== summary ($rows rows, $(awk -v b="$bytes" 'BEGIN { printf "%.1f MB", b / 1e6 }'))"
awk -v f="$fl_med" -v p="$pd_med" -v b="$bytes" -v r="$fl_rss" -v pr="$pd_rss" -v n="$rows" 'BEGIN {
  printf "foldline  median %.3f s  %.0f MB/s  %.0f rows/s  peak RSS of one load %.0f MB (%.2f x file)\n", f, b / 1e6 / f, n / f, r / 1e6, r / b
  printf "pandas    median %.3f s  %.0f MB/s  %.0f rows/s  peak RSS of one load %.0f MB (%.2f x file)\n", p, b / 1e6 / p, n / p, pr / 1e6, pr / b
  printf "speed-up  %.1f x (pandas median / foldline median)\n", p / f
}'
