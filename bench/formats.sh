#!/bin/sh
# Reader benchmark per file format (not a test): writes one invented table of ROWS rows
# (default 60,000: an .xls sheet holds at most 65,536 rows) as CSV, then as SAS transport v5,
# SAS data set, SPSS .sav, Stata .dta (R's haven), .xlsx (openpyxl) and .xls (xlwt), and reads
# each REPEAT times (default 5) in one process with `foldline_load_bench FILE --reader any`
# (read_table, the entry point of every front end; THREADS reader threads, default 1, so every
# format gets the same single core). Prints per format the file size, the median wall and cpu
# time per read, MB/s of the file's own bytes, rows/s, and the wall-time ratio to the CSV path
# on the same data. Needs r-cran-haven, python3-openpyxl and python3-xlwt.
# Usage: bench/formats.sh     (environment: ROWS=60000 REPEAT=5 THREADS=1 BUILD=dir DATA=dir)
set -eu
here=$(cd "$(dirname "$0")" && pwd)
repo=$(cd "$here/.." && pwd)
rows=${ROWS:-60000}
repeat=${REPEAT:-5}
threads=${THREADS:-1}
build=${BUILD:-$repo/build}
data=${DATA:-$(mktemp -d)}
py=/usr/bin/python3

"$py" - "$data" "$rows" <<'PY'
import csv, datetime, random, sys
out, n = sys.argv[1], int(sys.argv[2])
rnd = random.Random(7)
with open(f"{out}/bench.csv", "w", newline="", encoding="utf-8") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["branch", "segment", "approved", "amount", "score", "opened", "note"])
    for i in range(n):
        w.writerow([f"branch_{rnd.randrange(40)}", rnd.choice(["retail", "small business", "agri"]),
                    rnd.choice(["yes", "no"]), round(rnd.uniform(500, 90000), 2), rnd.randrange(300, 850),
                    (datetime.date(2020, 1, 1) + datetime.timedelta(days=rnd.randrange(1500))).isoformat(),
                    "" if rnd.random() < 0.7 else rnd.choice(["Zürich desk", "São Paulo desk", "follow up"])])
PY
Rscript -e 'suppressMessages(library(haven)); a <- commandArgs(TRUE); d <- read.csv(file.path(a[1], "bench.csv"), encoding = "UTF-8", na.strings = ""); d$opened <- as.Date(d$opened); write_xpt(d, file.path(a[1], "bench.xpt"), version = 5); suppressWarnings(write_sas(d, file.path(a[1], "bench.sas7bdat"))); write_sav(d, file.path(a[1], "bench.sav")); write_dta(d, file.path(a[1], "bench.dta"))' "$data"
"$py" - "$data" <<'PY'
import csv, datetime, sys
import openpyxl, xlwt
out = sys.argv[1]
rows = list(csv.reader(open(f"{out}/bench.csv", encoding="utf-8")))
def typed(r):
    return [r[0], r[1], r[2], float(r[3]), int(r[4]), datetime.date.fromisoformat(r[5]), r[6] or None]
wb = openpyxl.Workbook(write_only=True)
ws = wb.create_sheet("data")
ws.append(rows[0])
for r in rows[1:]:
    ws.append(typed(r))
wb.save(f"{out}/bench.xlsx")
wb = xlwt.Workbook(encoding="utf-8")
ws = wb.add_sheet("data")
style = xlwt.easyxf(num_format_str="YYYY-MM-DD")
for j, v in enumerate(rows[0]):
    ws.write(0, j, v)
for i, r in enumerate(rows[1:], start=1):
    for j, v in enumerate(typed(r)):
        if v is None:
            continue
        if isinstance(v, datetime.date):
            ws.write(i, j, datetime.datetime(v.year, v.month, v.day), style)
        else:
            ws.write(i, j, v)
wb.save(f"{out}/bench.xls")
PY

"$py" - "$build/bench/foldline_load_bench" "$data" "$rows" "$repeat" "$threads" <<'PY'
import os, subprocess, sys
exe, data, rows, repeat, threads = sys.argv[1], sys.argv[2], int(sys.argv[3]), sys.argv[4], sys.argv[5]
def run(path):
    out = subprocess.run([exe, path, "--repeat", repeat, "--threads", threads, "--reader", "any"], check=True,
                         capture_output=True, text=True).stdout
    kv = dict(line.split(" ", 1) for line in out.splitlines())
    if int(kv["rows"]) != rows:
        sys.exit(f"{path}: read {kv['rows']} rows, expected {rows}")
    return float(kv["median_s"]), float(kv["cpu_s_per_run"])
print(f"{rows} rows, 7 columns, medians of {repeat} reads in one process, {threads} reader thread(s); "
      f"load average {os.getloadavg()[0]:.2f}")
print(f"{'format':10} {'MB':>7} {'wall s':>8} {'cpu s':>7} {'MB/s':>7} {'rows/s':>10} {'wall / CSV':>10}")
base = None
for ext in ["csv", "xpt", "sas7bdat", "sav", "dta", "xlsx", "xls"]:
    path = f"{data}/bench.{ext}"
    mb = os.path.getsize(path) / 1e6
    wall, cpu = run(path)
    base = base or wall
    print(f"{ext:10} {mb:7.2f} {wall:8.3f} {cpu:7.3f} {mb / wall:7.1f} {rows / wall:10.0f} {wall / base:9.2f}x")
print(f"load average after: {os.getloadavg()[0]:.2f}")
PY
