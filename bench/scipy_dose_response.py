#!/usr/bin/env python3
"""The SciPy side of the dose-response benchmark: a curve_fit loop over the same CSV that
`analyze dose-response` reads, printing the same JSON shape (compound, ic50, hill, top, bottom,
ic50Ci95, flags). The t quantile is cached per degree of freedom.

By default curve_fit is called as usual (Levenberg-Marquardt, finite-difference Jacobian).
With --analytic-jacobian it also gets the analytic Jacobian, which makes SciPy faster; the
benchmark reports both.

usage: python3 bench/scipy_dose_response.py [--analytic-jacobian] FILE.csv > out.json
"""
import csv
import json
import sys
import warnings

import numpy as np
from scipy import optimize, stats

LN10 = np.log(10.0)


def model(lx, bottom, top, l, h):
    return bottom + (top - bottom) / (1.0 + 10.0 ** (h * (lx - l)))


def jacobian(lx, bottom, top, l, h):
    g = 1.0 / (1.0 + 10.0 ** (h * (lx - l)))
    gq = g * (1.0 - g)
    span = top - bottom
    return np.column_stack((1.0 - g, g, span * gq * LN10 * h, -span * gq * LN10 * (lx - l)))


def start(lx, y):
    order = np.argsort(lx)
    lxs, ys = lx[order], y[order]
    bottom, top = float(np.min(ys)), float(np.max(ys))
    falling = np.corrcoef(lxs, ys)[0, 1] < 0
    mid = 0.5 * (bottom + top)
    l0 = float(lxs[int(np.argmin(np.abs(ys - mid)))])
    return [bottom, top, l0, 1.0 if falling else -1.0]


def main():
    args = sys.argv[1:]
    analytic = "--analytic-jacobian" in args
    path = [a for a in args if not a.startswith("--")][0]
    jac = jacobian if analytic else None
    groups = {}
    with open(path, newline="") as fh:
        reader = csv.DictReader(fh)
        # The response column may carry its unit, e.g. "response (% inhibition)".
        response = next(h for h in reader.fieldnames if h.strip().lower().startswith("response"))
        for row in reader:
            groups.setdefault(row["compound"], ([], []))
            groups[row["compound"]][0].append(float(row["concentration"]))
            groups[row["compound"]][1].append(float(row[response]))
    tq = {}
    out = []
    warnings.simplefilter("ignore")
    for name, (xs, ys) in groups.items():
        x = np.array(xs)
        y = np.array(ys)
        lx = np.log10(x)
        rec = {"compound": name, "ic50": None, "hill": None, "top": None, "bottom": None, "ic50Ci95": [None, None], "flags": []}
        try:
            p, cov = optimize.curve_fit(model, lx, y, p0=start(lx, y), jac=jac, method="lm", maxfev=2000)
        except (RuntimeError, ValueError):
            rec["flags"].append("not-converged")
            out.append(rec)
            continue
        bottom, top, l, h = (float(v) for v in p)
        if top < bottom:
            bottom, top, h = top, bottom, -h
        dof = len(x) - 4
        if dof not in tq:
            tq[dof] = float(stats.t.ppf(0.975, dof))
        se = float(np.sqrt(cov[2, 2])) if np.isfinite(cov[2, 2]) else None
        ci = [10 ** (l - tq[dof] * se), 10 ** (l + tq[dof] * se)] if se is not None else [None, None]
        if l > lx.max():
            rec["flags"].append("ic50-above-range")
        elif l < lx.min():
            rec["flags"].append("ic50-below-range")
        if not 0.5 <= abs(h) <= 2:
            rec["flags"].append("hill-outside-0.5-2")
        if ci[0] is None or ci[1] / ci[0] > 10:
            rec["flags"].append("ci-wider-than-10-fold")
        rec.update({"ic50": 10 ** l, "hill": abs(h), "top": top, "bottom": bottom, "ic50Ci95": ci})
        out.append(rec)
    sys.stdout.write("[\n" + ",\n".join(json.dumps(r) for r in out) + "\n]\n")


if __name__ == "__main__":
    main()
