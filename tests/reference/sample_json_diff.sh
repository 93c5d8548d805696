#!/usr/bin/env bash
# What a change does to the JSON of the three sample audits: runs `foldline run` on each sample
# project with two builds (say, main's and a branch's) and prints json_diff.py's summary of the
# differences, by JSON path. Not run by ctest (it needs two builds); see DEVELOPERS.md.
#   tests/reference/sample_json_diff.sh OLD/app/foldline NEW/app/foldline
set -euo pipefail
[ $# -eq 2 ] || { echo "usage: $0 OLD_FOLDLINE NEW_FOLDLINE" >&2; exit 2; }
here=$(cd "$(dirname "$0")" && pwd)
top=$(cd "$here/../.." && pwd)
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
status=0
for sample in lender_audit clinic_audit retail_audit; do
    for side in old new; do
        bin=$1
        [ "$side" = new ] && bin=$2
        SOURCE_DATE_EPOCH=0 "$bin" run "$top/sample_data/$sample.foldline" --json "$out/$side.json" >/dev/null ||
            [ $? -eq 4 ]
    done
    echo "== $sample"
    /usr/bin/python3 "$here/json_diff.py" --summary "$out/old.json" "$out/new.json" || status=1
done
exit $status
