#!/usr/bin/env bash
# Measures lode on the public test collections (docs/evaluation.md, "Quality on
# the public collections"): for each collection, indexes it twice — as given
# (title and text fields) and as a one-field copy (title put in front of the
# text, no title field: the "plain BM25" reference) — and runs
# `lode eval compare` with the plain BM25 as baseline against each setting given.
#
#   scripts/eval_collections.sh [-d DATASETS] [-o OUT] [-m "map ndcg@10 p@10"] [-b BASELINE] [--] [SETTING...]
#   (put -- before the settings when the first one starts with a dash)
#
# SETTING is a string of `lode search` options ("" = the defaults); default:
# "" and "--feedback-docs 10". BASELINE (default "--index ONEFIELD") is the
# system the settings are compared with; in both, the word ONEFIELD stands for
# the one-field index (e.g. "--index ONEFIELD --model tfidf", a one-field
# lnc.ltc). Prints one line per collection, metric and
# setting: mean, baseline mean, randomization p, t-test p. Needs a built
# lode (LODE, default build/lode) and python3.
set -euo pipefail
cd "$(dirname "$0")/.."
datasets=${DATASETS:-../shared/datasets}
out=${OUT:-/tmp/lode-eval}
metrics="map ndcg@10 p@10"
baseline="--index ONEFIELD"
while getopts "d:o:m:b:" opt; do
  case $opt in
    d) datasets=$OPTARG ;;
    o) out=$OPTARG ;;
    m) metrics=$OPTARG ;;
    b) baseline=$OPTARG ;;
    *) exit 2 ;;
  esac
done
shift $((OPTIND - 1))
settings=("$@")
if [ ${#settings[@]} -eq 0 ]; then settings=("" "--feedback-docs 10"); fi
lode=${LODE:-build/lode}
mkdir -p "$out"

# A copy of a collection with the title moved into the text (one field).
one_field() {
  python3 - "$1" "$2" <<'EOF'
import gzip, json, sys
src, dst = sys.argv[1], sys.argv[2]
opener = gzip.open if src.endswith(".gz") else open
with opener(src, "rt", encoding="utf-8") as f, open(dst, "w", encoding="utf-8") as g:
    for line in f:
        d = json.loads(line)
        text = " ".join(x for x in (d.get("title", ""), d.get("text", "")) if x)
        g.write(json.dumps({"id": d["id"], "title": "", "text": text}) + "\n")
EOF
}

for dir in "$datasets"/*/; do
  c=$(basename "$dir")
  [ -f "$dir/qrels.txt" ] || continue
  work="$out/$c"
  mkdir -p "$work/given" "$work/onefield"
  if [ ! -f "$work/onefield/docs.jsonl" ]; then
    if [ -f "$dir/docs.jsonl.gz" ]; then gzip -dc "$dir/docs.jsonl.gz" > "$work/given/docs.jsonl"
    else cp "$dir/docs.jsonl" "$work/given/docs.jsonl"; fi
    one_field "$work/given/docs.jsonl" "$work/onefield/docs.jsonl"
  fi
  if [ "${REUSE:-0}" != 1 ] || [ ! -f "$work/onefield.sqlite" ]; then  # REUSE=1: keep the indexes of an earlier run
    rm -f "$work"/*.sqlite*
    "$lode" --index "$work/given.sqlite" index -q "$work/given"
    "$lode" --index "$work/onefield.sqlite" index -q "$work/onefield"
  fi
  cand=()
  for s in "${settings[@]}"; do cand+=(--candidate "${s//ONEFIELD/$work/onefield.sqlite}"); done
  for m in $metrics; do
    "$lode" --index "$work/given.sqlite" eval compare --json --metric "$m" \
      --queries "$dir/queries.tsv" --judgments "$dir/qrels.txt" \
      --baseline "${baseline//ONEFIELD/$work/onefield.sqlite}" "${cand[@]}" > "$work/compare-$m.json"
    python3 - "$c" "$m" "$work/compare-$m.json" <<'EOF'
import json, sys
c, m, path = sys.argv[1:]
r = json.load(open(path))
for cand in r["candidates"]:
    t = cand["test"]
    setting = cand["system"].split(": ", 1)[-1]
    print(f'{c:14} {m:8} {t["mean_b"]:.4f} (baseline {t["mean_a"]:.4f}, {t["wins"]}/{t["ties"]}/{t["losses"]}, '
          f'p {t["randomization"]["p"]:.2g} / {t["t_test"]["p"]:.2g})  {setting}')
EOF
  done
done
