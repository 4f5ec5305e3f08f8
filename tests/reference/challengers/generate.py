"""Generates reference holdouts with one champion and several challengers, for the joint DeLong
test (tests/reference/challengers/joint.R). Deterministic: numpy's PCG64 with fixed seeds.

Every file has the columns bad (1 = bad), champion, then the challengers c1 … cK. Each model
sees the same latent risk through its own noise; the noises are correlated, as models built on
overlapping data are. The orientation of each model is in cases.json (written here).

    /usr/bin/python3 tests/reference/challengers/generate.py
"""
import json
import os

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))


def models(rng, n, bad_rate, strengths, rho):
    """Outcomes from a logistic model of a latent truth, and one risk view per strength."""
    truth = rng.standard_normal(n)
    common = rng.standard_normal(n)
    views = []
    for s in strengths:
        own = rng.standard_normal(n)
        noise = np.sqrt(rho) * common + np.sqrt(1 - rho) * own
        views.append(s * truth + noise)
    logit = np.log(bad_rate / (1 - bad_rate)) + 1.2 * truth
    bad = (rng.random(n) < 1 / (1 + np.exp(-logit))).astype(int)
    return bad, views


def to_points(risk, step=1):
    """Higher = safer integer points (on a coarse grid when step > 1: heavy ties)."""
    return (np.round((600 - 50 * risk) / step) * step).astype(int)


def to_pd(risk, digits=6):
    """Higher = riskier probability of default, rounded to `digits` significant digits."""
    pd = 1 / (1 + np.exp(-(risk - 2.5)))
    return np.array([float(f"{p:.{digits}g}") for p in pd])


def write(name, bad, columns, formats):
    with open(os.path.join(HERE, name), "w", newline="\n") as out:
        names = ["champion"] + [f"c{k}" for k in range(1, len(columns))]
        out.write("bad," + ",".join(names) + "\n")
        for i in range(len(bad)):
            out.write(f"{bad[i]}," + ",".join(fmt.format(col[i]) for col, fmt in zip(columns, formats)) + "\n")


cases = []

# 1. 3,000 rows, integer points on a 10-point grid (heavy ties), champion and 3 challengers, all safer.
rng = np.random.default_rng(20261201)
bad, views = models(rng, 3000, 0.1, [0.8, 1.0, 1.1, 0.85], 0.6)
write("points-ties-3.csv", bad, [to_points(v, step=10) for v in views], ["{}"] * 4)
cases.append({"file": "points-ties-3.csv", "higherIs": ["safer"] * 4})

# 2. 2,000 rows, PD-like continuous (riskier), champion and 5 challengers.
rng = np.random.default_rng(20261202)
bad, views = models(rng, 2000, 0.15, [0.9, 1.2, 1.0, 0.95, 1.3, 1.1], 0.5)
write("pd-5.csv", bad, [to_pd(v) for v in views], ["{:.6g}"] * 6)
cases.append({"file": "pd-5.csv", "higherIs": ["riskier"] * 6})

# 3. 5,000 rows, mixed: champion in points (safer), challengers a PD to 3 digits (riskier,
#    ties), points and PD; 3 challengers.
rng = np.random.default_rng(20261203)
bad, views = models(rng, 5000, 0.08, [1.0, 1.2, 1.05, 1.15], 0.7)
write("mixed-3.csv", bad, [to_points(views[0]), to_pd(views[1], digits=3), to_points(views[2]), to_pd(views[3])],
      ["{}", "{:.3g}", "{}", "{:.6g}"])
cases.append({"file": "mixed-3.csv", "higherIs": ["safer", "riskier", "safer", "riskier"]})

# 4. Case 1 with the first challenger named twice: the contrast covariance is singular (rank 2),
#    so the joint test uses a generalised inverse and two degrees of freedom.
cases.append({"file": "points-ties-3.csv", "columns": ["champion", "c1", "c2", "c1"], "higherIs": ["safer"] * 4})

with open(os.path.join(HERE, "cases.json"), "w") as out:
    json.dump(cases, out, indent=2)
    out.write("\n")
