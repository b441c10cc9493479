"""Reference fits for tests/reference/extremes_cross_check_test.cpp with SciPy.

Usage:
  /usr/bin/python3 extremes_scipy.py fit OUTDIR
      reads OUTDIR/data_*.csv (written by extremes_evd.R) and writes OUTDIR/scipy_results.csv
      with columns name, model, loc, scale, shape, loglik, se_loc, se_scale, se_shape (shape in
      Coles' sign: xi = -c for genextreme; standard errors for the GEV from a Richardson-
      extrapolated finite-difference Hessian), and the r-largest fits of venice by an independent implementation of
      Coles (2001) eq. 3.15 (models rlargest3, rlargest5, rlargest10).
  /usr/bin/python3 extremes_scipy.py rlargest-loglik OUTDIR R MU SIGMA XI
      prints the r-largest log-likelihood (Coles 2001, eq. 3.15) of venice at the given
      parameters.
Exits with status 3 and a message naming the Debian package when NumPy or SciPy is missing.
"""
import csv
import glob
import math
import os
import sys

try:
    import numpy as np
    from scipy import optimize
    from scipy.stats import genextreme, genpareto, gumbel_r
except ImportError as e:  # pragma: no cover - the message is the point
    sys.stderr.write("NumPy/SciPy missing (Debian packages python3-numpy, python3-scipy): %s\n" % e)
    sys.exit(3)


def tight_fmin(func, x0, args=(), disp=0):
    """Nelder-Mead with tolerances far below the 1e-4 the test compares (SciPy's default
    xtol/ftol 1e-4 would not resolve the optimum to that precision). Tighter than 1e-10/1e-12
    only runs into rounding noise of the log-likelihood and the evaluation limit."""
    return optimize.fmin(func, x0, args=args, xtol=1e-10, ftol=1e-12, maxiter=20000,
                         maxfun=20000, disp=0)


def read_levels(path):
    with open(path, newline="") as f:
        # "NA" marks a missing year (dover): dropped, as in the R fits.
        return np.array([float(r["level"]) for r in csv.DictReader(f) if r["level"] != "NA"])


def read_venice(outdir):
    years = []
    with open(os.path.join(outdir, "data_venice.csv"), newline="") as f:
        for r in csv.DictReader(f):
            vals = [float(r["X%d" % k]) for k in range(1, 11) if r["X%d" % k] not in ("", "NA")]
            years.append(sorted(vals, reverse=True))
    return years


def rlargest_loglik(years, r, mu, sigma, xi):
    """Coles (2001) eq. 3.15, written directly from the book (independent of the C++ code):
    sum over years of [-t(z_(r_i))^(-1/xi) + sum_k (-log sigma - (1/xi + 1) log t(z_(k)))],
    t(z) = 1 + xi (z - mu)/sigma, r_i = min(r, values in year i); the xi = 0 limit uses
    exp(-(z - mu)/sigma)."""
    if sigma <= 0:
        return -math.inf
    z = np.concatenate([np.array(v[:r]) for v in years])
    last = np.array([v[:r][-1] for v in years])
    y = (z - mu) / sigma
    yl = (last - mu) / sigma
    if abs(xi) < 1e-12:
        return float(-np.sum(np.exp(-yl)) + np.sum(-math.log(sigma) - y))
    t = 1.0 + xi * y
    tl = 1.0 + xi * yl
    if np.any(t <= 0) or np.any(tl <= 0):
        return -math.inf
    return float(-np.sum(tl ** (-1.0 / xi)) + np.sum(-math.log(sigma) - (1.0 / xi + 1.0) * np.log(t)))


def standard_errors(loglik, p):
    """Square roots of the diagonal of the inverse of minus the Hessian of loglik at p, by
    central differences with Richardson extrapolation (steps h and h/2, h = 1e-3 (1 + |p_i|);
    error O(h^4)), independent of the C++ analytic Hessian."""
    p = np.asarray(p, dtype=float)
    k = len(p)

    def hess(h):
        H = np.zeros((k, k))
        for i in range(k):
            for j in range(k):
                ei = np.zeros(k)
                ej = np.zeros(k)
                ei[i] = h[i]
                ej[j] = h[j]
                H[i, j] = (loglik(p + ei + ej) - loglik(p + ei - ej) - loglik(p - ei + ej)
                           + loglik(p - ei - ej)) / (4 * h[i] * h[j])
        return H

    h = 1e-3 * (1 + np.abs(p))
    H = (4 * hess(h / 2) - hess(h)) / 3
    return np.sqrt(np.diag(np.linalg.inv(-H)))


def fit(outdir):
    rows = []
    for path in sorted(glob.glob(os.path.join(outdir, "data_*.csv"))):
        name = os.path.basename(path)[5:-4]
        if name == "venice":
            continue
        x = read_levels(path)
        if name.startswith("sim_gpd"):
            # Excesses over the threshold 2 with location fixed at 0 (genpareto's c is xi).
            e = x - 2.0
            c, loc, scale = genpareto.fit(e, floc=0.0, optimizer=tight_fmin)
            rows.append((name, "gpd", "NA", scale, c, float(np.sum(genpareto.logpdf(e, c, 0.0, scale))),
                         "NA", "NA", "NA"))
            continue
        c, loc, scale = genextreme.fit(x, optimizer=tight_fmin)
        ll = lambda q: float(np.sum(genextreme.logpdf(x, -q[2], q[0], q[1])))
        se = standard_errors(ll, [loc, scale, -c])
        rows.append((name, "gev", loc, scale, -c, ll([loc, scale, -c]), se[0], se[1], se[2]))
        loc, scale = gumbel_r.fit(x, optimizer=tight_fmin)
        rows.append((name, "gumbel", loc, scale, 0.0, float(np.sum(gumbel_r.logpdf(x, loc, scale))),
                     "NA", "NA", "NA"))
    years = read_venice(outdir)
    maxima = np.array([v[0] for v in years])
    c, loc, scale = genextreme.fit(maxima, optimizer=tight_fmin)
    start = np.array([loc, scale, -c])
    for r in (3, 5, 10):
        nll = lambda p, r=r: -rlargest_loglik(years, r, p[0], p[1], p[2])
        p = tight_fmin(nll, start)
        p = tight_fmin(nll, p)  # restart: Nelder-Mead can stall on a ridge
        rows.append(("venice", "rlargest%d" % r, p[0], p[1], p[2], -nll(p), "NA", "NA", "NA"))
    with open(os.path.join(outdir, "scipy_results.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["name", "model", "loc", "scale", "shape", "loglik", "se_loc", "se_scale",
                    "se_shape"])
        for row in rows:
            w.writerow([row[0], row[1]] + [repr(v) if not isinstance(v, str) else v for v in row[2:]])


def main():
    if len(sys.argv) >= 3 and sys.argv[1] == "fit":
        fit(sys.argv[2])
    elif len(sys.argv) == 7 and sys.argv[1] == "rlargest-loglik":
        years = read_venice(sys.argv[2])
        r = int(sys.argv[3])
        mu, sigma, xi = (float(v) for v in sys.argv[4:7])
        print(repr(rlargest_loglik(years, r, mu, sigma, xi)))
    else:
        sys.exit(__doc__)


if __name__ == "__main__":
    main()
