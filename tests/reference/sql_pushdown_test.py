#!/usr/bin/python3
"""Push-down scan against a real PostgreSQL server (Debian's postgresql + odbc-postgresql).

Starts a throwaway cluster in a temporary directory (as an unprivileged user when run as root),
listening on 127.0.0.1 on a free port only; loads the sample scenarios with COPY and a generated
100,000-row table; runs `foldline scan --source odbc:... --table T` and compares its JSON with
`foldline scan FILE.csv` on the same rows: the documents must be identical apart from the
"data" block (the oracle is the file scan, itself checked against statsmodels by
reference_scan_statsmodels). Then the hostile cases: a missing table, a permission error, a
refused query, a column type the engine cannot group by, and a dropped connection (server
stopped). The cluster is always stopped (finally + atexit).

Usage: sql_pushdown_test.py FOLDLINE SOURCE_DIR      (exit 77 = skipped: no PostgreSQL/driver)
"""
import atexit
import csv
import glob
import json
import os
import random
import shutil
import socket
import subprocess
import sys
import tempfile
import time

SKIP = 77
foldline, root = sys.argv[1], sys.argv[2]

bins = sorted(glob.glob("/usr/lib/postgresql/*/bin/initdb"))
if not bins or not os.path.exists("/usr/lib/x86_64-linux-gnu/odbc/psqlodbcw.so") and not glob.glob(
        "/usr/lib/*/odbc/psqlodbcw.so"):
    print("skipped: PostgreSQL server or its ODBC driver is not installed")
    sys.exit(SKIP)
pgbin = os.path.dirname(bins[-1])
driver = glob.glob("/usr/lib/*/odbc/psqlodbcw.so")[0]

work = tempfile.mkdtemp(prefix="foldline-pg-")
os.chmod(work, 0o755)
as_root = os.geteuid() == 0
runner = ["runuser", "-u", "nobody", "--"] if as_root else []   # the server refuses to run as root
data = os.path.join(work, "data")
run = os.path.join(work, "run")   # log and socket, writable by the server's user
os.makedirs(data)
os.makedirs(run)
if as_root:
    for d in (data, run):
        shutil.chown(d, "nobody", "nogroup")
    os.chmod(data, 0o700)
with socket.socket() as s:
    s.bind(("127.0.0.1", 0))
    port = s.getsockname()[1]
pwfile = os.path.join(work, "pw")
with open(pwfile, "w") as f:
    f.write("admin-secret\n")
os.chmod(pwfile, 0o644)
started = False


def pg(*args, check=True, **kw):
    return subprocess.run(runner + [os.path.join(pgbin, args[0]), *args[1:]], check=check,
                          stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True, **kw)


def stop():
    global started
    if started:
        pg("pg_ctl", "-D", data, "-m", "immediate", "-w", "stop", check=False)
        started = False


def cleanup():
    stop()
    shutil.rmtree(work, ignore_errors=True)


atexit.register(cleanup)

pg("initdb", "-D", data, "-U", "admin", "--pwfile", pwfile, "-A", "scram-sha-256", "--no-sync", "-E", "UTF8",
   "--locale", "C")
pg("pg_ctl", "-D", data, "-l", os.path.join(run, "log"), "-w", "-o",
   f"-c listen_addresses=127.0.0.1 -p {port} -k {run} -c fsync=off -c full_page_writes=off "
   "-c log_statement=all", "start")
started = True
env_admin = dict(os.environ, PGPASSWORD="admin-secret")


def psql(sql, db="audit", check=True):
    r = subprocess.run(["psql", "-X", "-q", "-v", "ON_ERROR_STOP=1", "-h", "127.0.0.1", "-p", str(port), "-U", "admin",
                        "-d", db, "-c", sql], env=env_admin, stdout=subprocess.PIPE, stderr=subprocess.STDOUT,
                       text=True)
    if check and r.returncode:
        raise SystemExit("psql failed: " + r.stdout)
    return r.stdout


psql("CREATE DATABASE audit", db="postgres")


def column_types(path):
    """SQL type per column: BIGINT when every value is an integer, DOUBLE PRECISION when every
    value is a number, TEXT otherwise (empty cells are NULL)."""
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    header, body = rows[0], rows[1:]
    types = []
    for j in range(len(header)):
        vals = [r[j] for r in body if r[j] != ""]
        def all_num(conv):
            try:
                for v in vals:
                    conv(v)
                return True
            except ValueError:
                return False
        types.append("BIGINT" if all_num(int) else "DOUBLE PRECISION" if all_num(float) else "TEXT")
    return header, types


