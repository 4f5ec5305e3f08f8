"""Reference for the score correlations in server/stats/data-quality.ts.

scipy.stats.pearsonr and scipy.stats.spearmanr (midranks for ties) of the two scores as given.
Run from the repository root:  /usr/bin/python3 tests/reference/policy/correlation_scipy.py
Writes tests/reference/policy/correlation-scipy.json.
"""
import json

import numpy as np
import scipy
from scipy.stats import pearsonr, spearmanr

rng = np.random.default_rng(11)
cases = []
for name, n, tie_step in [("points with ties", 1500, 10.0), ("continuous", 600, None)]:
    latent = rng.normal(0, 1, n)
    champion = 600 + 50 * (latent + rng.normal(0, 0.7, n))
    challenger_pd = 1 / (1 + np.exp(2 + latent + rng.normal(0, 0.5, n)))  # higher = riskier
    if tie_step:
        champion = np.round(champion / tie_step) * tie_step
        challenger_pd = np.round(challenger_pd, 2)
    cases.append({
        "name": name, "champion": champion.tolist(), "challenger": challenger_pd.tolist(),
        "pearson": float(pearsonr(champion, challenger_pd)[0]),
        "spearman": float(spearmanr(champion, challenger_pd)[0]),
    })

with open("tests/reference/policy/correlation-scipy.json", "w") as f:
    json.dump({"source": f"scipy {scipy.__version__} pearsonr, spearmanr", "cases": cases}, f)
    f.write("\n")
for c in cases:
    print(c["name"], c["pearson"], c["spearman"])
