#!/usr/bin/python3
"""Reference paired tests from SciPy (Debian python3-scipy).

Reads a JSON file {"cases": [{"a": [...], "b": [...], "resamples": N}]} and
prints per case:
  t, t_p:  scipy.stats.ttest_rel(b, a) (two-sided)
  perm_p:  scipy.stats.permutation_test((b, a), mean difference,
           permutation_type="samples" (values swapped within each pair, i.e.
           the sign of each difference flipped), alternative="two-sided",
           n_resamples=N, random_state=12345); exact when 2^n <= N.
"""
import json
import sys

import numpy as np
from scipy import stats

data = json.load(open(sys.argv[1], encoding="utf-8"))
out = []
for case in data["cases"]:
    a = np.asarray(case["a"], dtype=float)
    b = np.asarray(case["b"], dtype=float)
    t = stats.ttest_rel(b, a)

    def mean_diff(x, y, axis):
        return np.mean(x - y, axis=axis)

    p = stats.permutation_test((b, a), mean_diff, vectorized=True, permutation_type="samples",
                               alternative="two-sided", n_resamples=case["resamples"], random_state=12345)
    out.append({"t": float(t.statistic), "t_p": float(t.pvalue), "perm_p": float(p.pvalue)})
json.dump(out, sys.stdout)
