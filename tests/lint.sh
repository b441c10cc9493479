#!/bin/sh
# Code rules the compiler does not check, over every source file: no function over 100 lines
# (clang-tidy's readability-function-size, threshold in .clang-tidy), except the numerical
# kernels marked NOLINT(readability-function-size) with their reason. Needs a configured
# build's compile_commands.json (default build/ci; `cmake --preset ci` makes it).
# Usage: sh tests/lint.sh [BUILD_DIR]
set -eu
root=$(cd "$(dirname "$0")/.." && pwd)
build=${1:-$root/build/ci}
jobs=$(nproc 2>/dev/null || echo 2)
cd "$root"
if [ ! -f "$build/compile_commands.json" ]; then
  echo "lint: $build/compile_commands.json is missing; run 'cmake --preset ci' first" >&2
  exit 2
fi
# The compile commands without GCC's precompiled headers, which clang cannot read.
db=$(mktemp -d)
trap 'rm -rf "$db"' EXIT
sed 's/ -include [^ "]*cmake_pch\.hxx//g; s/ -Winvalid-pch//g' "$build/compile_commands.json" >"$db/compile_commands.json"
# -Wno-unknown-warning-option: the build passes GCC's -Wno-restrict, which clang does not know.
if ! out=$(find src -name '*.cpp' | sort | xargs -P "$jobs" -n 4 clang-tidy -p "$db" --quiet \
  --extra-arg=-Wno-unknown-warning-option --checks='-*,readability-function-size' \
  --warnings-as-errors='*' 2>&1); then
  echo "$out" | grep -E "(warning|error|note): " | grep -v "^[0-9]* warnings generated" >&2
  echo "lint: functions over 100 lines (readability-function-size); split them, or mark a numerical kernel NOLINT(readability-function-size) with its reason" >&2
  exit 1
fi
echo "lint: every function within 100 lines (or an allowlisted kernel)"
