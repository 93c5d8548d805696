#!/usr/bin/env bash
# Push-down scan vs export-to-CSV + local scan, on a generated table in a throwaway PostgreSQL
# cluster (127.0.0.1, temporary directory, stopped on exit). Never run by ctest.
#   bench/sql_bench.sh build/app/foldline [ROWS=1000000] [REPEATS=5]
# Prints the median seconds of each path over REPEATS runs, and the bytes each path moves over
# the wire in each direction (counted by a relay between client and server, in a separate run so
# the relay does not slow the timed ones):
#   push-down          the scan's statements (describe, the row-id check and EXPLAIN estimate
#                      on PostgreSQL, profile, one GROUPING SETS query)
#   push-down, tuned   the same with work_mem = 256MB and two parallel workers per query,
#                      set for the role (every session of the scan gets them)
#   export + local     psql \copy of the table to CSV, then foldline scan of the file
set -euo pipefail
FOLDLINE=$(readlink -f "${1:?usage: bench/sql_bench.sh FOLDLINE [ROWS] [REPEATS]}")
ROWS=${2:-1000000}
REPEATS=${3:-5}
PGBIN=$(dirname "$(ls /usr/lib/postgresql/*/bin/initdb | sort | tail -1)")
DRIVER=$(ls /usr/lib/*/odbc/psqlodbcw.so | head -1)
WORK=$(mktemp -d /tmp/foldline-pgbench-XXXXXX)
chmod 755 "$WORK"
RUN=()
if [ "$(id -u)" -eq 0 ]; then RUN=(runuser -u nobody --); fi
mkdir -p "$WORK/data" "$WORK/run"
[ "$(id -u)" -eq 0 ] && chown nobody:nogroup "$WORK/data" "$WORK/run"
free_port() { /usr/bin/python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1",0)); print(s.getsockname()[1])'; }
PORT=$(free_port)
RELAY_PORT=$(free_port)
RELAY_PID=
stop() {
    [ -n "$RELAY_PID" ] && kill "$RELAY_PID" 2>/dev/null || true
    "${RUN[@]}" "$PGBIN/pg_ctl" -D "$WORK/data" -m immediate -w stop >/dev/null 2>&1 || true
    rm -rf "$WORK"
}
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
conn() { echo "odbc:Driver=$DRIVER;Server=127.0.0.1;Port=$1;Database=postgres;Uid=admin;"; }
Q=(--outcome hired=yes --exposure team=north,south --bootstrap 0)
median() { sort -n | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
secs() { local t0; t0=$(date +%s.%N); "$@" >/dev/null; echo "$(date +%s.%N) - $t0" | bc; }
pushdown() { "$FOLDLINE" scan --source "$(conn "${1:-$PORT}")" --table staffing "${Q[@]}" --json "$WORK/db.json"; }
export_local() {
    psql -X -q -h 127.0.0.1 -p "${1:-$PORT}" -U admin -d postgres -v ON_ERROR_STOP=1 \
        -c "\\copy staffing TO '$WORK/export.csv' WITH (FORMAT csv, HEADER true)"
    "$FOLDLINE" scan "$WORK/export.csv" "${Q[@]}" --json "$WORK/file.json"
}
tune() { "${PSQL[@]}" -c "ALTER ROLE admin SET work_mem = '256MB'" -c "ALTER ROLE admin SET max_parallel_workers_per_gather = 2"; }
untune() { "${PSQL[@]}" -c "ALTER ROLE admin RESET work_mem" -c "ALTER ROLE admin RESET max_parallel_workers_per_gather"; }

push=(); tuned=(); exp=()
for _ in $(seq "$REPEATS"); do
    push+=("$(secs pushdown)")
    exp+=("$(secs export_local)")
    tune
    tuned+=("$(secs pushdown)")
    untune
done

# Bytes on the wire, each direction, through a counting relay (one extra run of each path).
cat > "$WORK/relay.py" <<'PY'
import socket, sys, threading
listen, target, out = int(sys.argv[1]), int(sys.argv[2]), sys.argv[3]
counts = {"to_server": 0, "to_client": 0}
lock = threading.Lock()
def pump(a, b, key):
    try:
        while True:
            d = a.recv(65536)
            if not d:
                break
            with lock:
                counts[key] += len(d)
                open(out, "w").write(f"{counts['to_server']} {counts['to_client']}\n")
            b.sendall(d)
    except OSError:
        pass
    finally:
        try: b.shutdown(socket.SHUT_WR)
        except OSError: pass
srv = socket.socket(); srv.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
srv.bind(("127.0.0.1", listen)); srv.listen(8)
while True:
    c, _ = srv.accept()
    s = socket.create_connection(("127.0.0.1", target))
    threading.Thread(target=pump, args=(c, s, "to_server"), daemon=True).start()
    threading.Thread(target=pump, args=(s, c, "to_client"), daemon=True).start()
PY
wire() {  # wire FUNCTION -> "bytes_to_server bytes_to_client"
    echo "0 0" > "$WORK/wire"
    /usr/bin/python3 "$WORK/relay.py" "$RELAY_PORT" "$PORT" "$WORK/wire" & RELAY_PID=$!
    sleep 0.5
    "$1" "$RELAY_PORT" >/dev/null
    kill "$RELAY_PID"; wait "$RELAY_PID" 2>/dev/null || true; RELAY_PID=
    cat "$WORK/wire"
}
read -r PUSH_UP PUSH_DOWN < <(wire pushdown)
read -r EXP_UP EXP_DOWN < <(wire export_local)
echo "rows=$ROWS repeats=$REPEATS (median seconds; bytes on the wire: client->server / server->client)"
echo "push-down scan          median_s=$(printf '%s\n' "${push[@]}" | median) bytes_up=$PUSH_UP bytes_down=$PUSH_DOWN"
echo "push-down scan (tuned)  median_s=$(printf '%s\n' "${tuned[@]}" | median)"
echo "export + local scan     median_s=$(printf '%s\n' "${exp[@]}" | median) bytes_up=$EXP_UP bytes_down=$EXP_DOWN csv_bytes=$(stat -c %s "$WORK/export.csv")"
"$FOLDLINE" scan --source "$(conn "$PORT")" --table staffing "${Q[@]}" --timings >/dev/null 2>"$WORK/t" || true
echo "push-down values fetched (cells and counts): $(grep -o 'fetched_bytes=[0-9]*' "$WORK/t")"
/usr/bin/python3 - "$WORK/db.json" "$WORK/file.json" <<'PY'
import json, sys
a, b = (json.load(open(p)) for p in sys.argv[1:])
a.pop("data"); b.pop("data")
print("findings identical:", a == b)
PY
