#!/usr/bin/python3
"""Peer for tests/benchmarks/climate_bench.cpp: the climate module's ensemble written in numpy,
vectorised over members (one Python loop over years), on the built-in pathway "midway".

Same model and parameter distributions as src/climate/projection.cpp (docs/methods-climate.md);
its own random stream (numpy's), so members differ from the C++ ones but medians agree to
sampling error. Usage: climate_ensemble_numpy.py MEMBERS FIRST_YEAR LAST_YEAR
Prints: CPU seconds of this process for the ensemble (after imports), wall seconds, and the
2100 median total rise (m). CPU time is what the benchmark compares: the machine is shared.
"""
import sys
import time

import numpy as np


def truncated_normal(rng, n, mean, sd, lo, hi):
    x = rng.normal(mean, sd, n)
    bad = (x < lo) | (x > hi)
    while bad.any():
        x[bad] = rng.normal(mean, sd, bad.sum())
        bad = (x < lo) | (x > hi)
    return x


def forcing(years):
    f0, k = 2.72, 0.025
    ramp = f0 * np.expm1(k * (np.minimum(years, 2019) - 1850)) / np.expm1(k * 169)
    s0 = f0 * k * np.exp(k * 169) / np.expm1(k * 169)
    x = np.clip((years - 2019) / 81.0, 0, 1)
    h = 81.0
    herm = (2 * x**3 - 3 * x**2 + 1) * f0 + (x**3 - 2 * x**2 + x) * h * s0 + (-2 * x**3 + 3 * x**2) * 5.2
    return np.where(years <= 2019, ramp, herm)


def ensemble(n, first, last, seed=20261201):
    rng = np.random.default_rng(seed)
    years = np.arange(1850, max(last, 2014) + 1)
    f = forcing(years.astype(float))
    c, cd = 8.2, 109.0
    lam = truncated_normal(rng, n, 3.93 / 3.0, 0.30, 0.6, 2.2)
    gam = truncated_normal(rng, n, 0.67, 0.15, 0.3, 1.2)
    eps = truncated_normal(rng, n, 1.28, 0.2, 0.8, 2.0)
    eff = truncated_normal(rng, n, 0.12, 0.01, 0.07, 0.16)
    v19 = truncated_normal(rng, n, 0.32, 0.08, 0.12, 0.6)
    gl = truncated_normal(rng, n, 1.0, 0.15, 0.3, 2.0)
    gf = truncated_normal(rng, n, 1.0, 0.42, 0.2, 2.5)
    snow = truncated_normal(rng, n, 0.05, 0.015, 0.0, 0.12)
    fa = np.exp(0.8 * truncated_normal(rng, n, 0.0, 1.0, -2.5, 2.5))
    lw = truncated_normal(rng, n, 1.0, 0.3, 0.0, 2.5)
    # Exact propagator per member (Sylvester's formula for exp(A), A 2x2).
    a11, a12, a21, a22 = -(lam + eps * gam) / c, eps * gam / c, gam / cd, -gam / cd + 0 * lam
    tr, det = a11 + a22, a11 * a22 - a12 * a21
    disc = np.sqrt(tr * tr - 4 * det)
    r1, r2 = 0.5 * (tr - disc), 0.5 * (tr + disc)
    e1, e2 = np.exp(r1), np.exp(r2)
    A = np.stack([np.stack([a11, a12], -1), np.stack([a21, a22], -1)], -2)
    eye = np.eye(2)[None]
    phi = (e1[:, None, None] * (A - r2[:, None, None] * eye) - e2[:, None, None] * (A - r1[:, None, None] * eye)) / (
        r1 - r2)[:, None, None]
    ainv = np.linalg.inv(A)
    b = np.array([1.0 / c, 0.0])
    g0 = np.einsum("nij,njk,k->ni", ainv, phi - eye, b)
    g1 = np.einsum("nij,njk,nkl,l->ni", ainv, ainv, phi - eye - A, b)
    t = np.zeros((len(years), n))
    td = np.zeros((len(years), n))
    for i in range(1, len(years)):
        x0, x1 = t[i - 1], td[i - 1]
        df = f[i] - f[i - 1]
        t[i] = phi[:, 0, 0] * x0 + phi[:, 0, 1] * x1 + g0[:, 0] * f[i - 1] + g1[:, 0] * df
        td[i] = phi[:, 1, 0] * x0 + phi[:, 1, 1] * x1 + g0[:, 1] * f[i - 1] + g1[:, 1] * df
    heat = 0.91 * (c * t + cd * td) * 365.25 * 86400 * 5.10e14
    thermal = eff * heat * 1e-24
    n_exp = 1 / 1.375
    tm = 0.5 * (t[1:] + t[:-1])

    def simpson(rate):
        return np.vstack([np.zeros((1, n)), np.cumsum((rate(t[:-1]) + 4 * rate(tm) + rate(t[1:])) / 6, axis=0)])

    integ = simpson(lambda x: gl * (2.6e-4 * (x + 0.2) + 1.74e-4 * (x + 0.2) * np.abs(x + 0.2)))
    i19 = 2019 - 1850
    u = v19 ** (1 - n_exp) - (1 - n_exp) * v19 ** (-n_exp) * (integ - integ[i19])
    vol = np.where(u > 0, np.maximum(u, 0) ** (1 / (1 - n_exp)), 0.0)
    glaciers = vol[0] - vol

    greenland = simpson(lambda x: gf * (0.55e-4 * x * np.abs(x) + 2.8e-4 * x))
    step = 0.5 * (3.3e-3 * fa * (td[1:] + td[:-1]) - 5.8e-3 * snow * (t[1:] + t[:-1]))
    antarctica = np.vstack([np.zeros((1, n)), np.cumsum(step, axis=0)])
    land = lw * (0.03 / 95.5) * (years - 1850)[:, None]
    ref = slice(1995 - 1850, 2014 - 1850 + 1)
    out = slice(first - 1850, last - 1850 + 1)
    comps = [x - x[ref].mean(axis=0) for x in (thermal, glaciers, greenland, antarctica, land)]
    warming = t - t[: 1900 - 1850 + 1].mean(axis=0)
    return [x[out].T.copy() for x in comps], warming[out].T.copy(), years[out]


def main():
    n, first, last = int(sys.argv[1]), int(sys.argv[2]), int(sys.argv[3])
    start_wall, start_cpu = time.perf_counter(), time.process_time()
    comps, _, years = ensemble(n, first, last)
    wall, cpu = time.perf_counter() - start_wall, time.process_time() - start_cpu
    total = sum(comps)
    median_2100 = float(np.median(total[:, 2100 - first])) if first <= 2100 <= last else float("nan")
    print(f"{cpu:.6f}")
    print(f"{wall:.6f}")
    print(f"{median_2100:.6f}")


if __name__ == "__main__":
    main()
