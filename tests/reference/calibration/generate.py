"""
Reference values for the calibration and stability statistics (server/stats/: jeffreys.ts,
binomial-test.ts, incomplete-beta.ts, brier.ts, chi-square.ts, psi.ts, psi-critical-value.ts),
computed OUTSIDE the project with scipy, scikit-learn, numpy and mpmath.

Run: /usr/bin/python3 tests/reference/calibration/generate.py   (Debian's python3 with
python3-scipy, python3-sklearn, python3-mpmath). Writes, beside this script:
  holdout-weighted.csv   a small holdout with tied PDs (two decimals), grades and sampling weights
  values.json            every expected value, with the library and version that produced it

Nothing here imports or runs project code.
"""
import json
import os
import sys

import mpmath
import numpy as np
import scipy
import sklearn
from scipy import stats
from scipy.special import betainc
from sklearn.metrics import brier_score_loss

here = os.path.dirname(os.path.abspath(__file__))
mpmath.mp.dps = 50
rng = np.random.default_rng(20251202)

out = {
    "generatedBy": "tests/reference/calibration/generate.py",
    "versions": {
        "python": sys.version.split()[0],
        "numpy": np.__version__,
        "scipy": scipy.__version__,
        "sklearn": sklearn.__version__,
        "mpmath": mpmath.__version__,
    },
}

# --- 1. the regularized incomplete beta: mpmath at 50 digits (the truth) and scipy --------------
def incomplete_beta_truth(x, a, b):
    """I_x(a, b) at 50 digits by the hypergeometric series (Abramowitz & Stegun 26.5.23), on the side
    where it converges fast: I_x(a, b) = x^a (1-x)^b / (a B(a, b)) * 2F1(a + b, 1; a + 1; x)."""
    x, a, b = mpmath.mpf(x), mpmath.mpf(a), mpmath.mpf(b)
    if x > a / (a + b):
        return 1 - incomplete_beta_truth(1 - x, b, a)
    front = mpmath.exp(a * mpmath.log(x) + b * mpmath.log(1 - x) - mpmath.log(a) - mpmath.log(mpmath.beta(a, b)))
    return front * mpmath.hyp2f1(a + b, 1, a + 1, x, maxterms=10**7)

beta_cases = []
for x, a, b in [
    (0.3, 2, 3), (0.01, 50.5, 4950.5), (0.07, 700.5, 9300.5), (0.9, 0.5, 0.5), (0.02, 0.5, 1000.5),
    (0.0043, 26.5, 5974.5), (0.24, 1449.5, 4551.5), (0.069, 4143.5, 55857.5), (0.5, 3.5, 3.5),
    (0.001, 0.5, 99.5), (0.15, 30.5, 70.5), (0.05, 120.5, 880.5), (0.0005, 12.5, 199988.5),
]:
    truth = incomplete_beta_truth(x, a, b)
    beta_cases.append({"x": x, "a": a, "b": b, "mpmath": float(truth), "scipy": float(betainc(a, b, x))})
out["incompleteBeta"] = beta_cases

# --- 2. Jeffreys p = beta.cdf(pd, D + 0.5, N - D + 0.5) and binomtest(D, N, pd, 'greater') -------
tests = []
for pd, d, n in [
    (0.01, 15, 1000), (0.01, 5, 1000), (0.05, 70, 1000), (0.2, 1, 3), (0.0076, 65, 6000), (0.2421, 1447, 6000),
    (0.069, 4143, 60000), (0.03, 0, 400), (0.5, 10, 10), (0.12, 31, 200), (0.001, 3, 250), (0.0673, 4143, 60000),
]:
    tests.append({
        "pd": pd, "defaults": d, "accounts": n,
        "jeffreysScipy": float(stats.beta.cdf(pd, d + 0.5, n - d + 0.5)),
        "jeffreysMpmath": float(incomplete_beta_truth(pd, d + 0.5, n - d + 0.5)),
        "binomialScipy": float(stats.binomtest(d, n, pd, alternative="greater").pvalue),
    })
