#!/bin/sh
# Builds the libFuzzer targets (clang, ASan + UBSan) and runs each for a bounded time.
# Usage: sh tests/fuzz/run.sh [SECONDS_PER_TARGET]   (default 30; longer runs: 600 or more)
# Inputs that crash are saved under build/fuzz/crashes/<target>/ and the script fails.
set -eu
root=$(cd "$(dirname "$0")/../.." && pwd)
seconds=${1:-30}
cd "$root"
cmake --preset fuzz >/dev/null
cmake --build --preset fuzz -j "$(nproc 2>/dev/null || echo 2)" --target fuzz_targets
status=0
for src in tests/fuzz/*_fuzz.cpp; do
  name=$(basename "$src" .cpp)
  target=${name%_fuzz}
  corpus_seed="tests/fuzz/corpus/$target"
  corpus_work="build/fuzz/corpus/$target"
  crashes="build/fuzz/crashes/$target"
  mkdir -p "$corpus_work" "$crashes"
  [ -d "$corpus_seed" ] && cp -n "$corpus_seed"/* "$corpus_work"/ 2>/dev/null || true
  echo "== fuzz $name for ${seconds}s =="
  if ! "build/fuzz/$name" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
      -artifact_prefix="$crashes/" -print_final_stats=1 "$corpus_work" 2>"build/fuzz/$name.log"; then
    echo "tidewright: fuzz target $name found a failure; see build/fuzz/$name.log and $crashes/" >&2
    tail -40 "build/fuzz/$name.log" >&2
    status=1
  fi
  grep -E '^stat::(number_of_executed_units|average_exec_per_sec|peak_rss_mb)' "build/fuzz/$name.log" || true
done
exit $status