def load(table, path):
    header, types = column_types(path)
    cols = ", ".join('"%s" %s' % (h.replace('"', '""'), t) for h, t in zip(header, types))
    psql(f'CREATE TABLE "{table}" ({cols})')
    psql(f"\\copy \"{table}\" FROM '{path}' WITH (FORMAT csv, HEADER true)")


# A generated table of 100,000 rows with awkward column names (space, quote, reserved word).
rnd = random.Random(20261202)
big = os.path.join(work, "big.csv")
with open(big, "w", newline="") as f:
    w = csv.writer(f)
    w.writerow(["team", "hired", "job family", 'site "code"', "select", "tenure"])
    for _ in range(100_000):
        fam = rnd.choice(["ops", "eng", "sales", "care"])
        team = "north" if rnd.random() < (0.7 if fam in ("ops", "care") else 0.3) else "south"
        p = {"ops": 0.2, "eng": 0.5, "sales": 0.35, "care": 0.1}[fam] + (0.04 if team == "north" else 0.0)
        w.writerow([team, "yes" if rnd.random() < p else "no", fam, rnd.choice(["S1", "S2", "S3"]),
                    rnd.choice(["a", "b", ""]), rnd.randint(0, 6)])

# An invented plant log for the trend checks: large values (temperatures in millikelvin, output
# in grams) so that the moment sums must be centred, one line whose temperature never changes
# (no spread in x: the stratum must come out uninformative, exactly as in the file scan), a
# line with one reading, and missing readings and missing lines.
plant = os.path.join(work, "plant.csv")
with open(plant, "w", newline="") as f:
    w = csv.writer(f)
    w.writerow(["supplier", "defect", "line", "crew", "temp_mk", "output_g"])
    for i in range(20_000):
        line = rnd.choice(["L1", "L2", "L3", "calibration", ""])
        base = {"L1": 1_000_000.0, "L2": 1_000_400.0, "L3": 999_700.0, "calibration": 1_000_123.1, "": 1_000_050.0}[line]
        temp = base if line == "calibration" else base + rnd.gauss(0, 25)
        out = 300_000.0 - 0.8 * (temp - base) + 3.0 * (base - 1_000_000.0) + rnd.gauss(0, 40)
        supplier = "north" if rnd.random() < (0.6 if line in ("L1", "calibration") else 0.4) else "south"
        defect = "yes" if rnd.random() < (0.1 if line == "L2" else 0.05) else "no"
        w.writerow([supplier, defect, line, rnd.randint(1, 4), "" if rnd.random() < 0.02 else repr(temp),
                    "" if rnd.random() < 0.02 else repr(out)])
    w.writerow(["north", "no", "solo", 1, "1000000.5", "299999.0"])

load("lender", os.path.join(root, "sample_data/lender_approvals.csv"))
load("plant", plant)
load("clinic", os.path.join(root, "sample_data/clinic_outcomes.csv"))
load("staffing", big)
load("clinic_counts", os.path.join(root, "sample_data/clinic_outcomes_counts.csv"))
psql('CREATE TABLE payroll (team TEXT, hired TEXT, salary BIGINT)')
psql("INSERT INTO payroll VALUES ('north', 'yes', 1), ('south', 'no', 2)")
psql('CREATE TABLE blobs (team TEXT, hired TEXT, doc JSON)')
psql("""INSERT INTO blobs VALUES ('north', 'yes', '{"a":1}'), ('south', 'no', '{"a":2}')""")
psql("CREATE ROLE reader LOGIN PASSWORD 'reader-secret'")
psql("GRANT SELECT ON lender, clinic, staffing, blobs, clinic_counts, plant TO reader")   # not payroll

conn = f"odbc:Driver={driver};Server=127.0.0.1;Port={port};Database=audit;Uid=reader;"
env = dict(os.environ, FOLDLINE_ODBC_PASSWORD="reader-secret")
failures = []


def scan(args, env=env):
    t = time.time()
    r = subprocess.run([foldline, "scan", *args, "--json", "-", "--bootstrap", "200", "--threads", "2"],
                       env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, timeout=300)
    return r, time.time() - t