out["tests"] = tests

# --- 3. chi-square quantiles ----------------------------------------------------------------------
out["chiSquare"] = [{"q": q, "df": df, "scipy": float(stats.chi2.ppf(q, df))} for q in (0.9, 0.95, 0.99, 0.999) for df in (1, 2, 4, 9, 19, 49)]

# --- 4. a weighted holdout with ties: calibration by grade, Brier ------------------------------------
n = 3000
grade_pd = {"A": 0.01, "B": 0.03, "C": 0.07, "D": 0.15, "E": 0.3}
grades = rng.choice(list(grade_pd), size=n, p=[0.3, 0.3, 0.2, 0.12, 0.08])
pd = np.array([round(min(0.99, max(0.001, grade_pd[g] * np.exp(0.3 * rng.standard_normal()))), 2) for g in grades])  # ties: 2 decimals
pd[pd == 0] = 0.005
true = np.clip(pd * np.where(grades == "C", 1.6, 1.0), 0, 1)  # grade C's PD is too low
bad = (rng.random(n) < true).astype(int)
weight = np.round(rng.choice([1.0, 2.5, 4.0], size=n, p=[0.5, 0.3, 0.2]) * np.exp(0.1 * rng.standard_normal(n)), 3)
with open(os.path.join(here, "holdout-weighted.csv"), "w") as f:
    f.write("grade,pd,bad,weight\n")
    for g, p, y, w in zip(grades, pd, bad, weight):
        f.write(f"{g},{p:.2f},{y},{w:.3f}\n")
pd = np.array([float(f"{p:.2f}") for p in pd])

def group_values(mask, w):
    ww = w[mask]
    total = ww.sum()
    mean_pd = float((ww * pd[mask]).sum() / total)
    rate = float((ww * bad[mask]).sum() / total)
    n_eff = float(total**2 / (ww**2).sum())
    d_eff = rate * n_eff
    z = stats.norm.ppf(0.975)
    centre = (rate + z * z / (2 * n_eff)) / (1 + z * z / n_eff)
    half = z / (1 + z * z / n_eff) * np.sqrt(rate * (1 - rate) / n_eff + z * z / (4 * n_eff * n_eff))
    return {
        "accounts": int(mask.sum()),
        "meanPd": mean_pd,
        "observedBadRate": rate,
        "effectiveAccounts": n_eff,
        "jeffreysP": float(stats.beta.cdf(mean_pd, d_eff + 0.5, n_eff - d_eff + 0.5)),
        # binomtest needs whole counts: the tail as the incomplete beta, scipy's betainc
        "binomialP": 1.0 if d_eff == 0 else float(betainc(d_eff, n_eff - d_eff + 1, mean_pd)),
        "wilson": [float(max(0, centre - half)), float(min(1, centre + half))],
    }

for label, w in (("unweighted", np.ones(n)), ("weighted", weight)):
    rows = {g: group_values(grades == g, w) for g in sorted(grade_pd)}
    rows["portfolio"] = group_values(np.ones(n, dtype=bool), w)
    # Brier: sklearn; its decomposition over grades: numpy, Murphy (1973)
    brier = float(brier_score_loss(bad, pd, sample_weight=w))
    total = w.sum()
    obar = (w * bad).sum() / total
    rel = res = 0.0
    for g in grade_pd:
        m = grades == g
        wk = w[m].sum()
        rel += wk * ((w[m] * pd[m]).sum() / wk - (w[m] * bad[m]).sum() / wk) ** 2
        res += wk * ((w[m] * bad[m]).sum() / wk - obar) ** 2
    out[f"grades_{label}"] = {
        "rows": rows,
        "brierSklearn": brier,
        "reliability": float(rel / total),
        "resolution": float(res / total),
        "uncertainty": float(obar * (1 - obar)),
    }
