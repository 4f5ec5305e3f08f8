"""Reference values for sampling weights (issue: real holdouts), from outside the project.

Writes weighted-3000.csv (seeded): points scores with ties for both models, an outcome, an
integer sampling weight 1 to 5 and a segment; and goods-weighted-3000.csv: the same rows with a
weight of 4 on every good and 1 on every bad. Then prints, as JSON (weights-python.json):

  (b) on the row-expanded file (each row repeated `w` times): sklearn's roc_auc_score and
      scipy's ks_2samp statistic for both models, and sklearn's roc_auc_score with
      sample_weight on the weighted file (the same number, a cross-check of the expansion);
  (c) the standard errors of both AUCs and of their difference from a seeded, paired,
      outcome-stratified row bootstrap (numpy, 4000 replicates): each replicate draws n_good goods
      and n_bad bads with replacement, each drawn row keeping its weight, and computes the
      weighted AUC with sklearn's roc_auc_score(sample_weight=...);
  (d) for the goods-weighted file, the same AUCs and KS as the unweighted file, and the weighted
      bad rate bads / (bads + 4·goods).

AUC convention: P(a good scores safer than a bad) + ½ P(tie); scores are "higher = safer", so
y = 1 for goods. KS: scipy.stats.ks_2samp(bad scores, good scores).statistic.

  /usr/bin/python3 tests/reference/weights/generate.py > tests/reference/weights/weights-python.json
"""
import json
import os
import sys

import numpy as np
import scipy
import sklearn
from scipy.stats import ks_2samp
from sklearn.metrics import roc_auc_score

here = os.path.dirname(os.path.abspath(__file__))
rng = np.random.default_rng(20251202)
n = 3000
latent = rng.normal(size=n)
champion = np.round(600 + 40 * (0.8 * latent + 0.6 * rng.normal(size=n)) / 5) * 5
challenger = np.round(600 + 40 * (0.9 * latent + 0.45 * rng.normal(size=n)) / 5) * 5
p_bad = 1 / (1 + np.exp(2.2 + 1.3 * latent))
bad = (rng.random(n) < p_bad).astype(int)
weight = rng.integers(1, 6, size=n)
segment = np.where(rng.random(n) < 0.4, "cards", "loans")


def write(name, w):
    with open(os.path.join(here, name), "w") as f:
        f.write("id,bad,champion,challenger,w,segment\n")
        for i in range(n):
            f.write(f"A{i:05d},{bad[i]},{int(champion[i])},{int(challenger[i])},{int(w[i])},{segment[i]}\n")


write("weighted-3000.csv", weight)
goods_weight = np.where(bad == 0, 4, 1)
write("goods-weighted-3000.csv", goods_weight)


def expanded_values(w):
    idx = np.repeat(np.arange(n), w)
    y = 1 - bad[idx]
    out = {}
    for name, s in (("champion", champion), ("challenger", challenger)):
        out[name] = {
            "aucExpanded": float(roc_auc_score(y, s[idx])),
            "aucSampleWeight": float(roc_auc_score(1 - bad, s, sample_weight=w)),
            "ksExpanded": float(ks_2samp(s[idx][y == 0], s[idx][y == 1]).statistic),
        }
    return out


def bootstrap_se(w, replicates=4000, seed=12):
    r = np.random.default_rng(seed)
    goods = np.flatnonzero(bad == 0)
    bads = np.flatnonzero(bad == 1)
    a = np.empty(replicates)
    b = np.empty(replicates)
    for k in range(replicates):
        rows = np.concatenate([r.choice(goods, goods.size), r.choice(bads, bads.size)])
        y = 1 - bad[rows]
        a[k] = roc_auc_score(y, champion[rows], sample_weight=w[rows])
        b[k] = roc_auc_score(y, challenger[rows], sample_weight=w[rows])
    return {
        "replicates": replicates,
        "seed": seed,
        "seChampion": float(a.std(ddof=1)),
        "seChallenger": float(b.std(ddof=1)),
        "seDifference": float((b - a).std(ddof=1)),
    }


result = {
    "source": "tests/reference/weights/generate.py",
    "versions": {"python": sys.version.split()[0], "numpy": np.__version__, "scipy": scipy.__version__, "sklearn": sklearn.__version__},
    "rows": n,
    "bads": int(bad.sum()),
    "weighted": {
        "file": "weighted-3000.csv",
        "accounts": int(weight.sum()),
        "badRate": float((weight * bad).sum() / weight.sum()),
        **expanded_values(weight),
        "bootstrap": bootstrap_se(weight),
    },
    "goodsWeighted": {
        "file": "goods-weighted-3000.csv",
        "accounts": int(goods_weight.sum()),
        "badRate": float((goods_weight * bad).sum() / goods_weight.sum()),
        **expanded_values(goods_weight),
    },
    "unweighted": expanded_values(np.ones(n, dtype=int)),
}
json.dump(result, sys.stdout, indent=2)
sys.stdout.write("\n")