def compare(name, csv_path, table, question, extra=(), same_rows=True):
    a, ta = scan([csv_path, *question, *extra])
    b, tb = scan(["--source", conn, "--table", table, *question, *extra])
    if a.returncode or b.returncode:
        failures.append(f"{name}: exit codes file {a.returncode}, database {b.returncode}: {b.stderr.strip()}")
        return
    if "reader-secret" in b.stdout or "reader-secret" in b.stderr:
        failures.append(f"{name}: the password appears in the output")
    da, db = json.loads(a.stdout), json.loads(b.stdout)
    data_a, data_b = da.pop("data", None), db.pop("data", None)
    if da != db:
        for k in da:
            if da.get(k) != db.get(k):
                failures.append(f"{name}: JSON differs in '{k}'")
                break
        else:
            failures.append(f"{name}: JSON differs")
    elif same_rows and data_b.get("rows") != data_a.get("rows"):
        failures.append(f"{name}: rows {data_b.get('rows')} != {data_a.get('rows')}")
    elif not same_rows and data_b.get("rows") != data_a.get("rows_kept"):
        # A rows filter: the engine counts the rows its WHERE keeps, the file path the rows it kept.
        failures.append(f"{name}: database rows {data_b.get('rows')} != file rows kept {data_a.get('rows_kept')}")
    else:
        n = len(da.get("findings", []))
        print(f"ok   {name}: {n} findings identical (file {ta:.2f} s, database {tb:.2f} s)")


compare("lender", os.path.join(root, "sample_data/lender_approvals.csv"), "lender",
        ["--outcome", "approved=1", "--exposure", "applicant_group=B,A"])
compare("clinic", os.path.join(root, "sample_data/clinic_outcomes.csv"), "clinic",
        ["--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard"])
compare("clinic pre-counted (count column)", os.path.join(root, "sample_data/clinic_outcomes_counts.csv"),
        "clinic_counts", ["--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard"],
        ["--count-column", "patients"])
compare("staffing 100k (awkward names)", big, "staffing", ["--outcome", "hired=yes", "--exposure", "team=north,south"])
# Named stratifiers against the column order (pairs follow the list), and no pairs at all.
compare("staffing, named strata in reverse order", big, "staffing",
        ["--outcome", "hired=yes", "--exposure", "team=north,south", "--strata", 'tenure,select,site "code"'])
# With a diagram (verdicts need the joint strata of any set: the joint cells are loaded instead).
compare("clinic with its diagram", os.path.join(root, "sample_data/clinic_outcomes.csv"), "clinic",
        ["--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard",
         "--diagram", os.path.join(root, "sample_data/clinic_outcomes.diagram.json")])
compare("lender without pairs", os.path.join(root, "sample_data/lender_approvals.csv"), "lender",
        ["--outcome", "approved=1", "--exposure", "applicant_group=B,A", "--no-pairs"])

# Rows filters: pushed down as a WHERE condition, the database scan equals the filtered file scan
# (cubes, joint cells with a diagram, and a pre-counted source).
compare("lender where channel and score", os.path.join(root, "sample_data/lender_approvals.csv"), "lender",
        ["--outcome", "approved=1", "--exposure", "applicant_group=B,A",
         "--where", "channel = 'in_branch' and credit_score >= 650 or product in ('auto', 'mortgage')"],
        same_rows=False)
compare("clinic with its diagram, where", os.path.join(root, "sample_data/clinic_outcomes.csv"), "clinic",
        ["--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard",
         "--diagram", os.path.join(root, "sample_data/clinic_outcomes.diagram.json"),
         "--where", "not severity = 'mild'"], same_rows=False)
compare("clinic pre-counted, where", os.path.join(root, "sample_data/clinic_outcomes_counts.csv"),
        "clinic_counts", ["--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard",
                          "--where", "site <> 'Weyford'"],
        ["--count-column", "patients"], same_rows=False)
compare("staffing where (awkward names, quote in a value)", big, "staffing",
        ["--outcome", "hired=yes", "--exposure", "team=north,south", "--where", '"select" is missing or "select" <> \'a\''],
        same_rows=False)


