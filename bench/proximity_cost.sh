#!/usr/bin/env bash
# The cost of BM25TP term proximity (--proximity, docs/ranking.md) against
# plain BM25 in the same run: `lode search --batch` over a collection's
# judged queries, BM25 and BM25TP alternated ROUNDS times on the same index
# (so both see the same cache and machine load); prints each round's wall
# time and the ratio of the summed times. Workload: the judged queries of
# each collection given (default the shipped SciFact train and Cranfield),
# read as plain text, --top 10 and --top 1000.
#
#   bench/proximity_cost.sh [ROUNDS]     (LODE, default build/lode; indexes from
#                                          scripts/eval_collections.sh in /tmp/lode-eval)
set -euo pipefail
cd "$(dirname "$0")/.."
lode=${LODE:-build/lode}
rounds=${1:-3}
evals=${OUT:-/tmp/lode-eval}
datasets=${DATASETS:-../shared/datasets}
now() { date +%s.%N; }
for c in ${COLLECTIONS:-scifact-train cranfield}; do
  index="$evals/$c/given.sqlite"
  [ -f "$index" ] || { echo "$index missing: run scripts/eval_collections.sh first" >&2; exit 1; }
  queries="$datasets/$c/queries.tsv"
  for top in 10 1000; do
    plain=0 near=0
    for r in $(seq "$rounds"); do
      t0=$(now); "$lode" --index "$index" search --batch "$queries" --top "$top" > /dev/null 2>&1; t1=$(now)
      "$lode" --index "$index" search --batch "$queries" --top "$top" --proximity > /dev/null 2>&1; t2=$(now)
      plain=$(echo "$plain + $t1 - $t0" | bc -l); near=$(echo "$near + $t2 - $t1" | bc -l)
      printf '%-14s top %-5s round %s: bm25 %.2f s, bm25tp %.2f s\n' "$c" "$top" "$r" "$(echo "$t1 - $t0" | bc -l)" "$(echo "$t2 - $t1" | bc -l)"
    done
    printf '%-14s top %-5s queries %s: bm25tp / bm25 time = %.2f\n' "$c" "$top" "$(grep -c . "$queries")" "$(echo "$near / $plain" | bc -l)"
  done
done
