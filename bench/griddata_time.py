# Times scipy.interpolate.griddata(method="linear") alone on the points and grid the TypeScript pipeline used.
import sys, time, json
import numpy as np
from scipy.interpolate import griddata

prefix, s0, t0, cell, cols, rows = sys.argv[1], *map(float, sys.argv[2:5]), int(sys.argv[5]), int(sys.argv[6])
s = np.fromfile(prefix + ".s", dtype="<f8")
t = np.fromfile(prefix + ".t", dtype="<f8")
v = np.fromfile(prefix + ".v", dtype="<f8")
gx, gy = np.meshgrid(s0 + cell * np.arange(cols), t0 + cell * np.arange(rows))
start = time.perf_counter()
griddata((s, t), v, (gx, gy), method="linear")
print(json.dumps({"seconds": time.perf_counter() - start}))
