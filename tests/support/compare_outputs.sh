#!/bin/sh
# Runs the demo study and a fixed set of stage commands (fit, project, allowance, amplify, map)
# on the demo inputs with two builds of tidewright, in two folders laid out alike so that
# command lines recorded in the outputs agree, and lists every output that differs.
# A change meant to keep every number and byte (a refactoring) should list nothing.
#
# Usage: sh tests/support/compare_outputs.sh OLD_BINARY NEW_BINARY [WORK_DIR]
# Exit status: 0 when all outputs are byte-identical, 1 when some differ, 2 on a usage error.
set -eu

if [ $# -lt 2 ]; then
  echo "usage: sh tests/support/compare_outputs.sh OLD_BINARY NEW_BINARY [WORK_DIR]" >&2
  exit 2
fi
old=$(realpath "$1")
new=$(realpath "$2")
work=${3:-$(mktemp -d)}
for b in "$old" "$new"; do
  [ -x "$b" ] || { echo "compare_outputs: $b is not an executable" >&2; exit 2; }
done

# A GeoPackage records when it was written unless this is set (docs/map.md).
export SOURCE_DATE_EPOCH=1764806400

run_all() {
  bin=$1
  dir=$2
  rm -rf "$dir"
  mkdir -p "$dir"
  cd "$dir"
  "$bin" demo --out demo --small -q
  in=demo/inputs
  "$bin" fit "$in/quillhaven_tide_gauge.csv" --level-column level_m --model gev --detrend linear --epoch 2024 --sentinel -99 --datum "harbour datum" \
    --json fit.json --plot fit.svg -q
  "$bin" project --pathway midway --samples 500 --json project.json --csv project.csv \
    --members members.csv --plot project.svg -q
  "$bin" allowance --fit fit.json --members members.csv --years 2050,2100 --return-periods 10,100 \
    --design-life 2030-2100 --heights 3.5,4 --json allowance.json --csv allowance.csv -q
  "$bin" amplify --fit fit.json --members members.csv --years 2050,2100 --return-periods 2,10,100 --levels 3.5 \
    --json amplify.json --csv amplify.csv --plot amplify.svg -q
  "$bin" map --dem "$in/quillhaven_dem.tif" --same-datum --sea "$in/quillhaven_sea.geojson" \
    --defences "$in/quillhaven_defences.geojson" --crest-datum water --fit fit.json --members members.csv \
    --years 2100 --return-periods 100 --polygons --out map -q
  cd - >/dev/null
}

run_all "$old" "$work/old"
run_all "$new" "$work/new"

status=0
(cd "$work/old" && find . -type f | sort) >"$work/old.list"
(cd "$work/new" && find . -type f | sort) >"$work/new.list"
if ! cmp -s "$work/old.list" "$work/new.list"; then
  echo "the two builds wrote different files:"
  diff "$work/old.list" "$work/new.list" || true
  status=1
fi
count=0
while read -r f; do
  count=$((count + 1))
  if [ -f "$work/new/$f" ] && ! cmp -s "$work/old/$f" "$work/new/$f"; then
    echo "differs: $f"
    status=1
  fi
done <"$work/old.list"
echo "compared $count files in $work"
exit $status
