#!/usr/bin/python3
"""Reference for lode's matrix export (Debian python3-sklearn, python3-scipy).

Reads a JSON file {"docs": [...], "mtx": path, "settings": {...}} and prints
JSON with
  lode:    the exported matrix read back with scipy.io.mmread, as dense rows,
  shape:   its shape as mmread reports it,
  sklearn: {"vocabulary": [...terms in column order], "rows": dense rows} from
           TfidfVectorizer(**settings) fitted on docs.
The corpus is written so that sklearn's default token pattern (words of 2+
word characters, lowercased) and lode's analyzer (language none, no
stopwords) give the same tokens.
"""
import json
import sys

import scipy.io
from sklearn.feature_extraction.text import TfidfVectorizer

data = json.load(open(sys.argv[1], encoding="utf-8"))
m = scipy.io.mmread(data["mtx"])
vec = TfidfVectorizer(**data["settings"])
sk = vec.fit_transform(data["docs"])
inv = sorted(vec.vocabulary_.items(), key=lambda kv: kv[1])
json.dump({"lode": m.toarray().tolist(), "shape": list(m.shape),
           "sklearn": {"vocabulary": [t for t, _ in inv], "rows": sk.toarray().tolist()}}, sys.stdout)
