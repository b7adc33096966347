# Independent oracle for lib/engine/surface.ts, written without its formulas:
# - "smooth": normalised convolution with scipy.ndimage.gaussian_filter (mode="constant", truncate=3) on the values
#   with NaN set to 0 and on the mask, divided;
# - "fit" / "fit2": at chosen nodes, the weighted least-squares plane a + b*ds + c*dt (and the quadratic with
#   ds^2, ds*dt, dt^2 added) through every finite node within 3 sigma (np.linalg.lstsq on sqrt-weighted rows),
#   weights exp(-d^2 / (2 sigma^2)).
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


def local_fit(k, quadratic):
    j, i = divmod(k, cols)
    near = (np.abs(ii - i) <= int(np.ceil(3 * sigma))) & (np.abs(jj - j) <= int(np.ceil(3 * sigma)))
    ds = (ii[near] - i) * cell
    dt = (jj[near] - j) * cell
    w = np.exp(-(ds ** 2 + dt ** 2) / (2 * L * L))
    columns = [np.ones(near.sum()), ds, dt] + ([ds * ds, ds * dt, dt * dt] if quadratic else [])
    A = np.column_stack(columns) * np.sqrt(w)[:, None]
    y = f[jj[near], ii[near]] * np.sqrt(w)
    coef, *_ = np.linalg.lstsq(A, y, rcond=None)
    return [float(c) for c in coef[:3]]


json.dump({
    "smooth": [None if not np.isfinite(v) else float(v) for v in smooth.ravel()],
    "fits": [local_fit(k, False) for k in req["nodes"]],
    "fits2": [local_fit(k, True) for k in req["nodes"]],
}, sys.stdout)
