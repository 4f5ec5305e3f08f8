"""Reference for server/stats/swap-sets.ts and strategy-curve.ts: an independent numpy
implementation of the rules documented in server/stats/cutoffs.ts, on a generated holdout.

Rules: accepted ⇔ the score is on the safe side of the cut-off, the cut-off included (≥ for a
higher = safer score, ≤ for higher = riskier). For a target approval rate r the cut-off is the
score of the k-th safest account, k = ceil(r·n − 1e-7), and every account tied with it is accepted.
Bads avoided at equal approval: the champion's book at its cut-off for r holds N accounts; the
challenger's bads in a book of exactly N accounts (the tie block at the edge taken in proportion).
Approvals gained at equal bad rate: the largest challenger book (whole score values, or part of
one, mixed in proportion) whose bad rate is at most the champion's at r, minus the champion's book.

Run from the repository root:  /usr/bin/python3 tests/reference/policy/swaps_numpy.py
Writes tests/reference/policy/swaps-numpy.json.
"""
import json
import math

import numpy as np

rng = np.random.default_rng(7)
n = 3000
latent = rng.normal(0, 1, n)
bad = (rng.random(n) < 1 / (1 + np.exp(2.0 + 1.2 * latent))).astype(int)
champion = np.round((600 + 40 * (latent + rng.normal(0, 1.0, n))) / 5) * 5  # points, higher = safer, ties
challenger = np.round(1 / (1 + np.exp(2.0 + 1.2 * (latent + rng.normal(0, 0.6, n)))), 3)  # PD, riskier
exposure = np.round(rng.gamma(2.0, 2500.0, n), 2)

safety = {"champion": champion, "challenger": -challenger}
sign = {"champion": 1.0, "challenger": -1.0}


def cut_for_rate(model, r):
    k = min(n, max(0, math.ceil(r * n - 1e-7)))
    s = np.sort(safety[model])
    cut = s[n - k]
    return cut


def cells(cut_a, cut_b):
    a = safety["champion"] >= cut_a
    b = safety["challenger"] >= cut_b
    out = {}
    for name, mask in [("bothAccept", a & b), ("swapIn", ~a & b), ("swapOut", a & ~b), ("bothReject", ~a & ~b)]:
        out[name] = {"count": int(mask.sum()), "bads": int(bad[mask].sum()), "amount": float(exposure[mask].sum())}
    return {"championCutoff": float(sign["champion"] * cut_a), "challengerCutoff": float(sign["challenger"] * cut_b),
            "championApproval": float((safety["champion"] >= cut_a).mean()),
            "challengerApproval": float((safety["challenger"] >= cut_b).mean()), "cells": out}


swaps = [{"basis": "cutoffs", "cutoffs": {"champion": 600.0, "challenger": 0.08}, **cells(600.0, -0.08)}]
for r in [0.013, 0.5, 0.7, 0.9, 1.0]:
    swaps.append({"basis": "approval-rate", "approvalRate": r, **cells(cut_for_rate("champion", r), cut_for_rate("challenger", r))})


def book(model, cut):
    m = safety[model] >= cut
    return int(m.sum()), int(bad[m].sum())


strategy = []
for r in [0.01, 0.1, 0.5, 0.7, 1.0]:
    point = {"approvalRate": r}
    for model in ["champion", "challenger"]:
        cut = cut_for_rate(model, r)
        acc, b = book(model, cut)
        point[model] = {"cutoff": float(sign[model] * cut), "accepted": acc, "bads": b}
    strategy.append(point)

r = 0.7
acc_a, bads_a = book("champion", cut_for_rate("champion", r))
acc_b, bads_b = book("challenger", cut_for_rate("challenger", r))

# Books of the challenger at each of its score values, safest value first: (accounts, bads) of all
# accounts at or beyond the value, starting from the empty book.
values = np.unique(safety["challenger"])[::-1]
books = [(0, 0)] + [book("challenger", v) for v in values]

# Bads avoided at equal approval: the challenger's bads in a book of exactly acc_a accounts, the
# tie block that straddles acc_a taken in proportion (linear between the two whole books around it).
equal_bads = None
for (a0, b0), (a1, b1) in zip(books, books[1:]):
    if a0 < acc_a <= a1:
        equal_bads = b0 + (acc_a - a0) / (a1 - a0) * (b1 - b0)
assert equal_bads is not None

# Approvals gained at equal bad rate: every book along the curve (whole books, and within each
# block the part f in [0, 1] where the mixed bad rate equals the champion's), the largest with a bad
# rate at most the champion's.
R = bads_a / acc_a
best = None
for (a0, b0), (a1, b1) in zip(books, books[1:]):
    candidates = []
    if b1 <= R * a1:
        candidates.append(float(a1))
    da, db = a1 - a0, b1 - b0
    if db - R * da != 0:
        f = (R * a0 - b0) / (db - R * da)
        if 0 <= f <= 1 and a0 + f * da > 0:
            candidates.append(a0 + f * da)
    for c in candidates:
        if best is None or c > best:
            best = c
at = {"approvalRate": r, "accounts": acc_a, "championBads": bads_a, "challengerBads": equal_bads,
      "badsAvoided": bads_a - equal_bads, "challengerAtCutoff": {"accounts": acc_b, "bads": bads_b},
      "approvalsGainedAtEqualBadRate": None if best is None else best - acc_a}

with open("tests/reference/policy/swaps-numpy.json", "w") as f:
    json.dump({"source": f"numpy {np.__version__}, independent implementation of the cutoffs.ts rules",
               "holdout": {"champion": champion.tolist(), "challenger": challenger.tolist(), "bad": bad.tolist(),
                           "exposure": exposure.tolist()},
               "swaps": swaps, "strategy": strategy, "atApprovalRate": at}, f)
    f.write("\n")
print(json.dumps({"swaps": swaps, "atApprovalRate": at}, indent=1)[:3000])
