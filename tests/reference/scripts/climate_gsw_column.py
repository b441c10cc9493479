#!/usr/bin/python3
"""Thermal expansion of warmed seawater layers from TEOS-10 (Debian python3-gsw), for
tests/reference/climate_seawater_gsw_test.cpp.

Reads lines "SA CT p d dT" (g/kg, deg C, dbar, m, K) on stdin: a layer of thickness d at
Absolute Salinity SA, Conservative Temperature CT and pressure p, warmed uniformly by dT.
Prints per layer the rise d * integral of gsw.alpha(SA, CT', p) dCT' over [CT, CT + dT]
(composite Simpson rule, 400 intervals) and, as a second reference, the change of the column's
thickness at fixed mass, d * (specvol(SA, CT + dT, p) / specvol(SA, CT, p) - 1).
"""
import sys

try:
    import gsw
except ImportError:
    sys.stderr.write("python3-gsw is missing: install the Debian package python3-gsw\n")
    sys.exit(3)

N = 400
print("rise_alpha_integral_m,rise_specvol_m")
for line in sys.stdin:
    if not line.strip():
        continue
    sa, ct, p, d, dt = (float(x) for x in line.split())
    h = dt / N
    total = 0.0
    for k in range(N + 1):
        w = 1 if k in (0, N) else (4 if k % 2 == 1 else 2)
        total += w * float(gsw.alpha(sa, ct + k * h, p))
    integral = total * h / 3.0
    ratio = float(gsw.specvol(sa, ct + dt, p)) / float(gsw.specvol(sa, ct, p))
    print(f"{d * integral!r},{d * (ratio - 1.0)!r}")
