"""Independent reference for the inflaton background (used by tests/shared/physics/scipyCrossCheck.test.ts).

General-purpose integrator: scipy's DOP853 (Hairer, Norsett & Wanner, Solving ODEs I, 1993), in the
plain state (phi, phi') with e-folds N as time (M_pl = 1):
    phi'' = -(3 - phi'^2/2) (phi' + V'/V),
started on the slow-roll attractor phi' = -V'/V at N = 0, ending at eps1 = phi'^2/2 = 1 (or phi = endPhi).
Potentials are written here from DESIGN.md's table, independently of the TypeScript code.

stdin:  JSON list of {family, params, phi0, nPivot, endPhi?}
stdout: JSON list of {nEnd, phiEnd, phi, eps1, eps2} (the last three at N = nEnd - nPivot)
"""
import json
import sys

import numpy as np
from scipy.integrate import solve_ivp

RTOL, ATOL, MAX_EFOLDS = 1e-12, 1e-14, 5000.0


def potential(family, p):
    """Returns V and V' as functions of phi (V0 = 1 unless given; it drops out of the background)."""
    v0 = p.get("V0", 1.0)
    if family in ("quadratic", "monomial"):
        n = 2.0 if family == "quadratic" else p["p"]
        return lambda x: v0 * x**n, lambda x: v0 * n * x ** (n - 1)
    if family in ("starobinsky", "e-model"):
        a = np.sqrt(2.0 / 3.0) if family == "starobinsky" else np.sqrt(2.0 / (3.0 * p["alpha"]))
        return lambda x: v0 * (1 - np.exp(-a * x)) ** 2, lambda x: v0 * 2 * a * np.exp(-a * x) * (1 - np.exp(-a * x))
    if family == "natural":
        f = p["f"]
        return lambda x: v0 * (1 + np.cos(x / f)), lambda x: -v0 * np.sin(x / f) / f
    if family == "t-model":
        s = np.sqrt(6.0 * p["alpha"])
        return lambda x: v0 * np.tanh(x / s) ** 2, lambda x: v0 * 2 * np.tanh(x / s) / (s * np.cosh(x / s) ** 2)
    if family == "hilltop":
        mu, q = p["mu"], p["q"]
        return lambda x: v0 * (1 - (x / mu) ** q), lambda x: -v0 * q * x ** (q - 1) / mu**q
    if family == "exponential":
        lam = p["lambda"]
        return lambda x: v0 * np.exp(-lam * x), lambda x: -lam * v0 * np.exp(-lam * x)
    raise ValueError(f"unknown family {family!r}")


def run(case):
    V, dV = potential(case["family"], case["params"])
    rhs = lambda n, y: [y[1], -(3 - 0.5 * y[1] ** 2) * (y[1] + dV(y[0]) / V(y[0]))]
    if case.get("endPhi") is None:
        event = lambda n, y: 0.5 * y[1] ** 2 - 1
    else:
        event = lambda n, y: y[0] - case["endPhi"]
    event.terminal = True
    phi0 = case["phi0"]
    sol = solve_ivp(rhs, (0.0, MAX_EFOLDS), [phi0, -dV(phi0) / V(phi0)], method="DOP853",
                    rtol=RTOL, atol=ATOL, dense_output=True, events=event)
    if sol.status != 1:
        return {"error": f"inflation did not end: {sol.message}"}
    n_end = float(sol.t_events[0][0])
    phi, dphi = sol.sol(n_end - case["nPivot"])
    ddphi = rhs(0.0, [phi, dphi])[1]
    return {"nEnd": n_end, "phiEnd": float(sol.y_events[0][0][0]), "phi": float(phi),
            "eps1": float(0.5 * dphi**2), "eps2": float(2 * ddphi / dphi)}


if __name__ == "__main__":
    print(json.dumps([run(c) for c in json.load(sys.stdin)]))
