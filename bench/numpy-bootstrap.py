# The reference the bootstrap stage of `npm run bench` is timed against (issue 20): a paired,
# stratified bootstrap of both models' AUC and KS written the usual way with numpy, on per-score
# histograms. Per replicate: draw n_good goods and n_bad bads with replacement (the same rows for
# both models: paired), count the draws per distinct score of each model (np.bincount), and take
# AUC (Mann-Whitney, ties one half) and KS (largest gap of the cumulative distributions) from the
# cumulative counts. Only the replicates are timed (reading the file and ranking the scores are
# not). Prints one JSON line: seconds, replicates, and the percentile interval of the
# Gini difference (a sanity check: it should be close to Scorecourt's, from other random numbers).
#
# Usage: /usr/bin/python3 bench/numpy-bootstrap.py FILE safer|riskier REPLICATES SEED
# Columns used: bad (1 = bad), champion, challenger (the bench holdout's header).
import json
import sys
import time

import numpy as np


def read(path):
    with open(path) as f:
        header = f.readline().strip().split(',')
    columns = [header.index(name) for name in ('bad', 'champion', 'challenger')]
    data = np.loadtxt(path, delimiter=',', skiprows=1, usecols=columns, dtype=np.float64)
    return data[:, 0] == 1, data[:, 1], data[:, 2]


def main():
    path, higher_is, replicates, seed = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4])
    bad, champion, challenger = read(path)
    sign = 1.0 if higher_is == 'safer' else -1.0
    models = []
    for scores in (champion, challenger):
        # Codes of the distinct "higher = safer" scores, ascending.
        values, code = np.unique(sign * scores, return_inverse=True)
        models.append((len(values), code[~bad], code[bad]))
    n_good, n_bad = int((~bad).sum()), int(bad.sum())
    pairs = float(n_good) * float(n_bad)
    rng = np.random.default_rng(seed)
    auc = np.empty((replicates, 2))
    ks = np.empty((replicates, 2))
    start = time.perf_counter()
    cpu_start = time.process_time()
    for r in range(replicates):
        goods = rng.integers(0, n_good, n_good)
        bads = rng.integers(0, n_bad, n_bad)
        for m, (k, good_code, bad_code) in enumerate(models):
            hist_good = np.bincount(good_code[goods], minlength=k).astype(np.float64)
            hist_bad = np.bincount(bad_code[bads], minlength=k).astype(np.float64)
            cum_bad = np.cumsum(hist_bad)
            auc[r, m] = np.dot(hist_good, cum_bad - 0.5 * hist_bad) / pairs
            ks[r, m] = np.max(np.abs(np.cumsum(hist_good) * n_bad - cum_bad * n_good)) / pairs
    seconds = time.perf_counter() - start
    cpu_seconds = time.process_time() - cpu_start
    delta_gini = 2 * (auc[:, 1] - auc[:, 0])
    print(json.dumps({
        'seconds': seconds,
        'cpuSeconds': cpu_seconds,
        'replicates': replicates,
        'deltaGini': [float(np.quantile(delta_gini, 0.025)), float(np.quantile(delta_gini, 0.975))],
        'numpy': np.__version__,
    }))


main()
