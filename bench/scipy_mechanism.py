#!/usr/bin/env python3
"""The SciPy side of the mechanism benchmark: for each data set, the four inhibition models are
fitted with scipy.optimize.least_squares (trf, bounds a, b >= 0, analytic Jacobian), then AICc,
the F-tests against mixed and the same choice rule as the engine. Only the fitting loop is timed
(after reading the JSON), like the engine's side.

usage: python3 bench/scipy_mechanism.py FILE.json  -> prints {"seconds": s, "results": [...]}
"""
import json
import sys
import time
import warnings

import numpy as np
from scipy import optimize, stats

MODELS = ("competitive", "uncompetitive", "noncompetitive", "mixed")


def unpack(model, t):
    if model == "competitive":
        return t[0], t[1], t[2], 0.0
    if model == "uncompetitive":
        return t[0], t[1], 0.0, t[2]
    if model == "noncompetitive":
        return t[0], t[1], t[2], t[2]
    return t[0], t[1], t[2], t[3]


def fit(model, s, i, y, x0):
    def res(t):
        v, km, a, b = unpack(model, t)
        return y - v * s / (km * (1 + a * i) + s * (1 + b * i))

    def jac(t):
        v, km, a, b = unpack(model, t)
        ka = 1 + a * i
        den = km * ka + s * (1 + b * i)
        g = s / den
        q = v * g / den
        da, db = q * km * i, q * s * i
        cols = [-g, q * ka]
        if model == "competitive":
            cols.append(da)
        elif model == "uncompetitive":
            cols.append(db)
        elif model == "noncompetitive":
            cols.append(da + db)
        else:
            cols += [da, db]
        return np.column_stack(cols)

    p = 4 if model == "mixed" else 3
    lower = [-np.inf] + [0.0] * (p - 1)
    r = optimize.least_squares(res, x0[:p], jac=jac, bounds=(lower, [np.inf] * p), method="trf")
    return float(np.sum(r.fun ** 2))


def main():
    with open(sys.argv[1]) as fh:
        datasets = json.load(fh)
    warnings.simplefilter("ignore")
    t0 = time.perf_counter()
    results = []
    for ds in datasets:
        s = np.array([p["substrate"] for p in ds["points"]], dtype=float)
        i = np.array([p["inhibitor"] for p in ds["points"]], dtype=float)
        y = np.array([p["rate"] for p in ds["points"]], dtype=float)
        n = len(y)
        k0 = 1.0 / float(np.median(i[i > 0]))
        x0 = np.array([float(np.max(y)), float(np.median(s[s > 0])), k0, k0])
        rss = {m: fit(m, s, i, y, x0) for m in MODELS}
        aicc = {}
        for m in MODELS:
            k = (4 if m == "mixed" else 3) + 1
            aicc[m] = n * np.log(rss[m] / n) + 2 * k + 2 * k * (k + 1) / (n - k - 1)
        best = min(MODELS, key=lambda m: aicc[m])
        if best == "mixed":
            simple = min(MODELS[:3], key=lambda m: aicc[m])
            f = max(0.0, (rss[simple] - rss["mixed"]) / (rss["mixed"] / (n - 4)))
            if not stats.f.sf(f, 1, n - 4) < 0.05:
                best = simple
        results.append({"id": ds["id"], "best": best, "rss": rss})
    seconds = time.perf_counter() - t0
    json.dump({"seconds": seconds, "results": results}, sys.stdout)


if __name__ == "__main__":
    main()
