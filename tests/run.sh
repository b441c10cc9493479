#!/bin/sh
# Builds tidewright and runs the whole test suite, reference cross-checks included, first in
# a Release build with warnings as errors, then under AddressSanitizer and
# UndefinedBehaviorSanitizer, with the code rules of tests/lint.sh between the two. Installs
# missing Debian packages first (as root). Safe to run
# twice. Then every reader of outside input is fuzzed with a fixed verdict (tests/fuzz/run.sh:
# the kept corpus, then a fixed number of executions with a fixed seed).
# Set TIDEWRIGHT_SKIP_SANITIZER=1 to run only the Release pass, TIDEWRIGHT_SKIP_FUZZ=1 to skip
# the fuzz replay.
set -eu
root=$(cd "$(dirname "$0")/.." && pwd)
sh "$root/tests/setup/install-packages.sh"
cd "$root"
jobs=$(nproc 2>/dev/null || echo 2)

echo "== tidewright: Release build (warnings are errors) =="
cmake --preset ci
cmake --build --preset ci -j "$jobs"
ctest --preset ci -j "$jobs"

echo "== tidewright: code rules (no function over 100 lines, tests/lint.sh) =="
sh "$root/tests/lint.sh" "$root/build/ci"

if [ "${TIDEWRIGHT_SKIP_SANITIZER:-0}" != 1 ]; then
  echo "== tidewright: AddressSanitizer + UndefinedBehaviorSanitizer build =="
  cmake --preset asan
  cmake --build --preset asan -j "$jobs"
  ctest --preset asan -j "$jobs"
fi

if [ "${TIDEWRIGHT_SKIP_FUZZ:-0}" != 1 ]; then
  echo "== tidewright: fuzz replay of the readers of outside input (fixed seed and count) =="
  sh "$root/tests/fuzz/run.sh"
fi
