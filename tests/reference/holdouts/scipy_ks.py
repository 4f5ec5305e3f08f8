"""KS reference values from scipy for the holdouts of cases.json (written by generate.py).

For each model, with scores turned to "higher = safer" (negated when higher = riskier):
scipy.stats.ks_2samp(bad scores, good scores) -> statistic and statistic_location, and, computed
here in exact integer arithmetic, the statistic as a fraction |B n_good - G n_bad| / (n_bad n_good)
rounded once to a double, and every score value where that largest gap is reached (it can be
reached at several values). scipy's own statistic is that same correctly rounded fraction when it
runs its exact mode (both samples <= 10,000, 'auto'); in its asymptotic mode it is the difference
of two rounded shares, which can differ in the last bit. Locations are given back in the model's
own units.

    /usr/bin/python3 tests/reference/holdouts/scipy_ks.py > tests/reference/holdouts/ks.json
"""
import csv
import json
import os
import sys
from fractions import Fraction

import numpy as np
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))
cases = json.load(open(os.path.join(HERE, "cases.json")))

out = {"source": "tests/reference/holdouts/scipy_ks.py",
       "versions": {"numpy": np.__version__, "scipy": scipy.__version__}, "cases": {}}
for case in cases:
    rows = list(csv.DictReader(open(os.path.join(HERE, case["file"]))))
    bad = np.array([int(r["bad"]) for r in rows])
    result = {}
    for model in ("champion", "challenger"):
        sign = 1.0 if case["higherIs"][model] == "safer" else -1.0
        safety = sign * np.array([float(r[model]) for r in rows])
        bads = np.sort(safety[bad == 1])
        goods = np.sort(safety[bad == 0])
        test = stats.ks_2samp(bads, goods)
        values = np.unique(safety)
        n_bad, n_good = len(bads), len(goods)
        gap = np.abs(np.searchsorted(bads, values, side="right").astype(np.int64) * n_good
                     - np.searchsorted(goods, values, side="right").astype(np.int64) * n_bad)
        largest = int(gap.max())
        reached = values[gap == largest]
        result[model] = {
            "statistic": float(test.statistic),
            "exactFraction": float(Fraction(largest, n_bad * n_good)),
            "scipyMode": "exact" if max(n_bad, n_good) <= 10000 else "asymp",
            "statisticLocation": float(sign * test.statistic_location),
            "reachedAt": sorted(float(sign * v) for v in reached),
            "riskiestReached": float(sign * reached.min()),
        }
    out["cases"][case["file"]] = result
json.dump(out, sys.stdout, indent=1)
print()
