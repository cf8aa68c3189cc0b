"""The benchmark's peer: the same periodic slab solve written with SciPy's solve_ivp.

Reads one JSON case from argv[1] (luminosityW, semiMajorAxisM, eccentricity, periodSeconds,
albedo, emissivity, heatCapacityJPerM2K, internalFluxWPerM2, geometryFactor, relativeTolerance),
finds the periodic state by Newton's method on T(2π) - T(0) with the variational equation
S' = J S integrated beside T (as calorbit does), in the eccentric anomaly E with RK45 (the
Dormand-Prince 5(4) pair, like calorbit's non-stiff integrator), then evaluates the converged
cycle's time mean, minimum and maximum from dense output. Times the whole solve (median of
`repeats` runs) and prints one JSON line: {"seconds": ..., "meanK": ..., "minK": ..., "maxK": ...}.
"""
import json
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

STEFAN_BOLTZMANN = 5.670374419e-8  # W m-2 K-4, CODATA 2018


def solve(case):
    e = case["eccentricity"]
    n = 2 * np.pi / case["periodSeconds"]
    a = case["semiMajorAxisM"]
    absorbed_at_a = case["geometryFactor"] * (1 - case["albedo"]) * case["luminosityW"] / (4 * np.pi * a * a)
    sigma_eps = case["emissivity"] * STEFAN_BOLTZMANN
    inverse_c = 1 / case["heatCapacityJPerM2K"]
    q = case["internalFluxWPerM2"]
    rtol = case["relativeTolerance"]
    scale = (absorbed_at_a / np.sqrt(1 - e * e) / sigma_eps) ** 0.25

    def rhs(E, y):
        w = 1 - e * np.cos(E)
        g = w / n * inverse_c
        t = y[0]
        return [g * (absorbed_at_a / (w * w) + q - sigma_eps * t**4), -g * 4 * sigma_eps * t**3 * y[1]]

    t0 = scale
    for _ in range(40):
        sol = solve_ivp(rhs, (0, 2 * np.pi), [t0, 1.0], method="RK45", rtol=0.01 * rtol, atol=[0.01 * rtol * scale, 0.01 * rtol])
        g = sol.y[0, -1] - t0
        step = g / (sol.y[1, -1] - 1)
        t0 = t0 - step
        if abs(step) <= 0.1 * rtol * scale:
            break
    sol = solve_ivp(rhs, (0, 2 * np.pi), [t0, 1.0], method="RK45", rtol=0.01 * rtol, atol=[0.01 * rtol * scale, 0.01 * rtol], dense_output=True)
    grid = np.linspace(0, 2 * np.pi, 4097)
    temps = sol.sol(grid)[0]
    weights = 1 - e * np.cos(grid)
    mean = np.trapezoid(temps * weights, grid) / np.trapezoid(weights, grid)
    return {"meanK": float(mean), "minK": float(temps.min()), "maxK": float(temps.max())}


def main():
    case = json.loads(sys.argv[1])
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 5
    times = []
    answer = None
    for _ in range(repeats):
        started = time.perf_counter()
        answer = solve(case)
        times.append(time.perf_counter() - started)
    times.sort()
    print(json.dumps({"seconds": times[len(times) // 2], **answer}))


if __name__ == "__main__":
    main()
