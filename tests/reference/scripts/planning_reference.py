#!/usr/bin/python3
"""Independent reference values for the planning core, by SciPy quadrature and root finding.

N_t(z) = integral of N_0(z - d) phi(d; m, s) dd with N_0 from scipy.stats (GEV: -log cdf of
genextreme with c = -xi, Coles 2001 eq. 3.2; GPD: rate * sf of genpareto, Coles 2001 eq. 4.13),
integrated by scipy.integrate.quad over m +- 8 s. The allowance A solves
ln N_t(z_T + A) = ln N_0(z_T) by brentq (Hunter 2012; Buchanan et al. 2016).

Usage (prints one number, %.17g):
  planning_reference.py amplification gev MU SIGMA XI MEAN SD LEVEL
  planning_reference.py amplification gpd U SIGMA XI RATE MEAN SD LEVEL
  planning_reference.py allowance gev MU SIGMA XI MEAN SD RETURN_PERIOD
"""
import math
import sys

import numpy as np
from scipy import integrate, optimize, stats


def gev_rate(mu, sigma, xi):
    dist = stats.genextreme(-xi, loc=mu, scale=sigma)
    def rate(x):
        return -float(dist.logcdf(x))
    end = mu + sigma / -xi if xi < 0 else None
    return rate, end


def gpd_rate(u, sigma, xi, lam):
    dist = stats.genpareto(xi, loc=u, scale=sigma)
    def rate(x):
        if x < u:
            raise ValueError("level below the threshold: choose inputs that stay above it")
        return lam * float(dist.sf(x))
    end = u + sigma / -xi if xi < 0 else None
    return rate, end


def future_rate(rate, end, mean, sd, z):
    lo, hi = mean - 8 * sd, mean + 8 * sd  # tails beyond 8 sd weigh < 1e-15
    points = None
    if end is not None and lo < z - end < hi:
        points = [z - end]  # the kink where z - d meets the upper end point
    val, _ = integrate.quad(lambda d: rate(z - d) * stats.norm.pdf(d, mean, sd), lo, hi,
                            points=points, epsabs=0, epsrel=1e-11, limit=500)
    return val


def main(argv):
    what, family = argv[1], argv[2]
    args = [float(a) for a in argv[3:]]
    if family == "gev":
        mu, sigma, xi = args[:3]
        rate, end = gev_rate(mu, sigma, xi)
        rest = args[3:]
    elif family == "gpd":
        u, sigma, xi, lam = args[:4]
        rate, end = gpd_rate(u, sigma, xi, lam)
        rest = args[4:]
    else:
        raise SystemExit("unknown family " + family)
    mean, sd, x = rest
    if what == "amplification":
        value = future_rate(rate, end, mean, sd, x) / rate(x)
        if not math.isfinite(value):
            raise SystemExit("no finite reference value for these inputs")
        print("%.17g" % value)
    elif what == "allowance":
        # z_T with N_0(z_T) = 1/T: GEV cdf exp(-1/T).
        z = float(stats.genextreme(-xi, loc=mu, scale=sigma).ppf(math.exp(-1.0 / x)))
        target = math.log(rate(z))
        f = lambda a: math.log(future_rate(rate, end, mean, sd, z + a)) - target
        # For xi > 0 the GEV rate is infinite below its lower end point mu - sigma/xi; the
        # cases must keep z_T + a - (mean + 8 sd) above it over the bracket.
        a = optimize.brentq(f, mean - sd, mean + 3 * sd, xtol=1e-13, rtol=1e-14)
        print("%.17g" % a)
    else:
        raise SystemExit("unknown product " + what)


if __name__ == "__main__":
    np.seterr(all="ignore")
    import warnings
    warnings.simplefilter("ignore", integrate.IntegrationWarning)
    main(sys.argv)
