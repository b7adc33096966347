# Times scipy.interpolate.griddata(method="linear") alone on the points and grid the TypeScript pipeline used:
# best of `repeats` calls (each call builds its own Delaunay triangulation, as griddata always does).
import sys, time, json
import numpy as np
from scipy.interpolate import griddata

prefix, s0, t0, cell = sys.argv[1], *map(float, sys.argv[2:5])
cols, rows = int(sys.argv[5]), int(sys.argv[6])
repeats = int(sys.argv[7]) if len(sys.argv) > 7 else 1
s = np.fromfile(prefix + ".s", dtype="<f8")
t = np.fromfile(prefix + ".t", dtype="<f8")
v = np.fromfile(prefix + ".v", dtype="<f8")
gx, gy = np.meshgrid(s0 + cell * np.arange(cols), t0 + cell * np.arange(rows))
runs = []
for _ in range(repeats):
    start = time.perf_counter()
    out = griddata((s, t), v, (gx, gy), method="linear")
    runs.append(time.perf_counter() - start)
print(json.dumps({"seconds": min(runs), "runs": runs, "nodes": int(out.size), "inside": int(np.isfinite(out).sum())}))
