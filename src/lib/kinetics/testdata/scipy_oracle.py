#!/usr/bin/env python3
"""Independent reference fits with SciPy for the kinetics engine's tests.

Reads one JSON object on stdin and writes one JSON object on stdout, so a whole test file needs
only one python3 process. Each request kind fits the same objective as the TypeScript engine:

- "distributions": scipy.stats.t.ppf / t.cdf, scipy.stats.f.sf, scipy.special.betainc.
- "mechanism": scipy.optimize.least_squares (trf, bounds a, b >= 0, Km >= 0) of
  v = V*S/(Km*(1+a*I) + S*(1+b*I)) for each of the four models, unweighted.
- "logistic4": scipy.optimize.curve_fit (Levenberg-Marquardt) of
  y = bottom + (top-bottom)/(1+10**(h*(log10 x - L))), with the t-based 95 % CI of 10**L.
- "linregress": scipy.stats.linregress.
"""
import json
import sys

import numpy as np
from scipy import optimize, special, stats

TIGHT = dict(ftol=1e-15, xtol=1e-15, gtol=1e-15, max_nfev=20000)


def unpack(model, t):
    if model == "competitive":
        return t[0], t[1], t[2], 0.0
    if model == "uncompetitive":
        return t[0], t[1], 0.0, t[2]
    if model == "noncompetitive":
        return t[0], t[1], t[2], t[2]
    return t[0], t[1], t[2], t[3]


def fit_mechanism_model(model, s, i, y, start):
    def residuals(t):
        v, km, a, b = unpack(model, t)
        return y - v * s / (km * (1 + a * i) + s * (1 + b * i))

    p = 4 if model == "mixed" else 3
    lower = [-np.inf] + [0.0] * (p - 1)
    x0 = np.array(start[:p], dtype=float)
    x0 = np.maximum(x0, np.array(lower) + 0.0)
    res = optimize.least_squares(residuals, x0, bounds=(lower, [np.inf] * p), method="trf", x_scale="jac", **TIGHT)
    v, km, a, b = unpack(model, res.x)
    return {"vmax": v, "km": km, "a": a, "b": b, "rss": float(np.sum(res.fun ** 2)), "status": int(res.status)}


def start_for(model, truth):
    v, km, a, b = truth["vmax"], truth["km"], truth["a"], truth["b"]
    if model == "competitive":
        return [v, km, a if a > 0 else b]
    if model == "uncompetitive":
        return [v, km, b if b > 0 else a]
    if model == "noncompetitive":
        k = a if a > 0 else b
        return [v, km, k]
    return [v, km, a, b]


def mechanism(req):
    out = []
    for ds in req["datasets"]:
        s = np.array([p["substrate"] for p in ds["points"]], dtype=float)
        i = np.array([p["inhibitor"] for p in ds["points"]], dtype=float)
        y = np.array([p["rate"] for p in ds["points"]], dtype=float)
        truth = ds["truth"]
        fits = {}
        for model in ("competitive", "uncompetitive", "noncompetitive", "mixed"):
            if model == ds["model"]:
                fits[model] = fit_mechanism_model(model, s, i, y, start_for(model, truth))
            else:
                # Generic start that does not use the engine's answer: Vmax from the data,
                # Km from the substrate range, 1/Ki from the inhibitor range.
                v0 = float(np.max(y))
                km0 = float(np.median(s[s > 0]))
                k0 = 1.0 / float(np.median(i[i > 0]))
                fits[model] = fit_mechanism_model(model, s, i, y, [v0, km0, k0, k0])
        out.append({"id": ds["id"], "fits": fits})
    return out


def logistic4(req):
    out = []
    for c in req["curves"]:
        x = np.array(c["concentration"], dtype=float)
        y = np.array(c["response"], dtype=float)
        lx = np.log10(x)

        def f(_x, bottom, top, l, h):
            return bottom + (top - bottom) / (1 + 10 ** (h * (lx - l)))

        t = c["truth"]
        p0 = [t["bottom"], t["top"], t["log10Ic50"], t["hill"]]
        p, cov = optimize.curve_fit(f, x, y, p0=p0, method="lm", ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=20000)
        bottom, top, l, h = p
        if top < bottom:
            bottom, top, h = top, bottom, -h
        dof = len(x) - 4
        se = float(np.sqrt(cov[2, 2]))
        q = stats.t.ppf(0.975, dof)
        out.append({
            "id": c["id"], "bottom": bottom, "top": top, "ic50": 10 ** l, "hill": abs(h),
            "log10Ic50Se": se, "ci": [10 ** (l - q * se), 10 ** (l + q * se)],
            "rss": float(np.sum((y - f(x, *p)) ** 2)),
        })
    return out


def distributions(req):
    return {
        "tppf": [float(stats.t.ppf(p, df)) for p, df in req["tppf"]],
        "tcdf": [float(stats.t.cdf(t, df)) for t, df in req["tcdf"]],
        "fsf": [float(stats.f.sf(f, d1, d2)) for f, d1, d2 in req["fsf"]],
        "betainc": [float(special.betainc(a, b, x)) for x, a, b in req["betainc"]],
    }


def linregress(req):
    out = []
    for t, y in req["series"]:
        r = stats.linregress(t, y)
        out.append({"slope": r.slope, "intercept": r.intercept, "rSquared": r.rvalue ** 2, "slopeSe": r.stderr})
    return out


def main():
    req = json.load(sys.stdin)
    handlers = {"mechanism": mechanism, "logistic4": logistic4, "distributions": distributions, "linregress": linregress}
    result = {kind: handlers[kind](body) for kind, body in req.items()}
    json.dump(result, sys.stdout, default=float)


if __name__ == "__main__":
    main()
