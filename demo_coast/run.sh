#!/bin/sh
# Builds tidewright (Release) and runs the demo study of Quillhaven, an invented harbour with
# invented data (demo_coast/README.md). Installs missing Debian packages first (as root).
# Safe to run twice: the previous output folder is replaced.
set -eu
root=$(cd "$(dirname "$0")/.." && pwd)
sh "$root/tests/setup/install-packages.sh"
cd "$root"
cmake --preset release >/dev/null
cmake --build --preset release -j "$(nproc 2>/dev/null || echo 2)" --target tidewright
out="$root/demo_coast/output"
"$root/build/release/tidewright" demo --out "$out" --force
echo "tidewright: demo outputs are in $out (open $out/study/report.html; rasters in $out/study/maps/)"
