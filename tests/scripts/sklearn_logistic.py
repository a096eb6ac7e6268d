#!/usr/bin/python3
"""Reference logistic regression from scikit-learn (Debian python3-sklearn).

Reads JSON {"rows": [{column: value}, ...], "labels": [0|1, ...], "C": c} and
prints JSON with, for two fits on the same features:
  plain:     LogisticRegression(C, fit_intercept=False, solver="lbfgs") —
             min 0.5|w|^2 + C sum log-loss, by another optimiser than liblinear;
  intercept: LogisticRegression(C, solver="liblinear", intercept_scaling=1) —
             the same objective with a bias feature of value 1 whose weight is
             regularised too (liblinear's convention);
each as {"coef": {column: weight}, "intercept": b, "decision": [per row]}.
"""
import json
import sys

from scipy.sparse import lil_matrix
from sklearn.linear_model import LogisticRegression

data = json.load(open(sys.argv[1], encoding="utf-8"))
cols = sorted({int(c) for r in data["rows"] for c in r})
at = {c: i for i, c in enumerate(cols)}
m = lil_matrix((len(data["rows"]), len(cols)))
for i, r in enumerate(data["rows"]):
    for c, v in r.items():
        m[i, at[int(c)]] = v
m = m.tocsr()
y = data["labels"]
out = {}
for name, model in (
    ("plain", LogisticRegression(C=data["C"], fit_intercept=False, solver="lbfgs", tol=1e-12, max_iter=100000)),
    ("intercept", LogisticRegression(C=data["C"], solver="liblinear", intercept_scaling=1, tol=1e-10, max_iter=100000)),
):
    model.fit(m, y)
    out[name] = {
        "coef": {str(c): float(model.coef_[0][at[c]]) for c in cols},
        "intercept": float(model.intercept_[0]) if model.fit_intercept else 0.0,
        "decision": [float(v) for v in model.decision_function(m)],
    }
json.dump(out, sys.stdout)
