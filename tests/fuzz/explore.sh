#!/bin/sh
# Exploratory fuzzing: runs each libFuzzer target for a time with a new seed and keeps what it
# finds in build/fuzz/corpus/<target>/. Run it before submitting a change to a reader of
# outside input; its verdict depends on time and chance, so it is not part of tests/run.sh.
# Every failure it finds becomes a file in tests/fuzz/corpus/<target>/ and a unit test.
# Usage: sh tests/fuzz/explore.sh [SECONDS_PER_TARGET]   (default 600)
set -eu
root=$(cd "$(dirname "$0")/../.." && pwd)
seconds=${1:-600}
cd "$root"
cmake --preset fuzz >/dev/null
cmake --build --preset fuzz -j "$(nproc 2>/dev/null || echo 2)" --target fuzz_targets
status=0
for src in tests/fuzz/*_fuzz.cpp; do
  name=$(basename "$src" .cpp)
  target=${name%_fuzz}
  corpus_work="build/fuzz/corpus/$target"
  crashes="build/fuzz/crashes/$target"
  mkdir -p "$corpus_work" "$crashes"
  [ -d "tests/fuzz/corpus/$target" ] && cp -n "tests/fuzz/corpus/$target"/* "$corpus_work"/ 2>/dev/null || true
  echo "== explore $name for ${seconds}s =="
  if ! "build/fuzz/$name" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
      -artifact_prefix="$crashes/" -print_final_stats=1 "$corpus_work" 2>"build/fuzz/$name.explore.log"; then
    echo "tidewright: fuzz target $name found a failure; see build/fuzz/$name.explore.log and $crashes/" >&2
    tail -40 "build/fuzz/$name.explore.log" >&2
    status=1
  fi
  grep -E '^stat::(number_of_executed_units|average_exec_per_sec|peak_rss_mb)' "build/fuzz/$name.explore.log" || true
done
exit $status
