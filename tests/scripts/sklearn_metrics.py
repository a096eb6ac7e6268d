#!/usr/bin/python3
"""Reference ranking metrics from scikit-learn (Debian python3-sklearn).

Reads a JSON file {"cases": [{"grades": [...], "relevant_total": R,
"unretrieved": [...], "k": [...]}]} where "grades" are the judged grades of a
ranked list, best first (0 = not relevant), and "unretrieved" the grades of
relevant documents the list missed. Prints, per case:
  ap:   average_precision_score over the list (binary: grade > 0, scores
        descending by rank) times retrieved-relevant / all-relevant. sklearn
        normalises by the relevant documents it is shown; the factor makes the
        denominator all relevant documents, as the usual definition does.
        When every relevant document is in the list the factor is 1.
  ndcg: {k: ndcg_score} with linear gains (sklearn's: gain = the grade) on the
        list with the unretrieved relevant documents appended below every
        retrieved one, so the ideal ranking sees all of them.
"""
import json
import sys

import numpy as np
from sklearn.metrics import average_precision_score, ndcg_score

data = json.load(open(sys.argv[1], encoding="utf-8"))
out = []
for case in data["cases"]:
    grades = case["grades"]
    n = len(grades)
    binary = [1 if g > 0 else 0 for g in grades]
    found = sum(binary)
    scores = list(range(n, 0, -1))  # distinct, descending with rank
    if found == 0:
        ap = 0.0  # no relevant document in the list: nothing to average
    else:
        ap = float(average_precision_score(binary, scores)) * found / case["relevant_total"]
    full = grades + case["unretrieved"]
    full_scores = scores + [-1 - i for i in range(len(case["unretrieved"]))]
    ndcg = {str(k): float(ndcg_score(np.asarray([full]), np.asarray([full_scores]), k=k)) for k in case["k"]}
    out.append({"ap": ap, "ndcg": ndcg})
json.dump(out, sys.stdout)
