#!/usr/bin/python3
"""Thermal expansion coefficient of seawater from TEOS-10 (Debian python3-gsw), for
tests/reference/climate_seawater_gsw_test.cpp.

Prints one CSV line per point: SA (g/kg), CT (deg C), p (dbar), gsw.alpha (the 75-term
polynomial of Roquet et al. 2015, as GSW implements it), and alpha with respect to Conservative
Temperature from the full TEOS-10 Gibbs function (alpha_wrt_t_exact / dCT/dt at fixed SA, p).
Points cover the ocean's range: warm water only near the surface, cold water at depth.
"""
import sys

try:
    import gsw
except ImportError:
    sys.stderr.write("python3-gsw is missing: install the Debian package python3-gsw\n")
    sys.exit(3)

# (pressure in dbar, highest Conservative Temperature used at that pressure)
LEVELS = [(0, 30.0), (100, 28.0), (500, 20.0), (1000, 15.0), (2000, 8.0), (4000, 4.0), (5500, 3.0)]
SALINITIES = [33.0, 34.5, 35.16504, 36.5]

print("sa_g_kg,ct_c,p_dbar,alpha_gsw_per_k,alpha_exact_per_k")
for p, ct_max in LEVELS:
    ct = -1.5
    while ct <= ct_max + 1e-9:
        for sa in SALINITIES:
            t = gsw.t_from_CT(sa, ct, p)
            dct_dt = gsw.CT_first_derivatives_wrt_t_exact(sa, t, p)[1]
            exact = gsw.alpha_wrt_t_exact(sa, t, p) / dct_dt
            print(f"{sa!r},{ct!r},{p!r},{float(gsw.alpha(sa, ct, p))!r},{float(exact)!r}")
        ct += 2.5 if ct_max > 10 else 1.0
