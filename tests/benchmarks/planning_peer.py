#!/usr/bin/python3
"""Peer for tests/benchmarks/planning_bench.cpp: the same planning computations in NumPy/SciPy.

  nt         N_t(z) = mean_i N_0(z - delta_i) for 10,000 members and 100 levels (GEV), one
             vectorised NumPy expression (a 100 x 10,000 array).
  allowance  one allowance root solve over 10,000 members by scipy.optimize.brentq with the
             same GEV rate (xtol 1e-9 m, as the library's default tolerance).

Prints "<name> <CPU seconds per repetition>" (time.process_time, best of 5 runs), one line
per case: CPU time, like the CPU column of the C++ rows, because the machine is shared.
"""
import sys
import time

import numpy as np
from scipy import optimize

MU, SIGMA, XI = 2.0, 0.15, -0.1


def n0(x):
    t = 1.0 + XI * (x - MU) / SIGMA
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(t > 0, np.exp(-np.log1p(XI * (x - MU) / SIGMA) / XI), 0.0)
    return r


def best(f, reps):
    times = []
    for _ in range(5):
        t0 = time.process_time()
        for _ in range(reps):
            f()
        times.append((time.process_time() - t0) / reps)
    return min(times)


def main():
    rng = np.random.default_rng(20261201)
    delta = rng.normal(0.5, 0.15, 10000)
    levels = np.linspace(2.0, 3.2, 100)
    nt = lambda: n0(levels[:, None] - delta[None, :]).mean(axis=1)
    print("nt %.9g" % best(nt, 5))
    z = 2.6
    target = np.log(n0(np.array([z]))[0])
    def solve():
        return optimize.brentq(lambda a: np.log(n0(z + a - delta).mean()) - target,
                               delta.min(), delta.max(), xtol=1e-9)
    print("allowance %.9g" % best(solve, 20))


if __name__ == "__main__":
    main()
    sys.stdout.flush()
