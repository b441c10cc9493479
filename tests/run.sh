#!/bin/sh
# Builds tidewright and runs the whole test suite, reference cross-checks included, first in
# a Release build with warnings as errors, then under AddressSanitizer and
# UndefinedBehaviorSanitizer. Installs missing Debian packages first (as root). Safe to run
# twice. Then a bounded fuzz run of every reader of outside input (tests/fuzz/run.sh).
# Set TIDEWRIGHT_SKIP_SANITIZER=1 to run only the Release pass, TIDEWRIGHT_FUZZ_SECONDS to
# change the fuzz time per target (default 60; 0 skips fuzzing).
set -eu
root=$(cd "$(dirname "$0")/.." && pwd)
sh "$root/tests/setup/install-packages.sh"
cd "$root"
jobs=$(nproc 2>/dev/null || echo 2)

echo "== tidewright: Release build (warnings are errors) =="
cmake --preset ci
cmake --build --preset ci -j "$jobs"
ctest --preset ci -j "$jobs"

if [ "${TIDEWRIGHT_SKIP_SANITIZER:-0}" != 1 ]; then
  echo "== tidewright: AddressSanitizer + UndefinedBehaviorSanitizer build =="
  cmake --preset asan
  cmake --build --preset asan -j "$jobs"
  ctest --preset asan -j "$jobs"
fi

fuzz_seconds=${TIDEWRIGHT_FUZZ_SECONDS:-60}
if [ "$fuzz_seconds" != 0 ]; then
  echo "== tidewright: fuzzing readers of outside input, ${fuzz_seconds}s per target =="
  sh "$root/tests/fuzz/run.sh" "$fuzz_seconds"
fi
