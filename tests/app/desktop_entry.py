#!/usr/bin/python3
"""The desktop entry and the audit MIME type (resources/foldline.desktop, resources/foldline-audit.xml).

Checks what the freedesktop Desktop Entry Specification 1.5 and the Shared MIME-info Database
specification require of them and what ./foldline.sh relies on when it installs them:
- the entry is a [Desktop Entry] group of Type=Application with Name, Exec and MimeType keys;
- Exec passes one file (%f), which `foldline FILE` opens, and starts the foldline program;
- MimeType lists the type the XML defines, and the XML gives it the *.foldline glob;
- foldline.sh rewrites the Exec and Icon lines (the patterns it uses match the entry).
"""
import configparser
import os
import re
import sys
import xml.etree.ElementTree as ET

root = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")
failures = []


def check(ok, what):
    print(("ok   " if ok else "FAIL ") + what)
    if not ok:
        failures.append(what)


entry = configparser.ConfigParser(interpolation=None)
entry.optionxform = str
entry.read(os.path.join(root, "resources", "foldline.desktop"), encoding="utf-8")
check(entry.has_section("Desktop Entry"), "one [Desktop Entry] group")
e = entry["Desktop Entry"] if entry.has_section("Desktop Entry") else {}
check(e.get("Type") == "Application", "Type=Application")
check(bool(e.get("Name")), "Name is set")
exec_line = e.get("Exec", "")
check(exec_line.split()[:1] == ["foldline"] and "%f" in exec_line.split(), f"Exec starts foldline with %f: {exec_line!r}")
types = [t for t in e.get("MimeType", "").split(";") if t]

ns = {"m": "http://www.freedesktop.org/standards/shared-mime-info"}
xml = ET.parse(os.path.join(root, "resources", "foldline-audit.xml")).getroot()
defined = [(t.get("type"), [g.get("pattern") for g in t.findall("m:glob", ns)]) for t in xml.findall("m:mime-type", ns)]
check(len(defined) == 1, f"the XML defines one type: {defined!r}")
if defined:
    name, globs = defined[0]
    check(name in types, f"the entry's MimeType lists {name}")
    check(globs == ["*.foldline"], f"the type's glob is *.foldline: {globs!r}")

script = open(os.path.join(root, "foldline.sh"), encoding="utf-8").read()
check("s|^Exec=.*|" in script and "s|^Icon=.*|" in script, "foldline.sh rewrites Exec and Icon")
check(re.search(r"xdg-mime install --novendor resources/foldline-audit.xml", script) is not None,
      "foldline.sh installs the MIME type")

print(f"{len(failures)} failure(s)")
sys.exit(1 if failures else 0)