# First appearance follows the table's stored order (PostgreSQL's row ids), which an UPDATE
# changes: the updated rows' new versions go to the end of the table. A copy of the staffing table
# whose first rows' job family is rewritten in place (same values) then lists that family after
# the others, in the database scan as in a scan of its export (psql \copy reads the stored order).
# The export's scan must differ from the original file's, or the check could not fail.
psql('CREATE TABLE staffing_moved AS SELECT * FROM staffing')
first_family = psql('SELECT "job family" FROM staffing_moved LIMIT 1').split("\n")[2].strip()
psql(f'UPDATE staffing_moved SET "job family" = "job family" WHERE "job family" = \'{first_family}\'')
psql("GRANT SELECT ON staffing_moved TO reader")
moved = os.path.join(work, "staffing_moved.csv")
psql(f"\\copy staffing_moved TO '{moved}' WITH (FORMAT csv, HEADER true)")
compare("staffing after an update (stored order moved)", moved, "staffing_moved",
        ["--outcome", "hired=yes", "--exposure", "team=north,south"])
before, _ = scan([big, "--outcome", "hired=yes", "--exposure", "team=north,south"])
after, _ = scan([moved, "--outcome", "hired=yes", "--exposure", "team=north,south"])
def without_data(r):
    d = json.loads(r.stdout)
    d.pop("data", None)
    return d


if before.returncode or after.returncode or without_data(before) == without_data(after):
    failures.append(f"the update did not move '{first_family}' in the level order (the check above cannot fail)")
else:
    print(f"ok   moving '{first_family}' to the end of the table changes the level order of file and database alike")


def close(a, b, path, worst):
    """Equal JSON, numbers to 1e-9 relative (1e-12 absolute near zero); records the largest
    relative difference of any slope figure in worst[0]."""
    if isinstance(a, dict) and isinstance(b, dict):
        if a.keys() != b.keys():
            return f"{path}: keys differ"
        for k in a:
            r = close(a[k], b[k], f"{path}.{k}", worst)
            if r:
                return r
        return None
    if isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            return f"{path}: lengths {len(a)} and {len(b)}"
        for i, (x, y) in enumerate(zip(a, b)):
            r = close(x, y, f"{path}[{i}]", worst)
            if r:
                return r
        return None
    if isinstance(a, float) or isinstance(b, float):
        if a is None or b is None:
            return f"{path}: {a} and {b}"
        d = abs(a - b)
        if d > 1e-9 * max(abs(a), abs(b)) and d > 1e-12:
            return f"{path}: {a!r} and {b!r}"
        if path.endswith(".slope") and max(abs(a), abs(b)) > 0:
            worst[0] = max(worst[0], d / max(abs(a), abs(b)))
        return None
    return None if a == b else f"{path}: {a!r} and {b!r}"


def compare_trend(name, csv_path, table, question, trend):
    a, _ = scan([csv_path, *question, "--trend", trend])
    b, _ = scan(["--source", conn, "--table", table, *question, "--trend", trend])
    if a.returncode or b.returncode:
        failures.append(f"{name}: exit codes file {a.returncode}, database {b.returncode}: {b.stderr.strip()}")
        return
    da, db = json.loads(a.stdout), json.loads(b.stdout)
    da.pop("data"), db.pop("data")
    # The FDR step runs over rate and slope findings together, so p-values equal to 1e-9 may
    # order near-ties differently: match findings by kind, strata and groups.
    key = lambda f: (f["kind"], json.dumps(f.get("strata")), f.get("focal", ""))
    fa, fb = sorted(da.pop("findings"), key=key), sorted(db.pop("findings"), key=key)
    worst = [0.0]
    problem = close(da, db, "", worst) or close(fa, fb, "findings", worst)
    slopes = sum(1 for f in fa if f["kind"] == "slope")
    if problem:
        failures.append(f"{name}: {problem}")
    elif slopes == 0:
        failures.append(f"{name}: no slope checks ran")
    else:
        print(f"ok   {name}: {len(fa)} findings ({slopes} slope checks) equal, slopes to {worst[0]:.1e} relative")


compare_trend("lender trend income -> loan amount", os.path.join(root, "sample_data/lender_approvals.csv"), "lender",
              ["--outcome", "approved=1", "--exposure", "applicant_group=B,A"], "income:loan_amount")
compare_trend("plant trend at 1e6 (centred sums)", plant, "plant",
              ["--outcome", "defect=yes", "--exposure", "supplier=north,south"], "temp_mk:output_g")

