"""SciPy peer of the issue-6 fit benchmark (benchmarks/run.ts, workload f).

Fits the 6-parameter model disk(diameter) + Gaussian envelope(fwhm, flux) + point(flux, east, north) to the V²
and closure phases written by the TypeScript harness, with scipy.optimize.least_squares (trust-region
reflective, bounds, finite-difference Jacobian, its default tolerances), from the same start values. The wall
time of the fit is measured inside this process (median of repeats; start-up and file reading excluded).

Run by benchmarks/run.ts as: /usr/bin/python3 benchmarks/peers/fit_peer.py <dir>
"""
import json
import sys
import time

import numpy as np
from scipy.optimize import least_squares
from scipy.special import j1

RAD_PER_MAS = np.pi / (180 * 3600 * 1000)
GAUSS_K = np.pi ** 2 / (4 * np.log(2))


def vis(p, u, v):
    d, fwhm, w, f, e, n = p
    q2 = u * u + v * v
    x = np.pi * d * RAD_PER_MAS * np.sqrt(q2)
    xs = np.where(x == 0, 1.0, x)
    star = np.where(x == 0, 1.0, 2 * j1(xs) / xs)
    env = w * np.exp(-GAUSS_K * (fwhm * RAD_PER_MAS) ** 2 * q2)
    comp = f * np.exp(-2j * np.pi * (u * e + v * n) * RAD_PER_MAS)
    return (star + env + comp) / (1 + w + f)


def main():
    d = sys.argv[1]
    spec = json.load(open(f"{d}/fit.json"))
    col = lambda name: np.fromfile(f"{d}/fit.{name}.bin", dtype="<f8")
    u, v, vis2, vis2e = col("u"), col("v"), col("vis2"), col("vis2err")
    u1, v1, u2, v2, t3, t3e = col("u1"), col("v1"), col("u2"), col("v2"), col("t3phi"), col("t3phierr")

    def residuals(p):
        r1 = (np.abs(vis(p, u, v)) ** 2 - vis2) / vis2e
        b = vis(p, u1, v1) * vis(p, u2, v2) * vis(p, -(u1 + u2), -(v1 + v2))
        dphi = np.degrees(np.angle(b)) - t3
        dphi = (dphi + 180) % 360 - 180
        return np.concatenate([r1, dphi / t3e])

    lower = [-np.inf if x is None else x for x in spec["lower"]]
    upper = [np.inf if x is None else x for x in spec["upper"]]
    ts = []
    sol = None
    for _ in range(spec["repeats"]):
        t0 = time.perf_counter()
        sol = least_squares(residuals, spec["start"], bounds=(lower, upper))
        ts.append(time.perf_counter() - t0)
    json.dump(
        {
            "seconds": float(np.median(ts)),
            "x": sol.x.tolist(),
            "chi2": float(np.sum(sol.fun ** 2)),
            "nfev": int(sol.nfev),
        },
        open(f"{d}/fit.out.json", "w"),
    )


if __name__ == "__main__":
    main()
