"""Reference for server/stats/bands.ts: the trapezoid band Gini against scikit-learn.

The trapezoid Gini 1 − Σ (B_i − B_{i−1})(G_i + G_{i−1}) over a band table equals 2·AUC − 1 when
the band number is the score and ties count one half (Engelmann, Hayden & Tasche 2003), which is
what sklearn.metrics.roc_auc_score computes. The band of each account is assigned here
independently with numpy by the rule documented in server/stats/policy-data.ts: accounts riskiest
first at positions 0 … n − 1; a block of equal scores at [start, end) goes wholly to band
floor((start + end) · B / (2n)); empty bands are dropped and the rest renumbered from 1.

Run from the repository root:  /usr/bin/python3 tests/reference/policy/bands_sklearn.py
Writes tests/reference/policy/bands-sklearn.json (numpy, scikit-learn as printed in "source").
"""
import json

import numpy as np
import sklearn
from sklearn.metrics import roc_auc_score

rng = np.random.default_rng(20240601)


def outcome(safety):
    z = (safety - safety.mean()) / safety.std()
    p = 1 / (1 + np.exp(2.2 + 1.1 * z))
    return (rng.random(len(safety)) < p).astype(int)


def bands_by_rule(safety, bands):
    n = len(safety)
    order = np.argsort(safety, kind="stable")
    s = safety[order]
    starts = np.flatnonzero(np.r_[True, s[1:] != s[:-1]])
    ends = np.r_[starts[1:], n]
    ideal = (starts + ends) * bands // (2 * n)
    _, renumbered = np.unique(ideal, return_inverse=True)
    band_sorted = np.repeat(renumbered, ends - starts) + 1
    band = np.empty(n, dtype=int)
    band[order] = band_sorted
    return band


cases = []


def add(name, scores, higher_is, bands, decimals):
    scores = np.round(scores, decimals)
    safety = scores if higher_is == "safer" else -scores
    bad = outcome(safety + rng.normal(0, safety.std() * 0.8, len(safety)))
    band = bands_by_rule(safety, bands)
    auc = roc_auc_score(1 - bad, band)  # P(a good is in a safer band than a bad), ties 1/2
    rows = []
    for b in range(1, band.max() + 1):
        mask = band == b
        rows.append({"band": b, "count": int(mask.sum()), "bads": int(bad[mask].sum()),
                     "scoreMin": float(scores[mask].min()), "scoreMax": float(scores[mask].max())})
    cases.append({
        "name": name, "higherIs": higher_is, "bands": bands,
        "scores": [float(v) for v in scores], "bad": [int(v) for v in bad],
        "rows": rows, "rocAucOnBands": float(auc), "giniOnBands": float(2 * auc - 1),
    })


add("integer points, steps of 10 (heavy ties)", np.round(rng.normal(620, 60, 2000) / 10) * 10, "safer", 10, 0)
add("PD-like, riskier, 3 decimals", rng.beta(1.2, 12, 1500), "riskier", 10, 3)
add("seven distinct values", rng.integers(1, 8, 500).astype(float), "safer", 10, 0)
add("continuous, 20 bands", rng.normal(0, 1, 997), "safer", 20, 6)
add("one value holds 40% of accounts", np.where(rng.random(800) < 0.4, 500.0, rng.normal(600, 50, 800)), "safer", 10, 0)

with open("tests/reference/policy/bands-sklearn.json", "w") as f:
    json.dump({"source": f"numpy {np.__version__}, scikit-learn {sklearn.__version__} roc_auc_score on band numbers",
               "cases": cases}, f)
    f.write("\n")
for c in cases:
    print(c["name"], len(c["rows"]), "bands", "gini on bands", c["giniOnBands"])
