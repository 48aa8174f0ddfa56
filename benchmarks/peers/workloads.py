"""NumPy/SciPy peer of the uvsky benchmark suite (benchmarks/run.ts).

Reads the canonical plan of each workload (JSON) and the uv columns (little-endian float64 binary) written by
the TypeScript harness, evaluates the same canonical form vectorised with numpy and scipy.special, times each
workload inside this process (median of repeats, start-up and I/O excluded) and writes the results back so
the harness can check that both computed the same numbers.

Run by benchmarks/run.ts as: /usr/bin/python3 benchmarks/peers/workloads.py <dir>
"""
import json
import sys
import time

import numpy as np
import scipy
from scipy.special import j0, j1

GAUSS_K = np.pi ** 2 / (4 * np.log(2))


def radial(code, p, r2):
    r2 = np.maximum(r2, 0.0)
    if code == 1:
        return np.exp(-GAUSS_K * r2)
    x = np.pi * np.sqrt(r2)
    xs = np.where(x == 0, 1.0, x)
    if code == 0:
        return np.where(x == 0, 1.0, 2 * j1(xs) / xs)
    if code == 2:
        return j0(x)
    if code in (16, 17):
        c1, c32 = p[0], p[1]
        d = np.where(x == 0, 1.0, 2 * j1(xs) / xs)
        # 3 (sin x - x cos x) / x^3, with its series below x = 1e-2 (cancellation)
        l32 = np.where(x < 1e-2, 1 - xs * xs / 10, 3 * (np.sin(xs) - xs * np.cos(xs)) / xs ** 3)
        return c1 * d + c32 * l32
    raise ValueError(f"kernel code {code} not in the peer")


def visibilities(plan, u, v):
    re = np.zeros_like(u)
    im = np.zeros_like(u)
    for t in plan["terms"]:
        amp = np.full_like(u, t["flux"])
        for f in t["factors"]:
            r2 = f["m11"] * u * u + 2 * f["m12"] * u * v + f["m22"] * v * v
            amp = amp * radial(f["code"], f["p"], r2)
        if t["e0"] != 0 or t["n0"] != 0:
            ph = 2 * np.pi * (u * t["e0"] + v * t["n0"])
            re += amp * np.cos(ph)
            im -= amp * np.sin(ph)
        else:
            re += amp
    k = 1 / plan["totalFlux"]
    return re * k, im * k


def closure_phase(plan, u1, v1, u2, v2):
    r1, i1 = visibilities(plan, u1, v1)
    r2, i2 = visibilities(plan, u2, v2)
    r3, i3 = visibilities(plan, -(u1 + u2), -(v1 + v2))
    t = (r1 + 1j * i1) * (r2 + 1j * i2) * (r3 + 1j * i3)
    p = np.degrees(np.angle(t))
    return np.where(p <= -180, p + 360, p)


def timed(f, repeats):
    out = f()
    ts = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = f()
        ts.append(time.perf_counter() - t0)
    return float(np.median(ts)), out


def main():
    d = sys.argv[1]
    spec = json.load(open(f"{d}/spec.json"))
    report = {"numpy": np.__version__, "scipy": scipy.__version__, "results": {}}
    for w in spec["workloads"]:
        cols = {c: np.fromfile(f"{d}/{w['name']}.{c}.bin", dtype="<f8") for c in w["columns"]}
        if w["kind"] == "vis":
            sec, (re, im) = timed(lambda: visibilities(w["plan"], cols["u"], cols["v"]), spec["repeats"])
            np.concatenate([re, im]).astype("<f8").tofile(f"{d}/{w['name']}.out.bin")
        else:
            sec, cp = timed(
                lambda: closure_phase(w["plan"], cols["u1"], cols["v1"], cols["u2"], cols["v2"]), spec["repeats"]
            )
            cp.astype("<f8").tofile(f"{d}/{w['name']}.out.bin")
        report["results"][w["name"]] = sec
    json.dump(report, open(f"{d}/peer.json", "w"))


if __name__ == "__main__":
    main()
