#!/usr/bin/python3
"""An independent run of continuous active learning with scikit-learn.

The same published method as lode's sifts (Cormack & Grossman 2014/2015:
the query as a synthetic relevant document, 100 random unjudged documents
presumed not relevant each round, logistic regression on TF-IDF features,
batches of 1 growing by ceil(10%)), written from the papers' description with
scikit-learn's TfidfVectorizer (sublinear tf, l2 norm, English stopwords) and
LogisticRegression (C=1, liblinear) instead of lode's code. It gives the
bounds of tests/screening/simulation_test.cpp (see there), so that test
checks lode against another implementation of the method, not against a run
of itself.

  cal_reference.py COLLECTION_DIR FIRST_N_QUERIES
prints JSON: per query, documents judged to reach 80 / 95 / 100 % recall.
"""
import json
import math
import random
import sys

from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.linear_model import LogisticRegression

folder, n_queries = sys.argv[1], int(sys.argv[2])
docs = [json.loads(line) for line in open(folder + "/docs.jsonl", encoding="utf-8")]
ids = [str(d["id"]) for d in docs]
texts = [(d.get("title") or "") + " " + d["text"] for d in docs]
qrels = {}
for line in open(folder + "/qrels.txt"):
    q, _, d, g = line.split()
    if int(g) > 0:
        qrels.setdefault(q, set()).add(d)
queries = [line.rstrip("\n").split("\t", 1) for line in open(folder + "/queries.tsv") if line.strip()]
vec = TfidfVectorizer(sublinear_tf=True, stop_words="english")
x = vec.fit_transform(texts)
out = {}
for qid, text in queries[:n_queries]:
    rel = {i for i, d in enumerate(ids) if d in qrels.get(qid, set())}
    if not rel:
        continue
    rng = random.Random(17)
    qv = vec.transform([text])
    judged, order, batch = {}, [], 1
    while len(judged) < len(ids) and sum(order) < len(rel):
        unjudged = [i for i in range(len(ids)) if i not in judged]
        neg = rng.sample(unjudged, min(100, len(unjudged)))
        rows = list(judged) + neg
        from scipy.sparse import vstack
        xs = vstack([qv] + [x[i] for i in rows])
        ys = [1] + [judged[i] for i in judged] + [0] * len(neg)
        if len(set(ys)) < 2:
            ys[-1] = 0
        model = LogisticRegression(C=1.0, solver="liblinear").fit(xs, ys)
        scores = model.decision_function(x[unjudged])
        ranked = sorted(zip(scores, unjudged), key=lambda t: (-t[0], t[1]))[:batch]
        for _, i in ranked:
            judged[i] = 1 if i in rel else 0
            order.append(judged[i])
        batch += math.ceil(batch / 10)
    def reach(r):
        need = math.ceil(r * len(rel) - 1e-9)
        found = 0
        for k, v in enumerate(order):
            found += v
            if found >= need:
                return k + 1
        return 0
    out[qid] = {"relevant": len(rel), "to": [reach(0.8), reach(0.95), reach(1.0)], "docs": len(ids)}
json.dump(out, sys.stdout)