# The JSON records the source instead of a file digest, and a password written into the
# connection string itself (not only the environment's) appears nowhere in the output.
conn_pw = conn + "PWD={reader-secret};"
r, _ = scan(["--source", conn_pw, "--query", "SELECT * FROM clinic", "--outcome", "recovered=yes",
             "--exposure", "treatment=new_protocol,standard"], env=dict(os.environ))
rec = json.loads(r.stdout)["data"].get("database", {}) if r.returncode == 0 else {}
if r.returncode or "reader-secret" in r.stdout + r.stderr:
    failures.append(f"source record: exit {r.returncode}, password in the output: {'reader-secret' in r.stdout + r.stderr}")
elif not (rec.get("driver") and rec.get("database") == "audit" and rec.get("query") == "SELECT * FROM clinic"
          and rec.get("table") is None and rec.get("rows") and rec.get("queried_at", "").endswith("Z")
          and "PWD=***" in rec.get("connection", "")):
    failures.append(f"source record incomplete: {rec}")
else:
    print(f"ok   source record: {rec['driver']}, database {rec['database']}, {rec['rows']} rows at "
          f"{rec['queried_at']}, password masked")

# The rate scans above ran on the cubes of one GROUPING SETS query (the server logs every statement).
with open(os.path.join(run, "log"), errors="replace") as f:
    log = f.read()
if "GROUP BY GROUPING SETS" not in log or "GROUPING(" not in log or "SUM(dx * dy)" not in log \
        or ") AS binned" not in log:   # the lender's continuous columns: pairs binned in the engine
    failures.append("the database scans did not send the GROUPING SETS query")
else:
    print("ok   the rate scans counted their cubes with one GROUPING SETS query")
# Tables keep first appearance by their row ids (a parallel aggregate); a query source has none
# and numbers its rows.
if 'MIN("foldline_row_id")' not in log or "ROW_NUMBER() OVER ()" not in log:
    failures.append("first appearance: expected MIN(row id) for tables and ROW_NUMBER() for queries")
else:
    print("ok   first appearance: tables by MIN(row id), queries by ROW_NUMBER()")
# Where the planner expects few joint cells, the profile and the trend's sums group the rows into
# them first (parallel workers), otherwise they group the rows: the tables above give both cases
# (the two trends' figures equal the file scan's either way).
if "SUM(n) AS n FROM (SELECT" not in log or "SUM(sxy) AS sxy" not in log or ") AS centred GROUP BY GROUPING SETS" not in log:
    failures.append("cells first: expected both shapes of the profile and of the trend's sums in the log")
else:
    print("ok   cells first: the profile and the trend's sums grouped into few cells first, as planned")


def expect_error(name, args, words, code=3, env=env):
    r, _ = scan(args, env=env)
    msg = r.stderr.lower()
    if r.returncode != code or not all(w in msg for w in words):
        failures.append(f"{name}: exit {r.returncode}, message: {r.stderr.strip()[:300]}")
    elif r.stdout.strip():
        failures.append(f"{name}: wrote output despite the error")
    else:
        print(f"ok   {name}: {' '.join(r.stderr.split())[:300]}")


q = ["--outcome", "hired=yes", "--exposure", "team=north,south"]
expect_error("missing table", ["--source", conn, "--table", "no_such_table", *q], ["does not exist", "42p01"])
expect_error("permission", ["--source", conn, "--table", "payroll", *q], ["permission denied", "42501"])
expect_error("refused query", ["--source", conn, "--query", "SELECT * FROM staffing; DROP TABLE staffing", *q], [";"])
expect_error("ungroupable type", ["--source", conn, "--table", "blobs", *q, "--strata", "doc"], ["cannot be grouped"])
expect_error("rows filter naming a column the source lacks",
             ["--source", conn, "--table", "staffing", *q, "--where", "nowhere = 'x'"],
             ["rows filter", "no column named 'nowhere'"], code=2)
expect_error("wrong password", ["--source", conn, "--table", "staffing", *q], ["cannot connect", "uid=reader"],
             env=dict(os.environ, FOLDLINE_ODBC_PASSWORD="wrong"))
# A password holding ';', '}' and '{' logs in: it goes into the connection string braced with
# '}' doubled (core/io/odbc_connection.h), and never appears in the output.
awkward_pw = "se;c}r{et}"
psql("CREATE ROLE awkward LOGIN PASSWORD '" + awkward_pw + "'")
psql("GRANT SELECT ON staffing TO awkward")
conn_awkward = f"odbc:Driver={driver};Server=127.0.0.1;Port={port};Database=audit;Uid=awkward"
r, _ = scan(["--source", conn_awkward, "--table", "staffing", *q],
            env=dict(os.environ, FOLDLINE_ODBC_PASSWORD=awkward_pw))
