# Independent oracle for the D-L power-law fits: scipy.stats.linregress (OLS) and the reduced major axis slope
# sign(r)*sd(y)/sd(x), in log10 space; Student t quantile from scipy.stats.t. Reads {"cases": [{"L": [...], "D": [...]}]}.
import json
import sys

import numpy as np
from scipy import stats

out = []
for case in json.load(sys.stdin)["cases"]:
    x = np.log10(np.asarray(case["L"], dtype=float))
    y = np.log10(np.asarray(case["D"], dtype=float))
    fit = stats.linregress(x, y)
    n = len(x)
    t = stats.t.ppf(0.975, n - 2)
    rma = np.sign(fit.rvalue) * np.std(y, ddof=1) / np.std(x, ddof=1)
    rma_se = abs(rma) * np.sqrt((1 - fit.rvalue ** 2) / (n - 2))
    out.append({
        "olsN": fit.slope, "olsLog10c": fit.intercept, "r": fit.rvalue, "olsSe": fit.stderr,
        "olsCi": [fit.slope - t * fit.stderr, fit.slope + t * fit.stderr],
        "rmaN": rma, "rmaLog10c": float(np.mean(y) - rma * np.mean(x)),
        "rmaCi": [rma - t * rma_se, rma + t * rma_se], "t975": t,
    })
json.dump(out, sys.stdout)
