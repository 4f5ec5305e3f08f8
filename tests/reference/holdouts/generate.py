"""Generates the reference holdouts (CSV) that pROC and scipy are run on.

Deterministic: numpy's PCG64 with fixed seeds; rerunning rewrites the same bytes. Every file has
the columns bad (1 = bad), champion, challenger, and some a segment column. The orientation of
each model is in cases.json (written here), read by proc.R, scipy_ks.py and the unit tests.

    /usr/bin/python3 tests/reference/holdouts/generate.py
"""
import json
import os

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))


def latent(rng, n, bad_rate, strength_a, strength_b, rho):
    """Two correlated latent risk views and outcomes drawn from a logistic model."""
    truth = rng.standard_normal(n)
    noise_a = rng.standard_normal(n)
    shared = rng.standard_normal(n)
    noise_b = rho * noise_a + np.sqrt(1 - rho * rho) * shared
    a = strength_a * truth + noise_a
    b = strength_b * truth + noise_b
    # intercept tuned roughly to the bad rate
    logit = np.log(bad_rate / (1 - bad_rate)) + 1.2 * truth
    bad = (rng.random(n) < 1 / (1 + np.exp(-logit))).astype(int)
    return bad, a, b


def to_points(risk, centre=600, spread=50, step=1):
    """Higher = safer integer points (optionally on a coarse grid, for heavy ties)."""
    points = np.round((centre - spread * risk) / step) * step
    return points.astype(int)


def to_pd(risk, digits=6):
    """Higher = riskier probability of default, rounded to `digits` significant digits."""
    pd = 1 / (1 + np.exp(-(risk - 2.5)))
    return np.array([float(f"{p:.{digits}g}") for p in pd])


def write(name, bad, champion, challenger, segment=None, fmt_a="{}", fmt_b="{}"):
    path = os.path.join(HERE, name)
    with open(path, "w", newline="\n") as out:
        header = "bad,champion,challenger" + (",segment" if segment is not None else "")
        out.write(header + "\n")
        for i in range(len(bad)):
            row = f"{bad[i]},{fmt_a.format(champion[i])},{fmt_b.format(challenger[i])}"
            if segment is not None:
                row += f",{segment[i]}"
            out.write(row + "\n")


cases = []

# 1. 100 rows, both models PD-like (higher = riskier), continuous.
rng = np.random.default_rng(20250101)
bad, a, b = latent(rng, 100, 0.2, 0.9, 1.3, 0.5)
write("pd-100.csv", bad, to_pd(a), to_pd(b), fmt_a="{:.6g}", fmt_b="{:.6g}")
cases.append({"file": "pd-100.csv", "higherIs": {"champion": "riskier", "challenger": "riskier"}})

# 2. 1,000 rows, integer points on a 10-point grid (heavy ties), both higher = safer.
rng = np.random.default_rng(20250102)
bad, a, b = latent(rng, 1000, 0.1, 0.8, 1.1, 0.6)
write("points-ties-1000.csv", bad, to_points(a, step=10), to_points(b, step=10))
cases.append({"file": "points-ties-1000.csv", "higherIs": {"champion": "safer", "challenger": "safer"}})

# 3. 5,000 rows: champion in points (safer), challenger a PD rounded to 3 digits (riskier, ties).
rng = np.random.default_rng(20250103)
bad, a, b = latent(rng, 5000, 0.08, 1.0, 1.2, 0.7)
write("mixed-5000.csv", bad, to_points(a), to_pd(b, digits=3), fmt_b="{:.3g}")
cases.append({"file": "mixed-5000.csv", "higherIs": {"champion": "safer", "challenger": "riskier"}})

# 4. 20,000 rows, both PD-like continuous, with a segment column; the challenger is worse.
rng = np.random.default_rng(20250104)
bad, a, b = latent(rng, 20000, 0.06, 1.2, 1.0, 0.8)
segment = rng.choice(["branch", "web", "broker"], size=20000, p=[0.5, 0.35, 0.15])
write("pd-segments-20000.csv", bad, to_pd(a), to_pd(b), segment=segment, fmt_a="{:.6g}", fmt_b="{:.6g}")
cases.append({"file": "pd-segments-20000.csv", "higherIs": {"champion": "riskier", "challenger": "riskier"}, "segment": "segment"})

# 5. 100,000 rows, integer points, both higher = safer, bad rate about 5%.
rng = np.random.default_rng(20250105)
bad, a, b = latent(rng, 100000, 0.05, 1.0, 1.15, 0.75)
write("points-100000.csv", bad, to_points(a), to_points(b))
cases.append({"file": "points-100000.csv", "higherIs": {"champion": "safer", "challenger": "safer"}})

# 6. Hanley & McNeil 1982 (Radiology 143:29-36), Table 1: ratings 1 (definitely normal) to 5
#    (definitely abnormal) of 109 CT images; abnormal = bad, higher rating = riskier. The
#    challenger column repeats the rating so the file reads like any other holdout.
normal = [33, 6, 6, 11, 2]
abnormal = [3, 2, 2, 11, 33]
hm_bad, hm_rating = [], []
for rating in range(1, 6):
    hm_bad += [0] * normal[rating - 1] + [1] * abnormal[rating - 1]
    hm_rating += [rating] * (normal[rating - 1] + abnormal[rating - 1])
write("hanley-mcneil-1982.csv", np.array(hm_bad), np.array(hm_rating), np.array(hm_rating))
cases.append({"file": "hanley-mcneil-1982.csv", "higherIs": {"champion": "riskier", "challenger": "riskier"}, "single": True})

with open(os.path.join(HERE, "cases.json"), "w") as out:
    json.dump(cases, out, indent=1)
    out.write("\n")
