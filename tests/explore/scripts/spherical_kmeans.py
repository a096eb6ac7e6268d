#!/usr/bin/python3
"""Reference spherical k-means and adjusted Rand index for lode's topic groups.

Reads JSON {"rows": [[[col, w], ...], ...], "dims": D, "centres": [[...], ...],
"max_iterations": I, "labels": [...], "groups": [...]} and prints JSON with
  objective, assignment, iterations: the same Lloyd iterations as
    src/explore/kmeans.cpp, written with numpy and scikit-learn's
    sklearn.preprocessing.normalize: assign each row to the centre of largest
    cosine (lowest index on ties), centre = l2-normalised sum of its rows (an
    empty group keeps its centre), stop when no assignment changes;
  ari: sklearn.metrics.adjusted_rand_score(labels, groups).
"""
import json
import sys

import numpy as np
from sklearn.metrics import adjusted_rand_score
from sklearn.preprocessing import normalize

data = json.load(open(sys.argv[1], encoding="utf-8"))
out = {}
if data.get("rows"):
    X = np.zeros((len(data["rows"]), data["dims"]))
    for i, row in enumerate(data["rows"]):
        for c, w in row:
            X[i, c] = w
    X = normalize(X, norm="l2")
    C = np.array(data["centres"], dtype=float)
    assign = None
    objective = 0.0
    it = 0
    for it in range(data["max_iterations"]):
        sims = X @ C.T
        new = np.argmax(sims, axis=1)  # first maximum = lowest index on ties
        objective = float(sims[np.arange(len(X)), new].sum())
        if assign is not None and np.array_equal(new, assign):
            break
        assign = new
        for c in range(C.shape[0]):
            members = X[assign == c]
            if len(members):
                C[c] = normalize(members.sum(axis=0, keepdims=True))[0]
    out = {"objective": objective, "assignment": [int(a) for a in new], "iterations": it}
if data.get("labels"):
    out["ari"] = float(adjusted_rand_score(data["labels"], data["groups"]))
json.dump(out, sys.stdout)
