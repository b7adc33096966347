# Independent oracle for lib/engine/surface.ts, written without its formulas:
# - "smooth": normalised convolution with scipy.ndimage.gaussian_filter (mode="constant", truncate=3) on the values
#   with NaN set to 0 and on the mask, divided;
# - "fit": at chosen nodes, the weighted least-squares plane a + b*ds + c*dt through every finite node within
#   3 sigma (np.linalg.lstsq on sqrt-weighted rows), weights exp(-d^2 / (2 sigma^2)).
# Reads {"columns", "rows", "cellM", "lengthM", "field": [... null for NaN], "nodes": [k, ...]}.
import json
import sys

import numpy as np
from scipy import ndimage

req = json.load(sys.stdin)
cols, rows, cell, L = req["columns"], req["rows"], req["cellM"], req["lengthM"]
f = np.array([np.nan if v is None else v for v in req["field"]], dtype=float).reshape(rows, cols)
mask = np.isfinite(f).astype(float)
vals = np.where(np.isfinite(f), f, 0.0)
sigma = L / cell
num = ndimage.gaussian_filter(vals, sigma, mode="constant", cval=0.0, truncate=3.0)
den = ndimage.gaussian_filter(mask, sigma, mode="constant", cval=0.0, truncate=3.0)
smooth = np.where(mask > 0, num / np.where(den > 0, den, 1), np.nan)

jj, ii = np.nonzero(mask)
fits = []
for k in req["nodes"]:
    j, i = divmod(k, cols)
    ds = (ii - i) * cell
    dt = (jj - j) * cell
    near = (np.abs(ii - i) <= int(np.ceil(3 * sigma))) & (np.abs(jj - j) <= int(np.ceil(3 * sigma)))
    w = np.exp(-(ds[near] ** 2 + dt[near] ** 2) / (2 * L * L))
    A = np.column_stack([np.ones(near.sum()), ds[near], dt[near]]) * np.sqrt(w)[:, None]
    y = f[jj[near], ii[near]] * np.sqrt(w)
    coef, *_ = np.linalg.lstsq(A, y, rcond=None)
    fits.append([float(c) for c in coef])

json.dump({"smooth": [None if not np.isfinite(v) else float(v) for v in smooth.ravel()], "fits": fits}, sys.stdout)
