"""Performance baseline: a plain scipy script doing what a researcher would write by hand.

DESIGN.md ("Benchmark contract", "Measured on these machines"): the `starobinsky` family,
background + second-order Hubble-flow observables per point, same work as our fast benchmark.
Per point (N_* cycling over 50..60):
  - phi0 on the slow-roll attractor with N_* + 12 slow-roll e-folds (the core's margin of 10 plus
    its search buffer of 2), from the closed-form slow-roll count and brentq, as our automatic
    search does; the background is integrated afresh for every point, as in a scan;
  - solve_ivp(DOP853) on the plain state (phi, phi'), phi'' = -(3 - phi'^2/2)(phi' + V'/V),
    with a terminal event at eps1 = 1 and dense output to read the pivot N_* before the end;
  - eps1, eps2 = 2 phi''/phi', eps3 = d ln eps2/dN (from the equation of motion differentiated
    once more), then n_s and r at second order with C = gamma_E + ln 2 - 2.
Only the compute loop is timed, in CPU seconds of this process. Prints one JSON line per rtol:
{"pointsPerSecond", "points", "rtol"}.
With --accuracy it times nothing and prints, per rtol, the largest |dn_s| and |dN_end| over 16
pivots against the same script at rtol 1e-13 (atol 1e-16), so that the benchmark can pick the
tolerance at which this script does the same work as ours: a work-precision comparison (Hairer,
Norsett & Wanner 1993, Solving ODEs I, section II.10).
Usage: /usr/bin/python3 bench/scipy_baseline.py [--rtol 1e-8[,1e-10...]] [--seconds 5] [--accuracy]
"""
import argparse
import json
import time

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

K = np.sqrt(2.0 / 3.0)
C = np.euler_gamma + np.log(2.0) - 2.0
MARGIN = 12.0


def V(x):
    return (1 - np.exp(-K * x)) ** 2


def dV(x):
    return 2 * K * np.exp(-K * x) * (1 - np.exp(-K * x))


def d2V(x):
    return 2 * K * K * np.exp(-K * x) * (2 * np.exp(-K * x) - 1)


def rhs(n, y):
    return [y[1], -(3 - 0.5 * y[1] ** 2) * (y[1] + dV(y[0]) / V(y[0]))]


def end_of_inflation(n, y):
    return 0.5 * y[1] ** 2 - 1


end_of_inflation.terminal = True

# Slow roll: eps_V = 1 at phi_e, N(phi) = integral of V/V' from phi_e = (3/4) e^{K phi} - sqrt(3/8) phi + const.
PHI_E = np.log(1 + 2 / np.sqrt(3)) / K
n_sr = lambda x: 0.75 * (np.exp(K * x) - np.exp(K * PHI_E)) - np.sqrt(3 / 8) * (x - PHI_E)


def point(n_star, rtol, atol):
    phi0 = brentq(lambda x: n_sr(x) - (n_star + MARGIN), PHI_E, 30.0)
    sol = solve_ivp(rhs, (0.0, 1000.0), [phi0, -dV(phi0) / V(phi0)], method="DOP853",
                    rtol=rtol, atol=atol, dense_output=True, events=end_of_inflation)
    n_end = sol.t_events[0][0]
    phi, x = sol.sol(n_end - n_star)
    l1, l2 = dV(phi) / V(phi), d2V(phi) / V(phi) - (dV(phi) / V(phi)) ** 2
    a = -(3 - 0.5 * x * x) * (x + l1)                        # phi''
    b = x * a * (x + l1) - (3 - 0.5 * x * x) * (a + l2 * x)  # phi'''
    e1, e2 = 0.5 * x * x, 2 * a / x
    e3 = 2 * (b / x - (a / x) ** 2) / e2
    ns = 1 - 2 * e1 - e2 - 2 * e1**2 - (2 * C + 3) * e1 * e2 - C * e2 * e3
    r = 16 * e1 * (1 + C * e2)
    return ns, r, n_end


def accuracy(rtols, atol):
    """Largest |dn_s| and |dN_end| at each rtol over every 4th pivot (as the TypeScript side), against rtol 1e-13."""
    pivots = np.linspace(50.0, 60.0, 64)[::4]
    reference = [point(p, 1e-13, 1e-16) for p in pivots]
    for rtol in rtols:
        got = [point(p, rtol, atol) for p in pivots]
        print(json.dumps({
            "rtol": rtol,
            "nsError": max(abs(a[0] - b[0]) for a, b in zip(got, reference)),
            "nEndError": max(abs(a[2] - b[2]) for a, b in zip(got, reference)),
        }))


def rate(rtol, atol, seconds):
    pivots = np.linspace(50.0, 60.0, 64)
    points = 0
    # CPU time of this process, as the TypeScript side measures: a busy machine disturbs it less.
    start = time.process_time()
    while time.process_time() - start < seconds:
        point(pivots[points % len(pivots)], rtol, atol)
        points += 1
    elapsed = time.process_time() - start
    print(json.dumps({"pointsPerSecond": points / elapsed, "points": points, "rtol": rtol}), flush=True)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rtol", default="1e-8", help="one rtol or a comma-separated list")
    parser.add_argument("--atol", type=float, default=1e-14)
    parser.add_argument("--seconds", type=float, default=5.0)
    parser.add_argument("--accuracy", action="store_true")
    args = parser.parse_args()
    rtols = [float(x) for x in args.rtol.split(",")]
    if args.accuracy:
        accuracy(rtols, args.atol)
    else:
        for rtol in rtols:
            rate(rtol, args.atol, args.seconds)


if __name__ == "__main__":
    main()
