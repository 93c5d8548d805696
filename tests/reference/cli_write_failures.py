#!/usr/bin/python3
"""Every file the headless commands write, on a full disk and into a read-only folder.

Outputs covered: the JSON of `scan`, `inspect` and `run` (--json), the CSV pair of `scan --csv`,
and, in a build with the Qt memo writer, the PDF memo of `memo --out`, `run --memo` and
`scan --memo`. For each: a previous file with known bytes sits where the output goes; the
command must exit 3 (input error), name the file and the system's reason on stderr, leave the
previous file byte for byte and leave nothing else in the folder.

How the failures are made (outside references):
- full disk: POSIX setrlimit(2) with RLIMIT_FSIZE; with SIGXFSZ ignored, a write(2) past the
  limit fails with EFBIG ("File too large"), at the same call where a full disk gives ENOSPC;
- read-only folder: mode 0555 (POSIX chmod(2)); root ignores mode bits (Linux
  capabilities(7), CAP_DAC_OVERRIDE), so as root the command runs as user and group 65534,
  and creating the temporary file fails with EACCES ("Permission denied").

Usage: cli_write_failures.py FOLDLINE SOURCE_DIR
"""
import os
import resource
import shutil
import signal
import subprocess
import sys
import tempfile

FOLDLINE, SOURCE = sys.argv[1], sys.argv[2]
SAMPLES = os.path.join(SOURCE, "sample_data")
failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def full_disk():
    signal.signal(signal.SIGXFSZ, signal.SIG_IGN)
    _, hard = resource.getrlimit(resource.RLIMIT_FSIZE)
    resource.setrlimit(resource.RLIMIT_FSIZE, (64, hard))


def unprivileged():
    if os.geteuid() == 0:
        os.setgroups([])
        os.setgid(65534)
        os.setuid(65534)


def run(args, cwd, preexec=None):
    env = dict(os.environ, SOURCE_DATE_EPOCH="1764633600", QT_QPA_PLATFORM="offscreen")
    p = subprocess.run([FOLDLINE] + args, cwd=cwd, capture_output=True, text=True, env=env,
                       preexec_fn=preexec)
    return p.returncode, p.stdout, p.stderr


DATA = "clinic_outcomes.csv"
PROJECT = "clinic_audit.foldline"
SCAN = ["scan", DATA, "--outcome", "recovered=yes", "--exposure", "treatment=new_protocol,standard",
        "--bootstrap", "0"]

# name, arguments with {out} for the output folder, files written (the first one fails), needs the memo writer
CASES = [
    ("scan --json", SCAN + ["--json", "{out}/scan.json"], ["scan.json"], False),
    ("inspect --json", ["inspect", DATA, "--json", "{out}/inspect.json"], ["inspect.json"], False),
    ("run --json", ["run", PROJECT, "--json", "{out}/run.json"], ["run.json"], False),
    ("scan --csv", SCAN + ["--csv", "{out}/x"], ["x-findings.csv", "x-strata.csv"], False),
    ("memo --out", ["memo", PROJECT, "--out", "{out}/memo.pdf"], ["memo.pdf"], True),
    ("run --memo", ["run", PROJECT, "--memo", "{out}/run.pdf"], ["run.pdf"], True),
    ("scan --memo", SCAN + ["--memo", "{out}/scan.pdf"], ["scan.pdf"], True),
]

FAILURES = [
    ("a full disk", full_disk, "File too large"),
    ("a read-only folder", unprivileged, "Permission denied"),
]

work = tempfile.mkdtemp(prefix="foldline-writes-")
try:
    os.chmod(work, 0o755)
    for f in (PROJECT, DATA, DATA.replace(".csv", ".diagram.json")):
        shutil.copy(os.path.join(SAMPLES, f), work)
    rc, _, err = run(["memo", PROJECT, "--out", "probe.pdf"], work)
    memo_writer = rc == 0
    if not memo_writer:
        print("note: no PDF memo writer in this build (%s); memo cases left out" % err.strip())
    for what, preexec, reason in FAILURES:
        for name, args, files, needs_memo in CASES:
            if needs_memo and not memo_writer:
                continue
            out = os.path.join(work, "out")
            os.mkdir(out)
            previous = {}
            for f in files:
                previous[f] = ("previous %s, kept on failure\n" % f).encode()
                with open(os.path.join(out, f), "wb") as fh:
                    fh.write(previous[f])
            if preexec is unprivileged:
                os.chmod(out, 0o555)
            rc, _, err = run([a.replace("{out}", out) for a in args], work, preexec)
            os.chmod(out, 0o755)
            target = os.path.join(out, files[0])
            check(rc == 3, "%s on %s: exit code 3 (got %d)" % (name, what, rc))
            check(target in err and reason in err,
                  "%s on %s: the message names the file and says '%s' (%s)" % (name, what, reason, err.strip()))
            kept = all(open(os.path.join(out, f), "rb").read() == previous[f] for f in files)
            check(kept, "%s on %s: the previous file is intact" % (name, what))
            check(sorted(os.listdir(out)) == sorted(files), "%s on %s: nothing left beside it (%s)" % (
                name, what, sorted(os.listdir(out))))
            shutil.rmtree(out)
finally:
    shutil.rmtree(work, ignore_errors=True)

if failures:
    print("%d check(s) failed" % len(failures))
    sys.exit(1)
print("all checks passed")