if r.returncode or awkward_pw in r.stdout + r.stderr or not json.loads(r.stdout).get("findings"):
    failures.append(f"password with ';', '}}' and '{{': exit {r.returncode}, message: {r.stderr.strip()[:300]}")
else:
    print("ok   a password holding ';', '}' and '{' logs in (braced, '}' doubled) and stays out of the output")
# A query source gives the same findings as the table it selects from.
a, _ = scan(["--source", conn, "--table", "staffing", *q])
b, _ = scan(["--source", conn, "--query", 'SELECT * FROM staffing WHERE "select" IS NULL OR "select" <> \'zz\'', *q])
if a.returncode or b.returncode or json.loads(a.stdout)["findings"] != json.loads(b.stdout)["findings"]:
    failures.append("query source: findings differ from the table source")
else:
    print("ok   query source: same findings as the table")

# Cancel: an interrupt during a 30-second statement cancels it in the engine (the stop token
# reaches the driver's SQLCancel): the command ends within seconds, says "cancelled", writes
# nothing, and the server logs the cancel request.
import signal
slow30 = 'SELECT s.* FROM staffing s, (SELECT pg_sleep(30)) AS pause'
half = os.path.join(work, "cancelled.json")
proc = subprocess.Popen([foldline, "scan", "--source", conn, "--query", slow30, *q, "--json", half], env=env,
                        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
time.sleep(1.5)
t_cancel = time.time()
proc.send_signal(signal.SIGINT)
out, err = proc.communicate(timeout=60)
took = time.time() - t_cancel
with open(os.path.join(run, "log"), errors="replace") as f:
    server_cancelled = "canceling statement due to user request" in f.read()
if proc.returncode != 3 or "cancelled" not in err.lower() or out.strip() or os.path.exists(half) or took > 5 \
        or not server_cancelled:
    failures.append(f"cancel: exit {proc.returncode} after {took:.1f} s, server saw the cancel: {server_cancelled}, "
                    f"file written: {os.path.exists(half)}, message: {err.strip()[:300]}")
else:
    print(f"ok   cancel: ended {took:.2f} s after the interrupt, the server cancelled the statement: "
          f"{' '.join(err.split())[:200]}")

# The workbench's database path (tests/ui/database_form_test.cpp), when this build has it:
# a table counted through the Source step, and Cancel during a slow query.
ui_test = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(foldline))), "tests", "ui",
                       "ui_database_form_test")
if os.path.exists(ui_test):
    r = subprocess.run([ui_test, "counts_a_table_and_cancels_a_slow_query"], stdout=subprocess.PIPE,
                       stderr=subprocess.STDOUT, text=True, timeout=120,
                       env=dict(os.environ, QT_QPA_PLATFORM="offscreen", FOLDLINE_TEST_ODBC=conn[5:],
                                FOLDLINE_TEST_ODBC_PASSWORD_VAR="FOLDLINE_TEST_PW", FOLDLINE_TEST_PW="reader-secret",
                                XDG_CONFIG_HOME=os.path.join(work, "ui-config")))
    if r.returncode or "PASS   : DatabaseFormTest::counts_a_table_and_cancels_a_slow_query" not in r.stdout:
        failures.append("workbench database path: " + r.stdout[-600:])
    else:
        print("ok   workbench database path: a table counted, a slow query cancelled from the Source step")

# Dropped connection: the server stops while the scan's statement runs (pg_sleep in the query).
slow = 'SELECT s.* FROM staffing s, (SELECT pg_sleep(3)) AS pause'
proc = subprocess.Popen([foldline, "scan", "--source", conn, "--query", slow, *q, "--json", "-"], env=env,
                        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
time.sleep(1.5)
stop()
out, err = proc.communicate(timeout=60)
if proc.returncode != 3 or out.strip() or "connection" not in err.lower():
    failures.append(f"dropped connection: exit {proc.returncode}, message: {err.strip()[:300]}")
else:
    print(f"ok   dropped connection: {' '.join(err.split())[:300]}")

cleanup()
for f in failures:
    print("FAIL", f)
sys.exit(1 if failures else 0)
