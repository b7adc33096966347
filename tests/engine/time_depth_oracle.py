# Independent oracle for the linear-velocity time–depth relation v(z) = v0 + k·z: integrates it numerically with
# scipy instead of using the closed form. Two-way time to a depth: TWT = 2 ∫0^z dz' / v(z') (scipy.integrate.quad);
# depth at a two-way time: the ODE dz/dτ = v(z) over the one-way time τ = TWT / 2 (scipy.integrate.solve_ivp).
# Reads JSON {cases: [{v0, k, depths: [...], times_ms: [...]}]} on stdin, writes {cases: [{twt_ms: [...], depth_m: [...]}]}.
import json, sys
from scipy.integrate import quad, solve_ivp

req = json.load(sys.stdin)
out = []
for case in req["cases"]:
    v0, k = case["v0"], case["k"]
    v = lambda z: v0 + k * z
    twt_ms = [2000.0 * quad(lambda z: 1.0 / v(z), 0.0, depth, epsabs=1e-13, epsrel=1e-13)[0] for depth in case["depths"]]
    depth_m = []
    for t_ms in case["times_ms"]:
        solution = solve_ivp(lambda tau, z: [v(z[0])], (0.0, t_ms / 2000.0), [0.0], method="DOP853", rtol=1e-12, atol=1e-9)
        depth_m.append(float(solution.y[0][-1]))
    out.append({"twt_ms": twt_ms, "depth_m": depth_m})
json.dump({"cases": out}, sys.stdout)
