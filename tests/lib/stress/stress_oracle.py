# Independent oracle for the reactivation screen, written separately with numpy: the tensor is built in the
# principal frame (SHmax, Shmin, Sv) and rotated about the vertical axis, σ1 and σ3 come from eigvalsh, the
# normal from np.cross. Reads JSON on stdin, writes per-triangle values on stdout.
import json, sys
import numpy as np

req = json.load(sys.stdin)
p = req["parameters"]
pts = np.array(req["points"], dtype=float)
tris = np.array(req["triangles"], dtype=int).reshape(-1, 3)
az = np.radians(p["maxHorizontalAzimuthDeg"])
# columns: unit vectors of SHmax (azimuth az), Shmin (az + 90°), vertical, in East-North-Up
R = np.array([[np.sin(az), np.sin(az + np.pi / 2), 0.0],
              [np.cos(az), np.cos(az + np.pi / 2), 0.0],
              [0.0, 0.0, 1.0]])
out = []
for a, b, c in tris:
    A, B, C = pts[a], pts[b], pts[c]
    n = np.cross(B - A, C - A)
    n = n / np.linalg.norm(n)
    depth_km = -(A[2] + B[2] + C[2]) / 3 / 1000.0
    principal = np.diag([p["maxHorizontalGradient"], p["minHorizontalGradient"], p["verticalGradient"]]) * depth_km
    S = R @ principal @ R.T
    t = S @ n
    sn = float(n @ t)
    tau = float(np.linalg.norm(t - sn * n))
    ev = np.linalg.eigvalsh(S)
    s1, s3 = ev[-1], ev[0]
    pp = p["porePressureGradient"] * depth_km
    eff = sn - pp
    out.append({
        "sigmaN": sn, "tau": tau, "ts": tau / eff, "td": (s1 - sn) / (s1 - s3),
        "dpLow": eff - (tau - p["cohesionMPa"]) / p["frictionLow"],
        "dpHigh": eff - (tau - p["cohesionMPa"]) / p["frictionHigh"],
    })
json.dump(out, sys.stdout)
