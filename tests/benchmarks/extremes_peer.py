"""Peer timing for tests/benchmarks/extremes_bench.cpp: SciPy genextreme.fit on the same maxima.

Usage: /usr/bin/python3 tests/benchmarks/extremes_peer.py MAXIMA.csv REPETITIONS
Prints one line (CPU seconds per fit): "genextreme_seconds_per_fit <s> loc <mu> scale <sigma> shape <xi>" with
xi = -c (SciPy's shape c is minus Coles' xi). SciPy's default optimiser and tolerances.
"""
import csv
import sys
import time

from scipy.stats import genextreme


def main():
    if len(sys.argv) != 3:
        sys.exit("usage: extremes_peer.py MAXIMA.csv REPETITIONS")
    with open(sys.argv[1], newline="") as f:
        x = [float(r["level_m"]) for r in csv.DictReader(f)]
    reps = int(sys.argv[2])
    c, loc, scale = genextreme.fit(x)  # warm-up
    # CPU time of this process, as Google Benchmark's CPU column (the machine is shared).
    t0 = time.process_time()
    for _ in range(reps):
        c, loc, scale = genextreme.fit(x)
    t1 = time.process_time()
    print("genextreme_seconds_per_fit %.9g loc %.9g scale %.9g shape %.9g"
          % ((t1 - t0) / reps, loc, scale, -c))


if __name__ == "__main__":
    main()
