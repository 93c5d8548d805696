#!/usr/bin/python3
"""Command-line conventions of the `foldline` executable (app/main.cpp, app/cli/).

Usage: cli_conventions.py FOLDLINE VERSION

Checks, with the built binary:
- `--version` / `-V` print "foldline VERSION" (VERSION: CMake's PROJECT_VERSION) and exit 0,
  without a display and without touching the toolkit;
- every command in the overview answers `--help`, `-h` and `foldline help COMMAND` with the same
  text, starting "Usage: foldline COMMAND", exit 0, nothing on stderr, even where the command
  would otherwise refuse the line (`scan -h` without --outcome, `adjust --help`);
- `foldline help` prints the overview; `foldline help nosuch` is a usage error (exit 2);
- `foldline` alone without a display exits 2 with one line on stderr naming the headless
  commands, never a toolkit abort; so does `foldline FILE` for an existing data file (the
  workbench opens files), while a word that is neither a command nor a file is a usage error;
- `inspect` of the clinic sample's pre-counted file without --count-column warns that
  `patients` looks like the count column, and does not warn once it is given.
"""
import os
import re
import subprocess
import sys

failures = []


def check(ok, what):
    print(("ok   " if ok else "FAIL ") + what)
    if not ok:
        failures.append(what)


def no_display_env():
    env = dict(os.environ)
    for k in ("DISPLAY", "WAYLAND_DISPLAY", "QT_QPA_PLATFORM"):
        env.pop(k, None)
    return env


def run(foldline, *args, env=None):
    p = subprocess.run([foldline, *args], capture_output=True, text=True, timeout=60,
                       env=env if env is not None else no_display_env())
    return p.returncode, p.stdout, p.stderr


def main():
    if len(sys.argv) != 3:
        print(__doc__)
        return 2
    foldline, version = sys.argv[1], sys.argv[2]

    for flag in ("--version", "-V"):
        rc, out, err = run(foldline, flag)
        check(rc == 0 and out == f"foldline {version}\n" and err == "",
              f"{flag}: exit {rc}, stdout {out!r}, stderr {err!r}")

    rc, overview, err = run(foldline, "help")
    check(rc == 0 and overview.startswith("Usage: foldline") and err == "", f"help: exit {rc}, stderr {err!r}")
    rc, out, _ = run(foldline, "--help")
    check(rc == 0 and out == overview, f"--help prints the overview: exit {rc}")
    commands = re.findall(r"^  ([a-z]+)\b", overview, re.M)
    check({"inspect", "scan", "adjust", "run", "memo", "help"} <= set(commands),
          f"the overview lists the commands: {commands}")

    for name in commands:
        rc, text, err = run(foldline, "help", name)
        check(rc == 0 and text.startswith(f"Usage: foldline {name}") and err == "",
              f"help {name}: exit {rc}, starts {text[:40]!r}, stderr {err!r}")
        for line in ([name, "--help"], [name, "-h"]):
            rc, out, err = run(foldline, *line)
            check(rc == 0 and out == text and err == "", f"{' '.join(line)}: exit {rc}, stderr {err!r}")

    # Before the command looks at the rest of the line: scan without --outcome, an unknown option.
    rc, out, err = run(foldline, "scan", "no-such-file.csv", "-h")
    check(rc == 0 and out.startswith("Usage: foldline scan") and "--outcome" in out and err == "",
          f"scan DATA -h: exit {rc}, stderr {err!r}")
    rc, out, err = run(foldline, "adjust", "--colour", "blue", "--help")
    check(rc == 0 and out.startswith("Usage: foldline adjust") and "--stratify" in out,
          f"adjust --colour blue --help: exit {rc}, stderr {err!r}")
    rc, out, _ = run(foldline, "help", "run")
    check("--update" in out and "4" in out, "help run names --update and exit code 4")
    # Without --help the commands still refuse bad lines.
    rc, _, err = run(foldline, "adjust", "--colour", "blue")
    check(rc == 2 and "unknown option --colour" in err, f"adjust --colour: exit {rc}, {err!r}")
    rc, _, err = run(foldline, "scan", "no-such-file.csv")
    check(rc == 2 and "--outcome" in err, f"scan without --outcome: exit {rc}, {err!r}")

    rc, out, err = run(foldline, "help", "nosuch")
    check(rc == 2 and out == "" and "nosuch" in err, f"help nosuch: exit {rc}, stderr {err!r}")
    rc, out, err = run(foldline, "help", "scan", "run")
    check(rc == 2 and out == "", f"help with two commands: exit {rc}, stderr {err!r}")
    rc, _, err = run(foldline, "nosuch")
    check(rc == 2 and "unknown command 'nosuch'" in err, f"unknown command: exit {rc}")

    rc, out, err = run(foldline)
    lines = err.splitlines()
    check(rc == 2, f"no display: exit {rc} (a toolkit abort is 134 or -6)")
    check(len(lines) == 1 and out == "", f"no display: one line on stderr, got {lines!r}, stdout {out!r}")
    check(bool(lines) and "workbench" in lines[0] and all(c in lines[0] for c in ("inspect", "scan", "adjust", "run")),
          f"no display: the line names the workbench and the headless commands: {err!r}")
    env = no_display_env()
    env["DISPLAY"] = ""
    rc, _, err = run(foldline, env=env)
    check(rc == 2 and len(err.splitlines()) == 1, f"an empty DISPLAY is no display: exit {rc}")

    sample = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "sample_data")
    counts = os.path.join(sample, "clinic_outcomes_counts.csv")
    rc, _, err = run(foldline, "inspect", counts)
    check(rc == 0 and "--count-column patients" in err, f"inspect of a pre-counted file warns: exit {rc}, stderr {err!r}")
    rc, _, err = run(foldline, "inspect", counts, "--count-column", "patients")
    check(rc == 0 and "count-column" not in err, f"inspect with --count-column: no warning: exit {rc}, stderr {err!r}")
    rc, _, err = run(foldline, "inspect", os.path.join(sample, "clinic_outcomes.csv"))
    check(rc == 0 and "count-column" not in err, f"inspect of a row-level file: no warning: exit {rc}, stderr {err!r}")
    rc, out, err = run(foldline, counts)
    # A build with the workbench says there is no display; a build without it says so instead.
    check(rc == 2 and "unknown command" not in err and ("display" in err or "no workbench" in err),
          f"foldline FILE is for the workbench (no display here): exit {rc}, stderr {err!r}")

    print(f"{len(failures)} failure(s)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
