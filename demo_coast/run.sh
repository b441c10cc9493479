#!/bin/sh
# Builds tidewright (Release) and runs the demo study of the invented harbour in
# demo_coast/. Installs missing Debian packages first (as root). Safe to run twice: the
# previous output folder is replaced.
set -eu
root=$(cd "$(dirname "$0")/.." && pwd)
sh "$root/tests/setup/install-packages.sh"
cd "$root"
cmake --preset release >/dev/null
cmake --build --preset release -j "$(nproc 2>/dev/null || echo 2)"
out="$root/demo_coast/output"
"$root/build/release/tidewright" --version
"$root/build/release/tidewright" --help
echo "tidewright: the demo study is not wired yet; the stages that exist are listed above."
echo "tidewright: outputs will be written to $out"
