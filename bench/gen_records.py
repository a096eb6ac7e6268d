#!/usr/bin/env python3
"""Writes N short invented records as JSON Lines, for latency at a million documents.

Workload for bench/million.sh: each record has an id, a 3-8 word title and a
30-150 word body drawn from a Zipf (exponent 1) distribution over invented
words (consonant-vowel syllables, so nothing is an English word), so the
postings of common words span thousands of blocks while rare words stay rare.
Deterministic for a seed; standard library only.

  gen_records.py --out DIR [--docs 1000000] [--vocab 200000] [--seed 7] [--files 8]
"""
import argparse
import json
import os

import itertools
import random


def invented_words(n, rng):
    consonants = list("bdfgklmnprstvz")
    vowels = list("aeiou")
    seen, words = set(), []
    while len(words) < n:
        w = "".join(rng.choice(consonants) + rng.choice(vowels) for _ in range(rng.randint(2, 4)))
        if w not in seen:
            seen.add(w)
            words.append(w)
    return words


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--out", required=True)
    ap.add_argument("--docs", type=int, default=1_000_000)
    ap.add_argument("--vocab", type=int, default=200_000)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--files", type=int, default=8)
    a = ap.parse_args()
    rng = random.Random(a.seed)
    words = invented_words(a.vocab, rng)
    cum = list(itertools.accumulate(1.0 / r for r in range(1, a.vocab + 1)))
    os.makedirs(a.out, exist_ok=True)
    per_file = (a.docs + a.files - 1) // a.files
    doc = 0
    for f in range(a.files):
        with open(os.path.join(a.out, f"records-{f:02d}.jsonl"), "w") as out:
            for _ in range(min(per_file, a.docs - doc)):
                title = " ".join(rng.choices(words, cum_weights=cum, k=rng.randint(3, 8)))
                body = " ".join(rng.choices(words, cum_weights=cum, k=rng.randint(30, 150)))
                out.write(json.dumps({"id": f"r{doc}", "title": title, "text": body}) + "\n")
                doc += 1


if __name__ == "__main__":
    main()
