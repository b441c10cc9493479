#!/bin/sh
# One fuzz target with a fixed verdict (ctest label `fuzz`): replays the kept corpus, then a
# fixed number of executions with seed 1; new inputs go to a fresh scratch folder and are
# discarded. Usage: replay.sh TARGET_BINARY RUNS KEPT_CORPUS_DIR WORK_DIR
set -eu
binary=$1 runs=$2 corpus=$3 work=$4
scratch="$work/scratch"
crashes="$work/crashes"
files="$work/files"
rm -rf "$scratch" "$files"
mkdir -p "$scratch" "$crashes" "$files"
export TIDEWRIGHT_FUZZ_DIR="$files"
set -- "$scratch"
[ -d "$corpus" ] && set -- "$scratch" "$corpus"
# -timeout catches a hang (one input running for a minute), not a slow machine.
# The next inputs depend on what earlier ones covered, so anything that varies between runs
# must stay out of that feedback: address-space randomisation is off (setarch -R), and the
# comparison dictionary is off (-use_cmp=0), since it records compared pointer values, which
# differ from run to run (seen: the same seed diverged after 22,000 site-file executions).
if ! setarch "$(uname -m)" -R "$binary" -seed=1 -runs="$runs" -use_cmp=0 -timeout=60 -rss_limit_mb=2048 \
    -artifact_prefix="$crashes/" -print_final_stats=1 "$@" 2>"$work/log"; then
  echo "tidewright: fuzz target $(basename "$binary") failed; the input is in $crashes/" >&2
  tail -40 "$work/log" >&2
  exit 1
fi
grep -E '^stat::(number_of_executed_units|average_exec_per_sec|peak_rss_mb)' "$work/log" || true
