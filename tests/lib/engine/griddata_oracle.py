# Independent oracle: scipy.interpolate.griddata(method="linear") on the same points and grid nodes.
import json, sys
import numpy as np
from scipy.interpolate import griddata

req = json.load(sys.stdin)
pts = np.array(req["points"], dtype=float)
vals = np.array(req["values"], dtype=float)
nodes = np.array(req["nodes"], dtype=float)
out = griddata(pts, vals, nodes, method="linear")
json.dump([None if np.isnan(v) else float(v) for v in out], sys.stdout)
