#!/usr/bin/python3
"""A one-field lnc.ltc ranking computed outside lode, as an independent reference.

The SMART weighting of Salton & Buckley (1988, "Term-weighting approaches in
automatic text retrieval") as given by Manning, Raghavan & Schuetze (2008),
section 6.4, Table 6.15 and the lnc.ltc example:
  document: l  1 + log10(tf)           query: l  1 + log10(qtf)
            n  no idf                         t  log10(N / df)
            c  cosine normalisation           c  cosine normalisation
  score(q, d) = sum over shared words of the two normalised weights.
Words of the query that no document has are left out (their idf is undefined).

Inputs are raw counts only, so the analysis (tokens, stemming, stopwords) is
the caller's and the weighting and ranking are this script's alone:
  lnc_ltc.py DOCS.mtx DOCS.terms DOCS.docs QUERIES.mtx QUERIES.terms QUERIES.docs DEPTH
each a Matrix Market coordinate file of counts (rows = documents or queries,
columns = words) with its column words and row ids, one a line. Prints a TREC
run: per query the DEPTH best documents with a score above 0, best first,
equal scores by document id (ascending), "qid Q0 docid rank score ref" with
the score to 17 significant digits. Needs only the Python standard library.
"""
import math
import sys


def read_counts(mtx, terms, ids):
    words = [w.rstrip("\n") for w in open(terms, encoding="utf-8")]
    names = [x.rstrip("\n") for x in open(ids, encoding="utf-8")]
    rows = [dict() for _ in names]
    header_seen = False
    for line in open(mtx, encoding="utf-8"):
        if line.startswith("%"):
            continue
        parts = line.split()
        if not header_seen:
            header_seen = True
            continue
        r, c, v = int(parts[0]) - 1, int(parts[1]) - 1, float(parts[2])
        rows[r][words[c]] = rows[r].get(words[c], 0.0) + v
    return names, rows


def main():
    d_mtx, d_terms, d_ids, q_mtx, q_terms, q_ids, depth = sys.argv[1:8]
    depth = int(depth)
    doc_ids, docs = read_counts(d_mtx, d_terms, d_ids)
    q_names, queries = read_counts(q_mtx, q_terms, q_ids)
    n = len(docs)
    df = {}
    for d in docs:
        for w in d:
            df[w] = df.get(w, 0) + 1
    # lnc documents
    doc_vecs = []
    postings = {}
    for i, d in enumerate(docs):
        v = {w: 1.0 + math.log10(tf) for w, tf in d.items() if tf > 0}
        norm = math.sqrt(sum(x * x for x in v.values()))
        for w, x in v.items():
            postings.setdefault(w, []).append((i, x / norm))
        doc_vecs.append(v)
    out = sys.stdout
    for qid, q in zip(q_names, queries):
        v = {w: (1.0 + math.log10(tf)) * math.log10(n / df[w]) for w, tf in q.items() if tf > 0 and w in df}
        norm = math.sqrt(sum(x * x for x in v.values()))
        scores = {}
        if norm > 0:
            for w, x in sorted(v.items()):
                for i, y in postings[w]:
                    scores[i] = scores.get(i, 0.0) + x / norm * y
        ranked = sorted(((s, doc_ids[i]) for i, s in scores.items() if s > 0), key=lambda t: (-t[0], t[1]))
        for rank, (s, doc) in enumerate(ranked[:depth], 1):
            out.write(f"{qid} Q0 {doc} {rank} {s:.17g} ref\n")


if __name__ == "__main__":
    main()
