#!/bin/sh
# Builds the libFuzzer targets (clang, ASan + UBSan; preset `fuzz`) and runs each with a fixed
# verdict (ctest label `fuzz`, tests/fuzz/replay.sh): the kept corpus in tests/fuzz/corpus/<target>/
# is replayed, then a fixed number of executions with seed 1, so the same tree always gives the
# same verdict. Exploration that keeps its finds is tests/fuzz/explore.sh.
# Usage: sh tests/fuzz/run.sh
# A failing input is saved under build/fuzz/replay/<target>/crashes/ and the script fails.
set -eu
root=$(cd "$(dirname "$0")/../.." && pwd)
cd "$root"
jobs=$(nproc 2>/dev/null || echo 2)
cmake --preset fuzz >/dev/null
cmake --build --preset fuzz -j "$jobs" --target fuzz_targets
ctest --test-dir build/fuzz -L fuzz --output-on-failure -j "$jobs"