# Unweighted whole-count tests against scipy's binomtest too
out["grades_unweighted"]["binomtestScipy"] = {
    g: float(stats.binomtest(int(bad[grades == g].sum()), int((grades == g).sum()), float(pd[grades == g].mean()), alternative="greater").pvalue)
    for g in sorted(grade_pd)
}

# --- 5. PSI over the reference's deciles, with ties and weights in the compared sample -------------
reference = np.round(rng.normal(600, 50, 1000), 8)  # 1,000 distinct values: ten bands of exactly 100
assert len(np.unique(reference)) == 1000
actual = np.round(rng.normal(610, 55, 2500))  # whole points: many ties
actual_weight = np.round(rng.uniform(0.5, 3, 2500), 3)
s = np.sort(reference)
upper = [s[100 * (k + 1) - 1] for k in range(10)]  # each band's highest reference score (higher = safer)

def psi_of(w):
    band = np.searchsorted(np.array(upper), actual, side="left")  # first band whose upper bound >= score
    band = np.minimum(band, 9)
    a = np.array([w[band == k].sum() for k in range(10)]) / w.sum()
    e = np.full(10, 0.1)
    return float(((a - e) * np.log(a / e)).sum()), [float(x) for x in a]

psi_plain, shares_plain = psi_of(np.ones(2500))
psi_weighted, shares_weighted = psi_of(actual_weight)
n_eff = float(actual_weight.sum() ** 2 / (actual_weight**2).sum())
out["psi"] = {
    "higherIs": "safer",
    "reference": [float(x) for x in reference],
    "actual": [float(x) for x in actual],
    "actualWeights": [float(x) for x in actual_weight],
    "unweighted": {"psi": psi_plain, "actualShares": shares_plain, "criticalValue": float((1 / 1000 + 1 / 2500) * stats.chi2.ppf(0.95, 9))},
    "weighted": {"psi": psi_weighted, "actualShares": shares_weighted, "effectiveSize": n_eff, "criticalValue": float((1 / 1000 + 1 / n_eff) * stats.chi2.ppf(0.95, 9))},
}

# --- 6. the critical value against a simulation of PSI under H0 (Yurdakul & Naranjo's formula) -------
null = {}
for m_size, n_size, bands in ((2000, 3000, 10), (500, 5000, 10), (5000, 5000, 20)):
    reps = 20000
    values = np.empty(reps)
    for r in range(reps):
        ref = np.sort(rng.random(m_size))
        act = rng.random(n_size)
        cuts = ref[(np.arange(1, bands) * m_size) // bands - 1]
        e = np.diff(np.concatenate(([0], (np.arange(1, bands) * m_size) // bands, [m_size]))) / m_size
        a = np.bincount(np.searchsorted(cuts, act, side="left"), minlength=bands) / n_size
        a = np.where(a == 0, 0.5 / n_size, a)
        values[r] = ((a - e) * np.log(a / e)).sum()
    null[f"{m_size}x{n_size}x{bands}"] = {
        "M": m_size, "N": n_size, "bands": bands, "replicates": reps,
        "simulatedQuantile95": float(np.quantile(values, 0.95)),
        "simulatedQuantile99": float(np.quantile(values, 0.99)),
        "formula95": float((1 / m_size + 1 / n_size) * stats.chi2.ppf(0.95, bands - 1)),
        "formula99": float((1 / m_size + 1 / n_size) * stats.chi2.ppf(0.99, bands - 1)),
    }
out["psiNull"] = null

with open(os.path.join(here, "values.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
for key, value in null.items():
    print(key, "simulated 95%:", round(value["simulatedQuantile95"], 6), "formula:", round(value["formula95"], 6),
          "| 99%:", round(value["simulatedQuantile99"], 6), "formula:", round(value["formula99"], 6))
print("scipy vs mpmath, incomplete beta, max relative difference:",
      max(abs(c["scipy"] - c["mpmath"]) / c["mpmath"] for c in beta_cases))
