#!/usr/bin/env bash
# Push-down scan vs export-to-CSV + local scan, on a generated table in a throwaway PostgreSQL
# cluster (127.0.0.1, temporary directory, stopped on exit). Never run by ctest.
#   bench/sql_bench.sh build/app/foldline [ROWS=1000000] [REPEATS=3]
# Prints the median seconds of each path and the bytes that leave the server: the cells
# (values + counts) for the push-down, the CSV text for the export.
set -euo pipefail
FOLDLINE=$(readlink -f "${1:?usage: bench/sql_bench.sh FOLDLINE [ROWS] [REPEATS]}")
ROWS=${2:-1000000}
REPEATS=${3:-3}
PGBIN=$(dirname "$(ls /usr/lib/postgresql/*/bin/initdb | sort | tail -1)")
DRIVER=$(ls /usr/lib/*/odbc/psqlodbcw.so | head -1)
WORK=$(mktemp -d /tmp/foldline-pgbench-XXXXXX)
chmod 755 "$WORK"
RUN=()
if [ "$(id -u)" -eq 0 ]; then RUN=(runuser -u nobody --); fi
mkdir -p "$WORK/data" "$WORK/run"
[ "$(id -u)" -eq 0 ] && chown nobody:nogroup "$WORK/data" "$WORK/run"
PORT=$(/usr/bin/python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1",0)); print(s.getsockname()[1])')
stop() { "${RUN[@]}" "$PGBIN/pg_ctl" -D "$WORK/data" -m immediate -w stop >/dev/null 2>&1 || true; rm -rf "$WORK"; }
trap stop EXIT
"${RUN[@]}" "$PGBIN/initdb" -D "$WORK/data" -U admin -A trust --no-sync -E UTF8 --locale C >/dev/null
"${RUN[@]}" "$PGBIN/pg_ctl" -D "$WORK/data" -l "$WORK/run/log" -w \
    -o "-c listen_addresses=127.0.0.1 -p $PORT -k $WORK/run -c fsync=off" start >/dev/null
PSQL=(psql -X -q -h 127.0.0.1 -p "$PORT" -U admin -d postgres -v ON_ERROR_STOP=1)
# Invented staffing data: hiring decisions by team, job family, site and tenure.
"${PSQL[@]}" -c "CREATE TABLE staffing AS
  SELECT CASE WHEN random() < 0.5 THEN 'north' ELSE 'south' END AS team,
         CASE WHEN random() < 0.3 THEN 'yes' ELSE 'no' END AS hired,
         (ARRAY['ops','eng','sales','care'])[1 + (i % 4)] AS job_family,
         (ARRAY['S1','S2','S3','S4','S5'])[1 + (i % 5)] AS site,
         (i % 7)::bigint AS tenure
  FROM generate_series(1, $ROWS) AS i"
"${PSQL[@]}" -c "VACUUM ANALYZE staffing"   # a settled table, as in a warehouse
CONN="odbc:Driver=$DRIVER;Server=127.0.0.1;Port=$PORT;Database=postgres;Uid=admin;"
Q=(--outcome hired=yes --exposure team=north,south --bootstrap 0)
median() { sort -n | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
push=() ; exp=()
for _ in $(seq "$REPEATS"); do
    t0=$(date +%s.%N)
    "$FOLDLINE" scan --source "$CONN" --table staffing "${Q[@]}" --json "$WORK/db.json" >/dev/null
    t1=$(date +%s.%N)
    "${PSQL[@]}" -c "\\copy staffing TO '$WORK/export.csv' WITH (FORMAT csv, HEADER true)"
    "$FOLDLINE" scan "$WORK/export.csv" "${Q[@]}" --json "$WORK/file.json" >/dev/null
    t2=$(date +%s.%N)
    push+=("$(echo "$t1 - $t0" | bc)"); exp+=("$(echo "$t2 - $t1" | bc)")
done
# Bytes of the cells as fetched: text values, then 8 bytes per number, count and first row.
read -r CELLS CELL_BYTES < <("${PSQL[@]}" -At -F ' ' -c "SELECT COUNT(*), SUM(octet_length(team) + octet_length(hired)
  + octet_length(job_family) + octet_length(site) + 24) FROM (SELECT team, hired, job_family, site, tenure
  FROM staffing GROUP BY team, hired, job_family, site, tenure) c")
echo "rows=$ROWS repeats=$REPEATS"
echo "push-down scan median_s=$(printf '%s\n' "${push[@]}" | median) cells=$CELLS cell_bytes=$CELL_BYTES"
echo "export+local scan median_s=$(printf '%s\n' "${exp[@]}" | median) csv_bytes=$(stat -c %s "$WORK/export.csv")"
/usr/bin/python3 - "$WORK/db.json" "$WORK/file.json" <<'EOF'
import json, sys
a, b = (json.load(open(p)) for p in sys.argv[1:])
a.pop("data"); b.pop("data")
print("findings identical:", a == b)
EOF
