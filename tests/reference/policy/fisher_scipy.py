"""Second reference for server/stats/fisher-exact.ts: scipy.stats.fisher_exact, two-sided.

Run from the repository root:  /usr/bin/python3 tests/reference/policy/fisher_scipy.py
Reads the tables from proportions.json (written by proportions.R) and writes fisher-scipy.json.
"""
import json

import scipy
from scipy.stats import fisher_exact

with open("tests/reference/policy/proportions.json") as f:
    tables = json.load(f)["fisher"]

rows = []
for t in tables:
    table = [[int(t["a"]), int(t["b"])], [int(t["c"]), int(t["d"])]]
    _, p = fisher_exact(table, alternative="two-sided")
    rows.append({"a": t["a"], "b": t["b"], "c": t["c"], "d": t["d"], "p": float(p)})

with open("tests/reference/policy/fisher-scipy.json", "w") as f:
    json.dump({"source": f"scipy {scipy.__version__} scipy.stats.fisher_exact(alternative='two-sided')", "fisher": rows}, f, indent=2)
    f.write("\n")
