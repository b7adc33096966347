# Independent oracle for the D-L power-law fits in log10 space, written without the product's formulas:
# - OLS: scipy.stats.linregress, with a Student t interval from scipy.stats.t;
# - reduced (standardised) major axis: the slope is the ratio of standard deviations with the sign of r, and its
#   95 % interval is found by inverting the published test numerically: a slope beta is inside the interval when
#   the residuals y - beta*x and the fitted axis y + beta*x are not significantly correlated at the 5 % level
#   (Pitman 1939; the basis of the interval in Warton et al. 2006). The p-value comes from scipy.stats.pearsonr and
#   the interval ends from scipy.optimize.brentq, so no closed form is shared with the code under test.
# Reads {"cases": [{"L": [...], "D": [...]}]} on stdin.
import json
import sys

import numpy as np
from scipy import optimize, stats

ALPHA = 0.05


def pitman_p(x, y, beta):
    return stats.pearsonr(y - beta * x, y + beta * x).pvalue


def sma_interval(x, y, slope):
    sign = 1.0 if slope > 0 else -1.0
    magnitude = abs(slope)
    # p = 1 at the estimate (residuals and fitted axis uncorrelated) and falls towards 0 either side
    f = lambda log_m: pitman_p(x, y, sign * np.exp(log_m)) - ALPHA
    centre = np.log(magnitude)
    lo = optimize.brentq(f, centre - 40.0, centre, xtol=1e-14, rtol=1e-13)
    hi = optimize.brentq(f, centre, centre + 40.0, xtol=1e-14, rtol=1e-13)
    ends = sorted([sign * np.exp(lo), sign * np.exp(hi)])
    return [float(ends[0]), float(ends[1])]


out = []
for case in json.load(sys.stdin)["cases"]:
    x = np.log10(np.asarray(case["L"], dtype=float))
    y = np.log10(np.asarray(case["D"], dtype=float))
    fit = stats.linregress(x, y)
    n = len(x)
    t = stats.t.ppf(0.975, n - 2)
    rma = np.sign(fit.rvalue) * np.std(y, ddof=1) / np.std(x, ddof=1)
    out.append({
        "olsN": fit.slope, "olsLog10c": fit.intercept, "r": fit.rvalue, "rP": fit.pvalue, "olsSe": fit.stderr,
        "olsCi": [fit.slope - t * fit.stderr, fit.slope + t * fit.stderr],
        "rmaN": float(rma), "rmaLog10c": float(np.mean(y) - rma * np.mean(x)),
        "rmaCi": sma_interval(x, y, rma),
    })
json.dump(out, sys.stdout)
