#!/usr/bin/env python3
"""The SciPy side of the mechanism benchmark: reads the same batch CSV that
`analyze mechanism` reads (compound,substrate,inhibitor,rate), fits the four inhibition models of
each compound with scipy.optimize.least_squares (trf, bounds a, b >= 0, analytic Jacobian), then
AICc, the F-test against mixed and the same choice rule as the engine, and prints one JSON array
(compound, best, rss per model). The benchmark times the whole process, as it does the command.

usage: python3 bench/scipy_mechanism.py FILE.csv > out.json
"""
import csv
import json
import sys
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
    groups = {}
    with open(sys.argv[1], newline="") as fh:
        for row in csv.DictReader(fh):
            g = groups.setdefault(row["compound"], ([], [], []))
            g[0].append(float(row["substrate"]))
            g[1].append(float(row["inhibitor"]))
            g[2].append(float(row["rate"]))
    warnings.simplefilter("ignore")
    results = []
    for name, (ss, ii, yy) in groups.items():
        s, i, y = np.array(ss), np.array(ii), np.array(yy)
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
        results.append({"compound": name, "best": best, "rss": rss})
    sys.stdout.write("[\n" + ",\n".join(json.dumps(r) for r in results) + "\n]\n")


if __name__ == "__main__":
    main()
