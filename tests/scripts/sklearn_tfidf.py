#!/usr/bin/python3
"""Reference TF-IDF values from scikit-learn (Debian python3-sklearn).

Reads a JSON file {"docs": [...], "queries": [...]} and prints JSON with
  vocabulary: term -> column,
  weights: per document, {term: weight} (non-zero entries of TfidfVectorizer),
  scores: per query, per document, the cosine (dot product of l2-normalised rows).
Settings: sublinear_tf=True, smooth_idf=True, norm="l2", lowercase, default
token pattern (words of 2+ word characters) — the test corpus is written so
that lode's analyzer with language "none" and no stopwords yields the same tokens.
"""
import json
import sys

from sklearn.feature_extraction.text import TfidfVectorizer

data = json.load(open(sys.argv[1], encoding="utf-8"))
vec = TfidfVectorizer(sublinear_tf=True, smooth_idf=True, norm="l2")
m = vec.fit_transform(data["docs"])
vocab = vec.vocabulary_
inv = {i: t for t, i in vocab.items()}
weights = []
for row in range(m.shape[0]):
    r = m.getrow(row)
    weights.append({inv[int(c)]: float(v) for c, v in zip(r.indices, r.data)})
q = vec.transform(data["queries"])
scores = (q @ m.T).toarray().tolist()
json.dump({"vocabulary": {t: int(i) for t, i in vocab.items()}, "weights": weights,
           "idf": {t: float(vec.idf_[i]) for t, i in vocab.items()}, "scores": scores}, sys.stdout)
